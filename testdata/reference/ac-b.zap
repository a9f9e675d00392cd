# Small-signal reference network B (an invented 5 V rail input): a bench
# supply behind its resistance and a cable inductance, a clamp biased at the
# rail, an input capacitor, a bead pi filter into a second capacitor and a
# 50 Ω load. The bead and the output capacitor peak near 140 kHz.
title "AC reference B: 5 V rail with a bead and two capacitors"

strike    esd  in   gnd  waveform=iec61000-4-2 level=8k
supply    V1   src  gnd  5V r=0.1ohm
inductor  Lc   src  in   100n r=20m
clamp     D1   in   gnd  vbr=6.8V cj=50p m=0.4 vj=0.7V ls=0.5n
capacitor C1   in   gnd  1u esr=10m esl=0.6n
bead      FB1  in   out  l=1.2u rdc=0.3ohm c=1.7p rac=1.1k
capacitor C2   out  gnd  1u esr=5m esl=0.5n
resistor  Rl   out  gnd  50
