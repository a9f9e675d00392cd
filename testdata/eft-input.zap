# A 24 V digital input of an invented machine controller, hit by the fast
# transient bursts of IEC 61000-4-4 through the coupling capacitor: a TVS
# at the terminal, an input resistor and a divider with a filter capacitor
# down to the logic pin. Each pulse is small; the burst report shows what
# 75 of them, and a minute of bursts, bring the TVS.
title "24 V digital input, EFT bursts"

strike    zap   term  gnd   waveform=eft level=1k,2k burst=5k polarity=both
inductor  Lt    term  a     12n                  # terminal block to the TVS
clamp     D6    a     gnd   vbr=33V rdyn=0.6ohm cj=350p ls=0.8n ipp=25A emax=10m
resistor  R1    a     b     4.7k
resistor  R2    b     gnd   1k
capacitor C1    b     gnd   10n esl=0.5n
pin       U6    b     gnd   cin=5p vmax=6V vmin=-1V ifail=0.2A

watch a
