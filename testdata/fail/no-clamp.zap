# The demo's probe input with its clamp left off the board: the pin takes
# the discharge through the bead alone and fails at every level.
title "Front-panel probe input without its clamp"

include "../parts/passives.zap"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=2k polarity=both
inductor  Lpad  tip  n1   1.5n                 # pad and via
bead      FB1   n1   n2   part=bead-220
capacitor C1    n2   gnd  100n esr=20m esl=0.5n
pin       U1    n2   gnd  cin=7p vmax=5.5V vmin=-1.5V ifail=1A

watch n1
watch n2
