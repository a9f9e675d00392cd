# Reference network B for the independent check in mna/reference_test.go.
# Different from A on purpose: negative strike, a unidirectional clamp with a
# voltage-dependent junction charge, a saturating bead, a small decoupling
# capacitor, a line pulled up to a 3.3 V rail (so the run starts from a
# non-zero operating point) and a pin with an upper diode to that rail and an
# internal clamp. The pin's rs is 0 on purpose: its internal clamp path is
# then set by rdyn alone. The same network is solved by solve.py in this
# folder; see README.md.
title "Reference network B: pulled-up line, negative strike"

supply    Vs    vdd  gnd  3.3 r=0.1ohm
capacitor Cdd   vdd  gnd  1u
resistor  Rpu   vdd  n2   10k
strike    zap   tip  gnd  waveform=iec61000-4-2 level=8k polarity=neg
inductor  Ltr   tip  n1   2.2n r=0.05ohm
clamp     D1    n1   gnd  vbr=5.6V it=2m nbr=1.2 rdyn=0.25ohm cj=30p vj=0.7V m=0.33 ls=0.6n polarity=uni
bead      FB1   n1   n2   rdc=0.08ohm rac=220ohm l=0.6u c=0.9p isat=0.4A
capacitor C1    n2   gnd  10n esr=30m esl=0.7n
pin       U1    n2   gnd  cin=4p rail=vdd rs=0 vbr=7.5V rdyn=2ohm vmax=3.6V vmin=-0.3V
window    stop=300n
