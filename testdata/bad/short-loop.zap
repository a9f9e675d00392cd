# A supply shorted by an inductor and a bead with no resistance, a dangling
# node and a strike on gnd.
supply   V1  vcc gnd 5V
inductor L1  vcc x   10n
bead     FB1 x   gnd l=1u rac=100
resistor R9  vcc open 1k
strike   zap gnd gnd waveform=hbm level=2k
