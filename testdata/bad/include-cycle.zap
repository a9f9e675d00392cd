# Includes a library that includes this deck back.
include "include-cycle-lib.zap"
strike zap a gnd waveform=hbm level=2k
resistor R1 a gnd 1k
