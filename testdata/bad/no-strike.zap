title "A network with nothing to hit it"
resistor R1 a gnd 1k
capacitor C1 a gnd 1n
