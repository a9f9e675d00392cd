# Four vary lines of 60 values each: 12 960 000 variants, refused.
title "vary product"
strike zap a gnd waveform=iec61000-4-2 level=2k
resistor R1 a gnd 1k
resistor R2 a gnd 1k
resistor R3 a gnd 1k
resistor R4 a gnd 1k
vary R1.value=1k,2k,3k,4k,5k,6k,7k,8k,9k,10k,11k,12k,13k,14k,15k,16k,17k,18k,19k,20k,21k,22k,23k,24k,25k,26k,27k,28k,29k,30k,31k,32k,33k,34k,35k,36k,37k,38k,39k,40k,41k,42k,43k,44k,45k,46k,47k,48k,49k,50k,51k,52k,53k,54k,55k,56k,57k,58k,59k,60k
vary R2.value=1k,2k,3k,4k,5k,6k,7k,8k,9k,10k,11k,12k,13k,14k,15k,16k,17k,18k,19k,20k,21k,22k,23k,24k,25k,26k,27k,28k,29k,30k,31k,32k,33k,34k,35k,36k,37k,38k,39k,40k,41k,42k,43k,44k,45k,46k,47k,48k,49k,50k,51k,52k,53k,54k,55k,56k,57k,58k,59k,60k
vary R3.value=1k,2k,3k,4k,5k,6k,7k,8k,9k,10k,11k,12k,13k,14k,15k,16k,17k,18k,19k,20k,21k,22k,23k,24k,25k,26k,27k,28k,29k,30k,31k,32k,33k,34k,35k,36k,37k,38k,39k,40k,41k,42k,43k,44k,45k,46k,47k,48k,49k,50k,51k,52k,53k,54k,55k,56k,57k,58k,59k,60k
vary R4.value=1k,2k,3k,4k,5k,6k,7k,8k,9k,10k,11k,12k,13k,14k,15k,16k,17k,18k,19k,20k,21k,22k,23k,24k,25k,26k,27k,28k,29k,30k,31k,32k,33k,34k,35k,36k,37k,38k,39k,40k,41k,42k,43k,44k,45k,46k,47k,48k,49k,50k,51k,52k,53k,54k,55k,56k,57k,58k,59k,60k
