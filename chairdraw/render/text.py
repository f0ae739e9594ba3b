"""Text from the shipped font (Liberation Sans, SIL OFL 1.1), or a TrueType/OpenType file the
user names (Style.font_file): widths and glyph outlines.

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

from ..errors import FigureError

FONTS = {"regular": "LiberationSans-Regular.ttf", "bold": "LiberationSans-Bold.ttf"}
FAMILY = "Liberation Sans"


@dataclass(frozen=True)
class FontMetrics:
    units_per_em: int
    ascent: float  # of 1 em
    descent: float  # of 1 em, positive
    cap_height: float  # of 1 em
    x_height: float


SEPARATOR = "\0"  # between the regular and the bold file of a user's font key (no path holds it)


def font_key(regular: str = "", bold: str = "") -> str:
    """The key of a user's font: '' for the shipped font; either file may be '' (shipped face)."""
    return f"{regular}{SEPARATOR}{bold}" if (regular or bold) else ""


@cache
def _font(weight: str, font: str = "") -> TTFont:
    """The face for ``weight``: the shipped one, or a user's file from the key ``font``."""
    if font:
        regular, _, bold = font.partition(SEPARATOR)
        # bold text without a bold file of the user's: the shipped bold, so bold stays bold
        path = bold if weight == "bold" else regular
        if path:
            try:
                face = TTFont(path, lazy=False)
                for table in ("head", "hhea", "hmtx"):
                    face[table]  # noqa: B018  (read now: a broken table fails here, not mid-drawing)
                if not face.getBestCmap():
                    raise ValueError("it has no Unicode character map")
                if face["head"].unitsPerEm <= 0:
                    raise ValueError("its units per em are not positive")
                face.getGlyphSet()
                return face
            except Exception as exc:  # fontTools raises many kinds for a file that is not a usable font
                raise FigureError(f"cannot read the font file {path!r}: {str(exc)[:120]}") from None
    packaged = resources.files("chairdraw") / "fonts" / FONTS[weight]
    with resources.as_file(packaged) as file:
        return TTFont(str(file), lazy=False)


@cache
def metrics(weight: str = "regular", font: str = "") -> FontMetrics:
    face = _font(weight, font)
    em = face["head"].unitsPerEm
    os2 = face["OS/2"] if "OS/2" in face else None
    cap = getattr(os2, "sCapHeight", 0) or 0.7 * em  # old fonts lack the cap height: a usual value
    x_height = getattr(os2, "sxHeight", 0) or 0.5 * em
    return FontMetrics(em, face["hhea"].ascent / em, -face["hhea"].descent / em, cap / em, x_height / em)


# a glyph outline in em units, y up: (operator, points) with operators M, L, Q, C, Z
Outline = tuple[tuple[str, tuple[tuple[float, float], ...]], ...]
_OPS = {"moveTo": "M", "lineTo": "L", "qCurveTo": "Q", "curveTo": "C", "closePath": "Z", "endPath": ""}


@cache
def _glyph(weight: str, char: str, font_file: str = "") -> tuple[float, Outline]:
    """(advance in em, outline in em units) of one character."""
    font = _font(weight, font_file)
    cmap = font.getBestCmap()
    if font_file and ord(char) not in cmap:
        return _glyph(weight, char)  # a sign the user's font lacks (≡, Δ, •): the shipped font's
    name = cmap.get(ord(char)) or cmap.get(ord("?"), ".notdef")
    glyphs = font.getGlyphSet()
    em = font["head"].unitsPerEm
    pen = DecomposingRecordingPen(glyphs)  # composite glyphs (accented, some symbols) as plain outlines
    try:
        glyphs[name].draw(pen)  # CFF outlines are decoded only here: a broken one fails here
    except Exception as exc:  # noqa: BLE001 (fontTools raises many kinds)
        raise FigureError(f"cannot draw {char!r} from the font file: {str(exc)[:120]}") from None
    outline = tuple((_OPS[op], tuple((px / em, py / em) for px, py in points)) for op, points in _quadratics(pen.value))
    return font["hmtx"][name][0] / em, outline


def _quadratics(recorded):
    """Split TrueType qCurveTo runs (implied on-curve points) into single quadratic segments. A
    contour of off-curve points only (its last point None) starts between its last and first."""
    for op, points in recorded:
        if op == "qCurveTo" and points and points[-1] is None:
            offs = list(points[:-1])
            start = ((offs[-1][0] + offs[0][0]) / 2, (offs[-1][1] + offs[0][1]) / 2)
            yield "moveTo", (start,)
            for k, off in enumerate(offs):
                nxt = offs[(k + 1) % len(offs)]
                yield "qCurveTo", (off, ((off[0] + nxt[0]) / 2, (off[1] + nxt[1]) / 2))
            continue
        if op != "qCurveTo" or len(points) <= 2:
            yield op, points
            continue
        *offs, end = points
        for k in range(len(offs) - 1):
            mid = ((offs[k][0] + offs[k + 1][0]) / 2, (offs[k][1] + offs[k + 1][1]) / 2)
            yield "qCurveTo", (offs[k], mid)
        yield "qCurveTo", (offs[-1], end)


def width(text: str, size: float, weight: str = "regular", font: str = "") -> float:
    """Advance width of ``text`` at font size ``size`` (same units as size)."""
    return sum(_glyph(weight, ch, font)[0] for ch in text) * size


def has_glyph(char: str, weight: str = "regular", font: str = "") -> bool:
    return ord(char) in _font(weight, font).getBestCmap()


def outline(
    text: str, x: float, y: float, size: float, weight: str = "regular", font: str = ""
) -> tuple[list[tuple[str, str]], float]:
    """(path data in em units, transform) per glyph for ``text`` with its baseline starting at
    (x, y) on a y-down page, and the x where the text ends. The path data of a glyph is made once;
    the transform scales it, flips it and moves it into place."""
    paths = []
    for ch in text:
        advance, d = _path(weight, ch, font)
        if d:
            paths.append((d, f"matrix({size:.3f} 0 0 {-size:.3f} {x:.2f} {y:.2f})"))
        x += advance * size
    return paths, x


@cache
def _path(weight: str, char: str, font: str = "") -> tuple[float, str]:
    advance, glyph = _glyph(weight, char, font)
    d = "".join(op + " ".join(f"{px:.4f} {py:.4f}" for px, py in points) for op, points in glyph if op)
    return advance, d
