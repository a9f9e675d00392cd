# Reference network A (testdata/reference) with manufacturing tolerances on
# its clamp, bead and capacitor: the network the spread tests and benchmarks
# draw from. The percentages are invented, of a size common for such parts.
title "Reference network A with part tolerances"

include "../../../../testdata/reference/net-a.zap"

tolerance D1.vbr=5% D1.rdyn=20% D1.ls=20% dist=normal
tolerance FB1.rac=25% C1.value=10% Lpad.value=15% dist=uniform
