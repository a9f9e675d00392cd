# An invented full-speed data line (12 Mb/s, one line of the pair) at a
# device's connector: a short trace to a clamp array, a series resistor,
# the trace to the transceiver's pin and the pull-up that marks the device
# as full speed. The ports at the connector and at the pin, with the
# line's 45 Ω, are for the signal's side (zapnet ac): the transient runs
# do not see them.
title "Full-speed data line at the connector"

strike    esd   conn  gnd  waveform=iec61000-4-2 level=2k,4k,8k polarity=both
line      TL1   conn  a    z0=45ohm delay=40p
clamp     D1    a     gnd  vbr=6V cj=1.2p m=0.3 ls=0.4n rdyn=0.6ohm ipp=30A
resistor  Rs    a     b    22
line      TL2   b     p    z0=45ohm delay=90p
pin       U1    p     gnd  cin=6p rail=vdd vmax=4.6V vmin=-0.6V ifail=0.5A cmax=20p rise=4n
resistor  Rpu   vdd   p    1.5k
supply    V1    vdd   gnd  3.3V
capacitor Cdd   vdd   gnd  100n esr=20m esl=0.5n

port      P1    conn  gnd  z0=45ohm
port      P2    p     gnd  z0=45ohm
watch     a     max=12V
