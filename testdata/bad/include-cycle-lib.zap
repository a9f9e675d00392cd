# A library that wrongly includes the deck that includes it.
include "include-cycle.zap"
part r1k resistor value=1k
