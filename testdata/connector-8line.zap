# An invented scenario: eight slow I/O lines at a cable connector, each with
# its own clamp of a clamp array, a series resistor, a filter capacitor and
# the receiving pin. The clamps and the filter capacitors return through the
# connector's ground pins (0.8 nH each) to one node, gret, and from there
# through the shell (1 nH) to the board's ground, where the pins sit. As
# drawn the design fails: the discharge into line 1 lifts gret by L·di/dt
# (over 20 V in the first nanosecond at 4 kV), the pin of the struck line
# sees the clamp's voltage plus that bounce, and the seven lines that were
# not struck see the bounce through their filter capacitors. A deck where
# many lines branch from one shared node, the kind whose matrix the
# engine's ordering keeps sparse (its cost grows linearly with the lines).
title "Eight lines of a cable connector sharing its ground return"

include "parts/clamps.zap"

strike    zap    in1   gnd   waveform=iec61000-4-2 level=4k,8k polarity=both
inductor  Lshell gret  gnd   1n                 # connector shell to the board

resistor  Rc1    in1   gnd   50                 # the cable's end of line 1
inductor  Lp1    in1   a1    1.5n               # connector pin and pad
clamp     D1     a1    r1    part=tvs-lc6
resistor  Rs1    a1    b1    100
capacitor Cf1    b1    r1    1n esl=0.4n
pin       U1     b1    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg1    r1    gret  0.8n               # line 1's ground pin
resistor  Rc2    in2   gnd   50                 # the cable's end of line 2
inductor  Lp2    in2   a2    1.5n               # connector pin and pad
clamp     D2     a2    r2    part=tvs-lc6
resistor  Rs2    a2    b2    100
capacitor Cf2    b2    r2    1n esl=0.4n
pin       U2     b2    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg2    r2    gret  0.8n               # line 2's ground pin
resistor  Rc3    in3   gnd   50                 # the cable's end of line 3
inductor  Lp3    in3   a3    1.5n               # connector pin and pad
clamp     D3     a3    r3    part=tvs-lc6
resistor  Rs3    a3    b3    100
capacitor Cf3    b3    r3    1n esl=0.4n
pin       U3     b3    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg3    r3    gret  0.8n               # line 3's ground pin
resistor  Rc4    in4   gnd   50                 # the cable's end of line 4
inductor  Lp4    in4   a4    1.5n               # connector pin and pad
clamp     D4     a4    r4    part=tvs-lc6
resistor  Rs4    a4    b4    100
capacitor Cf4    b4    r4    1n esl=0.4n
pin       U4     b4    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg4    r4    gret  0.8n               # line 4's ground pin
resistor  Rc5    in5   gnd   50                 # the cable's end of line 5
inductor  Lp5    in5   a5    1.5n               # connector pin and pad
clamp     D5     a5    r5    part=tvs-lc6
resistor  Rs5    a5    b5    100
capacitor Cf5    b5    r5    1n esl=0.4n
pin       U5     b5    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg5    r5    gret  0.8n               # line 5's ground pin
resistor  Rc6    in6   gnd   50                 # the cable's end of line 6
inductor  Lp6    in6   a6    1.5n               # connector pin and pad
clamp     D6     a6    r6    part=tvs-lc6
resistor  Rs6    a6    b6    100
capacitor Cf6    b6    r6    1n esl=0.4n
pin       U6     b6    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg6    r6    gret  0.8n               # line 6's ground pin
resistor  Rc7    in7   gnd   50                 # the cable's end of line 7
inductor  Lp7    in7   a7    1.5n               # connector pin and pad
clamp     D7     a7    r7    part=tvs-lc6
resistor  Rs7    a7    b7    100
capacitor Cf7    b7    r7    1n esl=0.4n
pin       U7     b7    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg7    r7    gret  0.8n               # line 7's ground pin
resistor  Rc8    in8   gnd   50                 # the cable's end of line 8
inductor  Lp8    in8   a8    1.5n               # connector pin and pad
clamp     D8     a8    r8    part=tvs-lc6
resistor  Rs8    a8    b8    100
capacitor Cf8    b8    r8    1n esl=0.4n
pin       U8     b8    gnd   cin=5p vmax=7V vmin=-1V ifail=0.5A
inductor  Lg8    r8    gret  0.8n               # line 8's ground pin

watch gret
watch b2 max=7V min=-1V
