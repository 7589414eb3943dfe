"""Fonts for the pack: DejaVu Sans, shipped with matplotlib, registered once with reportlab.

Charts and text then share one typeface, every font is embedded (no reference to a base-14 font),
and the same files are used on every machine with the same matplotlib version.
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

import matplotlib
from reportlab import rl_config
from reportlab.lib.fonts import addMapping
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont

REGULAR = "PlumblineSans"
BOLD = "PlumblineSans-Bold"
ITALIC = "PlumblineSans-Oblique"
BOLD_ITALIC = "PlumblineSans-BoldOblique"

_FILES = {
    REGULAR: "DejaVuSans.ttf",
    BOLD: "DejaVuSans-Bold.ttf",
    ITALIC: "DejaVuSans-Oblique.ttf",
    BOLD_ITALIC: "DejaVuSans-BoldOblique.ttf",
}


def font_dir() -> Path:
    return Path(matplotlib.get_data_path()) / "fonts" / "ttf"


@lru_cache(maxsize=1)
def register() -> str:
    """Register the family with reportlab (idempotent) and return the regular face's name."""
    for name, filename in _FILES.items():
        pdfmetrics.registerFont(TTFont(name, str(font_dir() / filename)))
    addMapping(REGULAR, 0, 0, REGULAR)
    addMapping(REGULAR, 1, 0, BOLD)
    addMapping(REGULAR, 0, 1, ITALIC)
    addMapping(REGULAR, 1, 1, BOLD_ITALIC)
    rl_config.defaultGraphicsFontName = REGULAR
    return REGULAR
