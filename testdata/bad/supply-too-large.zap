# A supply no bench could hold: refused by check as by run.
title "supply of 1e308 V"
strike zap a gnd waveform=iec61000-4-2 level=2k
resistor R1 a gnd 50
supply V1 b gnd 1e308
resistor R2 b a 1k
