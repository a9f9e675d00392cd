# The demo deck: a bench instrument's front-panel probe input, hit by
# contact discharges at every test level, both polarities. An invented
# scenario: the parts come from the invented library in parts/.
# demo-weak.zap is the first try at this design, which fails at 6 kV.
title "Front-panel probe input, contact discharge"

include "parts/clamps.zap"
include "parts/passives.zap"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=2k,4k,6k,8k polarity=both
inductor  Lpad  tip  n1   1.5n                 # pad and via down to the clamp
clamp     D1    n1   gnd  part=tvs-lc6 ls=0.45n ipp=40A   # rated for the 8 kV contact pulse
bead      FB1   n1   n2   part=bead-220
capacitor C1    n2   gnd  220n esr=20m esl=0.5n
pin       U1    n2   gnd  cin=7p vmax=5.5V vmin=-1.5V ifail=1A

watch n1
watch n2
