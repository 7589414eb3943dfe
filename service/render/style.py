"""The house style: calm, thin, light grid, direct labels. Installed once per process.

rcParams are process-global, so they are set once when a process first renders (``install``), never
per request; everything that varies by chart is passed explicitly to the artists.
"""

from __future__ import annotations

from typing import Any

import matplotlib

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

WIDTH_IN = 6.69  # 170 mm: the text width of the A4 page
LINE_HEIGHT_IN = 2.9
BAR_ROW_IN = 0.27

RC: dict[str, Any] = {
    "font.family": "DejaVu Sans",
    "font.size": 8.5,
    "axes.titlesize": 8,
    "axes.labelsize": 8,
    "axes.edgecolor": MUTED,
    "axes.labelcolor": INK,
    "axes.linewidth": 0.6,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.unicode_minus": False,  # U+2212 lands in a second font subset that PDF/A checks flag
    "xtick.color": MUTED,
    "ytick.color": MUTED,
    "xtick.labelcolor": INK,
    "ytick.labelcolor": INK,
    "xtick.major.width": 0.6,
    "ytick.major.width": 0.6,
    "grid.color": GRID,
    "grid.linewidth": 0.6,
    "lines.linewidth": 1.6,
    "pdf.fonttype": 42,  # embedded TrueType subsets with ToUnicode: text stays extractable
    "pdf.compression": 6,
    "svg.hashsalt": "plumbline",
    "text.parse_math": False,  # untrusted labels are never read as mathtext
    "text.usetex": False,
    "path.simplify": True,
    "figure.dpi": 100,
}

_installed = False


def install() -> None:
    """Apply the house style to this process (idempotent)."""
    global _installed  # noqa: PLW0603 - process-wide by design, see module docstring
    if _installed:
        return
    matplotlib.use("pdf", force=True)
    params: Any = matplotlib.rcParams  # its stubs accept only literal keys
    params.update(RC)
    _installed = True
