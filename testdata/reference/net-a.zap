# Reference network A for the independent check in mna/reference_test.go.
# An invented probe input: pad inductance, a bidirectional clamp with
# constant junction capacitance, a ferrite bead, a decoupling capacitor with
# its parasitics and the protected pin (lower diode only). The same network
# is solved by solve.py in this folder; see README.md.
title "Reference network A: probe input, positive strike"

strike    zap   tip  gnd  waveform=iec61000-4-2 level=8k polarity=pos
inductor  Lpad  tip  n1   1.5n
clamp     D1    n1   gnd  vbr=6.8V rdyn=0.35ohm cj=8p ls=0.4n polarity=bi
bead      FB1   n1   n2   rdc=0.15ohm rac=520ohm l=1.1u c=1.3p
capacitor C1    n2   gnd  100n esr=20m esl=0.5n
pin       U1    n2   gnd  cin=6p vmax=5.5V vmin=-0.5V
window    stop=400n
