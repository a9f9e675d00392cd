# An invented scenario: a 5 V supply input at a board connector, protected
# by a TVS and a pi filter (a 16 V ceramic at the input, a ferrite bead, a
# second ceramic at the IC's supply pin). The input capacitor's esl makes
# its terminal voltage spike for a nanosecond while its dielectric, which is
# what its voltage rating is about, sees far less.
title "5 V supply input with a pi filter"

strike    zap   vin   gnd  waveform=iec61000-4-2 level=4k,8k polarity=both
inductor  Lc    vin   a    2n                       # connector pin and trace
clamp     D1    a     gnd  vbr=7.5V rdyn=0.4ohm ls=0.5n cj=40p vrwm=6V ipp=30A emax=2m
capacitor C1    a     gnd  100n esr=15m esl=0.6n rating=16V
bead      FB1   a     vdd  rdc=0.3ohm rac=1.1k l=1.2u c=1.7p
capacitor C2    vdd   gnd  1u esr=10m esl=0.5n rating=10V
supply    Vs    vdd   gnd  5V r=0.2ohm
resistor  Rload vdd   gnd  50ohm emax=1m pmax=20W
pin       U1    vdd   gnd  cin=20p vmax=6.5V vmin=-0.5V
