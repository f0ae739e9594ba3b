"""Text from the shipped font (Liberation Sans, SIL OFL 1.1): widths and glyph outlines.

Labels are measured and drawn from the same font file, and written into the SVG as outlines, so
the SVG, PNG and PDF look the same on every machine whatever fonts it has (cairosvg would take
whatever fontconfig offers for a family name, and it misplaces middle/end anchored text with
tspans; outlines sidestep both). The text itself goes into the SVG's title, description and
aria-label attributes for readers and search.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

from fontTools.pens.recordingPen import DecomposingRecordingPen
from fontTools.ttLib import TTFont

FONTS = {"regular": "LiberationSans-Regular.ttf", "bold": "LiberationSans-Bold.ttf"}
FAMILY = "Liberation Sans"


@dataclass(frozen=True)
class FontMetrics:
    units_per_em: int
    ascent: float  # of 1 em
    descent: float  # of 1 em, positive
    cap_height: float  # of 1 em
    x_height: float


@cache
def _font(weight: str) -> TTFont:
    path = resources.files("chairdraw") / "fonts" / FONTS[weight]
    with resources.as_file(path) as file:
        return TTFont(str(file), lazy=False)


@cache
def metrics(weight: str = "regular") -> FontMetrics:
    font = _font(weight)
    em = font["head"].unitsPerEm
    os2 = font["OS/2"]
    return FontMetrics(em, font["hhea"].ascent / em, -font["hhea"].descent / em, os2.sCapHeight / em, os2.sxHeight / em)


# a glyph outline in em units, y up: (operator, points) with operators M, L, Q, C, Z
Outline = tuple[tuple[str, tuple[tuple[float, float], ...]], ...]
_OPS = {"moveTo": "M", "lineTo": "L", "qCurveTo": "Q", "curveTo": "C", "closePath": "Z", "endPath": ""}


@cache
def _glyph(weight: str, char: str) -> tuple[float, Outline]:
    """(advance in em, outline in em units) of one character."""
    font = _font(weight)
    cmap = font.getBestCmap()
    name = cmap.get(ord(char)) or cmap.get(ord("?"), ".notdef")
    glyphs = font.getGlyphSet()
    em = font["head"].unitsPerEm
    pen = DecomposingRecordingPen(glyphs)  # composite glyphs (accented, some symbols) as plain outlines
    glyphs[name].draw(pen)
    outline = tuple((_OPS[op], tuple((px / em, py / em) for px, py in points)) for op, points in _quadratics(pen.value))
    return font["hmtx"][name][0] / em, outline


def _quadratics(recorded):
    """Split TrueType qCurveTo runs (implied on-curve points) into single quadratic segments."""
    for op, points in recorded:
        if op != "qCurveTo" or len(points) <= 2:
            yield op, points
            continue
        *offs, end = points
        for k in range(len(offs) - 1):
            mid = ((offs[k][0] + offs[k + 1][0]) / 2, (offs[k][1] + offs[k + 1][1]) / 2)
            yield "qCurveTo", (offs[k], mid)
        yield "qCurveTo", (offs[-1], end)


def width(text: str, size: float, weight: str = "regular") -> float:
    """Advance width of ``text`` at font size ``size`` (same units as size)."""
    return sum(_glyph(weight, ch)[0] for ch in text) * size


def has_glyph(char: str, weight: str = "regular") -> bool:
    return ord(char) in _font(weight).getBestCmap()


def outline(text: str, x: float, y: float, size: float, weight: str = "regular") -> tuple[list[tuple[str, str]], float]:
    """(path data in em units, transform) per glyph for ``text`` with its baseline starting at
    (x, y) on a y-down page, and the x where the text ends. The path data of a glyph is made once;
    the transform scales it, flips it and moves it into place."""
    paths = []
    for ch in text:
        advance, d = _path(weight, ch)
        if d:
            paths.append((d, f"matrix({size:.3f} 0 0 {-size:.3f} {x:.2f} {y:.2f})"))
        x += advance * size
    return paths, x


@cache
def _path(weight: str, char: str) -> tuple[float, str]:
    advance, glyph = _glyph(weight, char)
    d = "".join(op + " ".join(f"{px:.4f} {py:.4f}" for px, py in points) for op, points in glyph if op)
    return advance, d
