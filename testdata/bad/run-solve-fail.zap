# A deck that reads well but cannot be solved: an ideal 12 V supply straight
# across a 6.6 V clamp, with nothing to limit the current. zapnet run must say
# where the trouble is and what to try, and exit with status 2.
supply V1 a gnd 12V
clamp  D1 a gnd vbr=6.6V
strike zap a gnd waveform=iec61000-4-2 level=2k,4k polarity=both
