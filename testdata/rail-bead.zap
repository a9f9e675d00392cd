# An invented 5 V supply input at a connector: the bench supply and its
# cable, a clamp, a ferrite bead and a ceramic capacitor in front of a
# regulator's input pin. The bead and the capacitor resonate near
# 140 kHz: the signal's side (zapnet ac) shows the peaking over the watch's
# 3 dB and the esr or rdc that damps it.
title "5 V input with a bead filter"

strike    esd   in    gnd  waveform=iec61000-4-2 level=8k polarity=both
supply    V1    src   gnd  5V r=50m
inductor  Lc    src   in   250n r=30m
clamp     D1    in    gnd  vbr=6.8V cj=90p m=0.4 ls=0.5n ipp=20A
bead      FB1   in    out  l=1.2u rdc=0.3ohm c=1.7p rac=1.1k
capacitor C2    out   gnd  1u esr=5m esl=0.5n rating=16V
pin       U1    out   gnd  cin=10p vmax=7V vmin=-0.5V
watch     out   peaking=3
