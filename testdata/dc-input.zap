# A 12 V DC input jack: the supply sits behind its cable resistance, a
# 16.5 V clamp and a bulk capacitor guard the regulator input.
title "12 V DC input, contact discharge on the jack"

include "parts/clamps.zap"

supply    Vin   src   gnd   12V r=0.5ohm
inductor  Lcab  src   jack  1u r=50m           # cable to the jack
strike    zap   jack  gnd   waveform=iec61000-4-2 level=4k,8k polarity=both
inductor  Ltr   jack  vin   3n                 # trace to the clamp
clamp     D3    vin   gnd   part=tvs-p16
capacitor Cbulk vin   gnd   22u esr=80m esl=2n rating=25V
resistor  Rload vin   gnd   120

watch vin max=28V min=-1V
window stop=2u
