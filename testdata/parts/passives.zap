# Invented passive parts: beads and capacitors of common sizes.

part bead-220 bead rdc=0.08ohm rac=260ohm l=0.55u c=1.1p
part bead-600 bead rdc=0.18ohm rac=640ohm l=1.3u c=1.4p isat=0.2A

part mlcc-100n capacitor value=100n esr=25m esl=0.55n rating=16V
part mlcc-1u   capacitor value=1u esr=12m esl=0.6n rating=16V
