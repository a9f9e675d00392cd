# The circuit of an invented capacitive touch-sensor electrode on a front
# panel, shared by touch-sensor.zap (the generator network) and
# touch-sensor-ideal.zap (the ideal current). The TVS footprint is left
# unpopulated: the 10 kΩ series resistor and the sensing pin's own diodes
# are all the protection there is.

inductor  Lpad  pad   n1    6n                  # electrode lead to the board
capacitor Cpad  n1    gnd   3p                  # electrode to ground
resistor  Rs    n1    in    10k                 # series resistor at the pin
capacitor Cf    in    gnd   22p esl=0.5n        # filter capacitor
pin       U5    in    gnd   cin=6p rail=vdd vmax=5V vmin=-1.5V ifail=0.5A
supply    V33   vdd   gnd   3.3V
capacitor Cdec  vdd   gnd   1u esr=10m esl=0.6n

watch in
