# A slow control signal at a cable connector: the discharge meets a short
# trace, the clamp, a series resistor and 60 mm of board trace to the
# receiver.
title "Connector signal line with series resistor"

include "parts/clamps.zap"

strike    zap    pin1  gnd   waveform=iec61000-4-2 level=4k,8k polarity=both
inductor  Lconn  pin1  a     2n                 # connector pin and pad
clamp     D2     a     gnd   part=tvs-lc6
resistor  R1     a     b     33
line      T1     b     c     z0=55ohm delay=380p
capacitor Cf     c     gnd   47p esl=0.4n
pin       U2     c     gnd   cin=5p rs=2ohm vmax=3.6V vmin=-0.3V ifail=0.8A

watch a
watch c max=3.6V min=-0.3V

vary R1.value=0.1,33,100
tolerance D2.vbr=5% R1.value=1% dist=normal
