# A deck with five mistakes, one of each sort: zapnet check reports all
# five at once, each at its line and column, and exits with status 2.
title "Front-panel input with five mistakes"

include "../parts/clamps.zap"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=2k,4k,8kA polarity=both
inductor  Lpad  tip  n1   1.5n
clamp     D1    n1   gnd  part=tvs-lc6 vbrr=7V
capacitor C1    n1   gnd  100nH esr=20m esl=0.5n
resistor  R1    n1   n3   33
pin       U1    n1   gnd  cin=6p vmax=5.5V vmin=-0.5V
watch     n2
