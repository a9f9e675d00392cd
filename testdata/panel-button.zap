# A front-panel push button read by a logic input: a pull-up to the 3.3 V
# rail, a clamp at the button, an RC filter and the input pin with its
# protection diodes to the rail and to gnd.
title "Front-panel button input"

include "parts/clamps.zap"
include "parts/passives.zap"

supply    V33   vdd   gnd   3.3V
resistor  Rpu   vdd   btn   10k
strike    zap   btn   gnd   waveform=iec61000-4-2 level=2k,4k,6k,8k polarity=both
clamp     D4    btn   gnd   part=tvs-lc6
resistor  Rf    btn   in    1k
capacitor Cf    in    gnd   part=mlcc-100n
capacitor Cdec  vdd   gnd   1u esr=10m esl=0.6n
pin       U3    in    gnd   cin=6p rail=vdd vmax=3.6V vmin=-0.3V ifail=0.5A

watch btn
watch in max=3.6V min=-0.3V
vary Cf.part=mlcc-100n,mlcc-1u
