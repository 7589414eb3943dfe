"""The house colours, shared by the drawers and by the colour checks that hold them to account."""

from __future__ import annotations

INK = "#1a1a1a"
MUTED = "#5c5c5c"
GRID = "#e3e3e3"
GAP_FILL = "#f0f0f0"
FLAG = "#a4001d"
# The house categorical palette. The first four are the Okabe & Ito (Color Universal Design, 2002,
# rev. 2008) colours that reach 3:1 on white (blue, vermillion, bluish green, reddish purple); the last
# four are our own, picked to keep every pair ΔE00 ≥ 11 under normal, protan, deutan and tritan vision
# (Machado et al. 2009) and clear of MUTED. Every colour is ≥ 3:1 on white (checks/colour.py).
PALETTE = ("#0072b2", "#d55e00", "#009e73", "#cc79a7", "#90432c", "#8585f4", "#7a4e7a", "#6f7a7a")
