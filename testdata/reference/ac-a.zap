# Small-signal reference network A (an invented signal line): a connector
# trace, a clamp with lead inductance whose junction capacitance depends on
# its bias, a second trace to a protected pin with diodes to gnd and to its
# rail, and a pull-up that biases the line at the rail's 3.3 V.
# The two-port is between P1 at conn and P2 at p, both 50 Ω to gnd.
title "AC reference A: pulled-up signal line with a clamp and a pin"

strike    esd  conn gnd  waveform=iec61000-4-2 level=8k
line      TL1  conn a    z0=50 delay=20p
clamp     D1   a    gnd  vbr=6.2V cj=0.6p m=0.33 vj=0.7V ls=0.4n rdyn=0.5ohm
line      TL2  a    p    z0=60 delay=35p
pin       U1   p    gnd  cin=1.5p rail=vdd
resistor  Rpu  vdd  a    10k
supply    V1   vdd  gnd  3.3V
capacitor Cdd  vdd  gnd  100n esr=10m esl=0.5n

port      P1   conn gnd  z0=50
port      P2   p    gnd  z0=50
