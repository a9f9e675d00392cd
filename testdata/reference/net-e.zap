# Reference network E for the independent check in mna/reference_test.go.
# An 8 A transmission-line pulse with half-nanosecond edges into a connector
# inductance, a clamp with a constant junction capacitance, a series
# resistor, a small filter capacitor with its esl and a pin with an internal
# clamp. Both edges
# set the line ringing; after the falling edge the line rebounds above zero.
# Invented values. The same network is solved by solve.py in this folder;
# see README.md.
title "Reference network E: transmission-line pulse edges"

strike    zap   tip  gnd  waveform=tlp level=8 width=50n rise=0.5n polarity=pos
inductor  Lc    tip  n1   2n
clamp     D1    n1   gnd  vbr=5.6V rdyn=0.5ohm ls=0.4n cj=40p polarity=uni
resistor  R1    n1   n2   2.2
capacitor C1    n2   gnd  47p esl=0.3n
pin       U1    n2   gnd  cin=4p vbr=5.5V rdyn=2ohm
window    stop=100n
