# A deck with control characters: the escape below would recolour a
# terminal that echoed it.
title "escape in a title [31mred"
strike zap a gnd waveform=iec61000-4-2 level=2k
resistor R1 a gnd 1k
