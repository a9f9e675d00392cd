title "Sensor input with fitted parts (invented data)"
# Part lines as zapnet fit prints them (see README, Models from your data):
part tvs5u clamp vbr=6.59977V nbr=6.24848 rdyn=233.532mohm ls=300pH cj=38pF vrwm=5V ipp=18A
part pinA pin table="pinA-tlp.csv" ifail=2.2066A
part bead600 bead rdc=90mohm l=1.59929uH c=1.09969pF rac=600.357ohm isat=500.319mA

strike    zap  a  gnd  waveform=iec61000-4-2 level=2k,4k,8k polarity=both
inductor  Lp   a  b    1n
clamp     D1   b  gnd  part=tvs5u
bead      FB1  b  c    part=bead600
pin       U1   c  gnd  part=pinA vmax=8V vmin=-2V
watch c
