# Invented clamp parts for the demo decks. The numbers are plausible for
# their class, not copied from any datasheet.

# A low-capacitance bidirectional TVS for 5 V signal lines.
part tvs-lc6 clamp vbr=6.6V rdyn=0.4ohm ls=0.35n cj=6p vj=0.8V m=0.3 \
    polarity=bi ipp=10A emax=300u

# A unidirectional TVS for a 12 V input, rated for surges.
part tvs-p16 clamp vbr=16.5V it=1m rdyn=0.12ohm ls=0.8n cj=900p \
    ipp=40A emax=50m

# A small-signal steering diode.
part sd-fast diode is=2n n=1.05 rs=0.6ohm cj=1.5p vbr=80V
