# The 12 V DC input of dc-input.zap, surged as the lab applies it: the
# combination wave generator of IEC 61000-4-5 from the line to earth through
# its coupling path (9 µF and 10 Ω). The coupling capacitor sits at the
# line's 12 V before the surge, as in the lab.
title "12 V DC input, combination wave line to earth"

include "parts/clamps.zap"

supply    Vin   src   gnd   12V r=0.5ohm
inductor  Lcab  src   jack  1u r=50m           # cable to the jack
strike    zap   jack  gnd   waveform=surge-cwg level=500,1k path=line-earth polarity=both
inductor  Ltr   jack  vin   3n                 # trace to the clamp
clamp     D3    vin   gnd   part=tvs-p16
capacitor Cbulk vin   gnd   22u esr=80m esl=2n rating=25V
resistor  Rload vin   gnd   120

watch vin max=28V min=-1V
