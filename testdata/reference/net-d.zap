# Reference network D for the independent check in mna/reference_test.go.
# A negative strike into a unidirectional clamp with a graded junction, a
# bead that saturates at 0.2 A and a pin with an internal clamp behind 1 Ω
# of rs and 1.5 Ω of rdyn, so that the pin's internal path carries amperes.
# Invented values. The same network is solved by solve.py in this folder;
# see README.md.
title "Reference network D: saturating bead, pin with an internal clamp, negative strike"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=8k polarity=neg
inductor  Ltr   tip  n1   1.8n
clamp     D1    n1   gnd  vbr=7.2V it=1m nbr=1.1 rdyn=0.3ohm ls=0.5n cj=20p vj=0.6V m=0.4 polarity=uni
bead      FB1   n1   n2   rdc=0.18ohm rac=640ohm l=1.3u c=1.4p isat=0.2A
capacitor C1    n2   gnd  47n esr=25m esl=0.55n
pin       U1    n2   gnd  cin=5p rs=1ohm vbr=6V rdyn=1.5ohm
window    stop=1.6u
