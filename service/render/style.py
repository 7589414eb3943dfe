"""The house style: calm, thin, light grid, direct labels. Installed once per process.

rcParams are process-global, so they are set once when a process first renders (``install``), never
per request; everything that varies by chart is passed explicitly to the artists.
"""

from __future__ import annotations

from typing import Any

import matplotlib

from service.intents.geometry import BAR_ROW_IN, LINE_HEIGHT_IN, WIDTH_IN
from service.palette import FLAG, GAP_FILL, GRID, INK, MUTED, PALETTE

__all__ = [
    "BAR_ROW_IN",
    "FLAG",
    "GAP_FILL",
    "GRID",
    "INK",
    "LINE_HEIGHT_IN",
    "MUTED",
    "PALETTE",
    "RC",
    "WIDTH_IN",
    "install",
]

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
    "axes.unicode_minus": False,  # ASCII minus: numbers read back as typed
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
    # matplotlib 3.11's PDF writer sizes its font subsets by ps.fonttype, not pdf.fonttype: at the
    # default (3) each subset holds 256 codes, so every character beyond Latin-1 (an en dash, an
    # arrow) went to a second subset numbered from code 0, which PDF/A reads as .notdef. At 42 a
    # subset holds 65,536: the whole Basic Multilingual Plane stays in the first subset, each
    # character at its own code point. (Plumbline writes no PostScript.)
    "ps.fonttype": 42,
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
