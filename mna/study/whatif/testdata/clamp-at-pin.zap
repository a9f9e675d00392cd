# An invented input where the clamp sits right at the protected pin, so the
# residual is the clamp's own voltage: vbr + rdyn·i + ls·di/dt. Used by the
# sensitivity tests, whose expected signs follow from that sum.
title "Clamp at the pin: the residual is the clamp path's voltage"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=4k polarity=pos
inductor  Lpad  tip  n1   1n
clamp     D1    n1   gnd  vbr=6.8V rdyn=0.5ohm ls=1n cj=5p polarity=bi
pin       U1    n1   gnd  cin=5p vmax=45V
window    stop=100n
