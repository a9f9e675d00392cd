# Legal but doubtful: a node reached only through capacitors, a huge
# capacitor and a level beyond the standards. Warnings, not errors.
title "Warnings only"
strike    zap  in   gnd  waveform=iec61000-4-2 level=8k,40k
resistor  R1   in   gnd  1M
capacitor C1   in   mid  10n
capacitor C2   mid  gnd  0.47F
