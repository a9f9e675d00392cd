# A TLP whose rise is longer than its pulse: refused by check as by run.
title "TLP rise past its width"
strike zap a gnd waveform=tlp level=1 width=1n rise=2n
resistor R1 a gnd 50
