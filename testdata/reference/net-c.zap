# Reference network C for the independent check in mna/reference_test.go.
# The demo's kind of design at full strength: a graded bidirectional clamp, a
# bead into a large decoupling capacitor and the pin with its lower diode.
# The pin rings at a few gigahertz through the clamp's and the bead's
# capacitances in the first nanosecond, then swings slowly with the bead and
# the 220 nF; the window holds a full period of that slow swing. Invented
# values. The same network is solved by solve.py in this folder; see
# README.md.
title "Reference network C: probe input at 8 kV, sub-nanosecond ringing at the pin"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=8k polarity=pos
inductor  Lpad  tip  n1   1.5n
clamp     D1    n1   gnd  vbr=6.6V rdyn=0.4ohm ls=0.45n cj=6p vj=0.8V m=0.3 polarity=bi
bead      FB1   n1   n2   rdc=0.08ohm rac=260ohm l=0.55u c=1.1p
capacitor C1    n2   gnd  220n esr=20m esl=0.5n
pin       U1    n2   gnd  cin=7p
window    stop=2.2u
