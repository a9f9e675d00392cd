# Saved by an editor that writes a byte-order mark first: accepted.
title "byte-order mark"
strike zap a gnd waveform=iec61000-4-2 level=2k
resistor R1 a gnd 330
