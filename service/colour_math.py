"""Colour arithmetic for the colour checks: sRGB, WCAG contrast, CIELAB, CIEDE2000 and CVD simulation.

Pure numpy, no drawing and no state. It owns the formulas only; which colours a chart uses and what
counts as good enough is decided by ``service.checks.colour``.

- sRGB decoding (IEC 61966-2-1): c ≤ 0.04045 → c/12.92, else ((c + 0.055)/1.055)^2.4.
- WCAG 2.x relative luminance L = 0.2126 R + 0.7152 G + 0.0722 B; contrast (L1 + 0.05)/(L2 + 0.05).
- Linear sRGB → XYZ (IEC 61966-2-1 matrix, D65 white = the matrix's row sums) → CIELAB (CIE 15).
- ΔE00: Sharma, Wu & Dalal, "The CIEDE2000 color-difference formula", Color Res. Appl. 30(1), 2005,
  with kL = kC = kH = 1 and the paper's hue-angle rules (achromatic colours, the 180° wrap).
- Colour-vision deficiency: Machado, Oliveira & Fernandes, IEEE TVCG 15(6), 2009, severity 1.0,
  applied in linear RGB, then clipped to the gamut and re-encoded. (colour-science warns that the
  tritan matrix approximates tritanopia by shifting the S cone; it is still the paper's matrix.)
"""

from __future__ import annotations

from itertools import combinations
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

Array = NDArray[np.float64]
Vision = Literal["normal", "protan", "deutan", "tritan"]
VISIONS: tuple[Vision, ...] = ("normal", "protan", "deutan", "tritan")

#: Machado et al. (2009) simulation matrices at severity 1.0, for linear RGB column vectors.
MACHADO: dict[Vision, Array] = {
    "protan": np.array(
        [
            [0.152286, 1.052583, -0.204868],
            [0.114503, 0.786281, 0.099216],
            [-0.003882, -0.048116, 1.051998],
        ]
    ),
    "deutan": np.array(
        [
            [0.367322, 0.860646, -0.227968],
            [0.280085, 0.672501, 0.047413],
            [-0.011820, 0.042940, 0.968881],
        ]
    ),
    "tritan": np.array(
        [
            [1.255528, -0.076749, -0.178779],
            [-0.078411, 0.930809, 0.147602],
            [0.004733, 0.691367, 0.303900],
        ]
    ),
}

#: Linear sRGB → CIE XYZ (Y of white = 1), IEC 61966-2-1:1999.
RGB_TO_XYZ = np.array(
    [
        [0.4124, 0.3576, 0.1805],
        [0.2126, 0.7152, 0.0722],
        [0.0193, 0.1192, 0.9505],
    ]
)
#: The D65 white as the standard's matrix maps sRGB white: (0.9505, 1.0, 1.089).
WHITE_XYZ = RGB_TO_XYZ.sum(axis=1)

_EPSILON = 216 / 24389  # CIE 15: (6/29)^3
_KAPPA = 24389 / 27  # CIE 15: (29/3)^3


def hex_to_srgb(colour: str) -> Array:
    """'#rrggbb' → gamma-encoded sRGB in 0..1."""
    text = colour.lstrip("#")
    if len(text) != 6:
        raise ValueError(f"not a #rrggbb colour: {colour!r}")
    return np.array([int(text[i : i + 2], 16) for i in (0, 2, 4)], dtype=np.float64) / 255.0


def srgb_to_hex(srgb: ArrayLike) -> str:
    """Gamma-encoded sRGB in 0..1 → '#rrggbb' (rounded, clipped)."""
    values = np.clip(np.rint(np.asarray(srgb, dtype=np.float64) * 255.0), 0, 255).astype(int)
    return "#" + "".join(f"{v:02x}" for v in values)


def decode(srgb: ArrayLike) -> Array:
    """Gamma-encoded sRGB → linear RGB (IEC 61966-2-1)."""
    c = np.asarray(srgb, dtype=np.float64)
    return np.where(c <= 0.04045, c / 12.92, ((c + 0.055) / 1.055) ** 2.4)


def encode(linear: ArrayLike) -> Array:
    """Linear RGB → gamma-encoded sRGB (IEC 61966-2-1), without clipping."""
    c = np.asarray(linear, dtype=np.float64)
    high = 1.055 * np.abs(c) ** (1 / 2.4) * np.sign(c) - 0.055
    return np.where(c <= 0.0031308, c * 12.92, high)


def relative_luminance(colour: str) -> float:
    """WCAG 2.x relative luminance of a '#rrggbb' colour, 0 (black) to 1 (white)."""
    r, g, b = decode(hex_to_srgb(colour))
    return float(0.2126 * r + 0.7152 * g + 0.0722 * b)


def contrast_ratio(first: str, second: str = "#ffffff") -> float:
    """WCAG 2.x contrast ratio of two colours, 1 to 21 (the lighter one's luminance on top)."""
    a, b = relative_luminance(first), relative_luminance(second)
    lighter, darker = max(a, b), min(a, b)
    return (lighter + 0.05) / (darker + 0.05)


def linear_to_lab(linear: ArrayLike) -> Array:
    """Linear sRGB (..., 3) → CIELAB (..., 3) under D65."""
    xyz = np.asarray(linear, dtype=np.float64) @ RGB_TO_XYZ.T / WHITE_XYZ
    f = np.where(xyz > _EPSILON, np.cbrt(xyz), (_KAPPA * xyz + 16) / 116)
    lightness = 116 * f[..., 1] - 16
    a = 500 * (f[..., 0] - f[..., 1])
    b = 200 * (f[..., 1] - f[..., 2])
    return np.stack([lightness, a, b], axis=-1)


def simulate(srgb: ArrayLike, vision: Vision) -> Array:
    """Gamma-encoded sRGB (..., 3) as seen with ``vision``: Machado (2009) in linear RGB, clipped."""
    c = np.asarray(srgb, dtype=np.float64)
    if vision == "normal":
        return c
    seen = decode(c) @ MACHADO[vision].T
    return encode(np.clip(seen, 0.0, 1.0))


def lab_of(colour: str, vision: Vision = "normal") -> Array:
    """The CIELAB coordinates of a '#rrggbb' colour, as seen with ``vision``."""
    return linear_to_lab(decode(simulate(hex_to_srgb(colour), vision)))


def delta_e_2000(lab1: ArrayLike, lab2: ArrayLike) -> Array:
    """CIEDE2000 colour difference of CIELAB arrays (..., 3), Sharma, Wu & Dalal (2005)."""
    l1, a1, b1 = np.moveaxis(np.asarray(lab1, dtype=np.float64), -1, 0)
    l2, a2, b2 = np.moveaxis(np.asarray(lab2, dtype=np.float64), -1, 0)
    c_mean = (np.hypot(a1, b1) + np.hypot(a2, b2)) / 2
    g = 0.5 * (1 - np.sqrt(c_mean**7 / (c_mean**7 + 25.0**7)))
    a1p, a2p = (1 + g) * a1, (1 + g) * a2
    c1p, c2p = np.hypot(a1p, b1), np.hypot(a2p, b2)
    # Eq. 7: the hue of an achromatic colour (a' = b = 0) is 0.
    h1p = np.where((a1p == 0) & (b1 == 0), 0.0, np.degrees(np.arctan2(b1, a1p)) % 360)
    h2p = np.where((a2p == 0) & (b2 == 0), 0.0, np.degrees(np.arctan2(b2, a2p)) % 360)
    chromatic = c1p * c2p != 0
    # Eq. 10: the hue difference, the short way round the circle; 0 if either colour is achromatic.
    dh = h2p - h1p
    dh = np.where(dh > 180, dh - 360, np.where(dh < -180, dh + 360, dh))
    dh = np.where(chromatic, dh, 0.0)
    d_l = l2 - l1
    d_c = c2p - c1p
    d_h = 2 * np.sqrt(c1p * c2p) * np.sin(np.radians(dh) / 2)
    l_mean = (l1 + l2) / 2
    cp_mean = (c1p + c2p) / 2
    # Eq. 14: the mean hue, across 0° when the hues are more than 180° apart; their sum if achromatic.
    h_sum = h1p + h2p
    far = np.abs(h1p - h2p) > 180
    hp_mean = np.where(far, np.where(h_sum < 360, (h_sum + 360) / 2, (h_sum - 360) / 2), h_sum / 2)
    hp_mean = np.where(chromatic, hp_mean, h_sum)
    t = (
        1
        - 0.17 * np.cos(np.radians(hp_mean - 30))
        + 0.24 * np.cos(np.radians(2 * hp_mean))
        + 0.32 * np.cos(np.radians(3 * hp_mean + 6))
        - 0.20 * np.cos(np.radians(4 * hp_mean - 63))
    )
    d_theta = 30 * np.exp(-(((hp_mean - 275) / 25) ** 2))
    r_c = 2 * np.sqrt(cp_mean**7 / (cp_mean**7 + 25.0**7))
    s_l = 1 + 0.015 * (l_mean - 50) ** 2 / np.sqrt(20 + (l_mean - 50) ** 2)
    s_c = 1 + 0.045 * cp_mean
    s_h = 1 + 0.015 * cp_mean * t
    r_t = -np.sin(np.radians(2 * d_theta)) * r_c
    terms = (d_l / s_l) ** 2 + (d_c / s_c) ** 2 + (d_h / s_h) ** 2 + r_t * (d_c / s_c) * (d_h / s_h)
    result: Array = np.sqrt(terms)
    return result


def min_pairwise_difference(
    colours: list[str] | tuple[str, ...], vision: Vision = "normal"
) -> tuple[float, tuple[str, str] | None]:
    """The smallest ΔE00 between any two of ``colours`` as seen with ``vision``, and that pair.

    Fewer than two colours have nothing to tell apart: (inf, None)."""
    if len(colours) < 2:
        return float("inf"), None
    labs = {c: lab_of(c, vision) for c in dict.fromkeys(colours)}
    best, pair = float("inf"), None
    for first, second in combinations(colours, 2):
        difference = float(delta_e_2000(labs[first], labs[second]))
        if difference < best:
            best, pair = difference, (first, second)
    return best, pair
