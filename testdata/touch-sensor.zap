# A touch-sensor electrode with no TVS, struck by the IEC 61000-4-2
# generator as a circuit: 150 pF behind 330 Ω with its fast branch. The
# 10 kΩ resistor limits what reaches the pin to well under an ampere.
# touch-sensor-ideal.zap strikes the same circuit with the annex's ideal
# current, which forces 30 A at 8 kV through the resistor.
title "Touch-sensor electrode, no TVS: generator network"

include "boards/touch-sensor.zap"

strike    zap   pad   gnd   waveform=iec61000-4-2-network level=2k,4k,8k polarity=both
