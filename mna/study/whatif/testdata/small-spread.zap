# An invented minimal input for the spread's memory benchmark and its large
# counts: a clamp at the pin behind the pad's inductance, with a short
# window, so that a circuit solves in a fraction of a millisecond.
title "Small clamp at the pin with part tolerances"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=2k polarity=pos
inductor  Lpad  tip  n1   1n
clamp     D1    n1   gnd  vbr=6.8V rdyn=0.5ohm ls=1n cj=5p polarity=bi emax=1m
pin       U1    n1   gnd  cin=5p vmax=45V
window    stop=20n

tolerance D1.vbr=5% D1.rdyn=20% dist=normal
tolerance Lpad.value=15% dist=uniform
