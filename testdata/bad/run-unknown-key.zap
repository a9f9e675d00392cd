# A deck zapnet run must refuse: a misspelt clamp parameter.
title "Probe input with a typo"

strike    zap   n1   gnd  waveform=iec61000-4-2 level=2k polarity=pos
clamp     D1    n1   gnd  vbrr=6.6V rdyn=0.4ohm
pin       U1    n1   gnd  cin=7p vmax=5.5V
