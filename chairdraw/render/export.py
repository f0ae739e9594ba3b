"""Writing figures: SVG as is, PNG and PDF through cairosvg (imported only when needed: ~0.3 s).

The SVG is sized in points, so a PDF page is exactly the figure's size and a PNG gets
``dpi / 72`` pixels per point.
"""

from __future__ import annotations

import os
from pathlib import Path

from ..errors import FigureError

TYPES = ("svg", "png", "pdf")


def output_type(path: str | os.PathLike) -> str:
    kind = Path(path).suffix.lower().lstrip(".")
    if kind not in TYPES:
        raise FigureError(f"cannot tell the figure type from {str(path)!r}: use a name ending in .svg, .png or .pdf")
    return kind


MAX_PIXELS = 32767  # cairo's largest image side


def check_dpi(dpi) -> float:
    if isinstance(dpi, bool) or not (isinstance(dpi, int | float) and 10 <= dpi <= 2400):
        raise FigureError(f"dpi must be a number from 10 to 2400, not {str(dpi)[:24]!r}")
    return float(dpi)


def render(svg: str, kind: str, dpi: float = 300.0, size_pt: tuple[float, float] | None = None) -> bytes:
    """The figure as bytes of ``kind`` (svg, png, pdf); ``dpi`` sets a PNG's resolution, and
    ``size_pt`` (the figure's size) lets a PNG too large for cairo be refused with a reason."""
    if kind == "svg":
        return svg.encode("utf-8")
    if kind not in TYPES:
        raise FigureError(f"unknown figure type {kind!r} (svg, png or pdf)")
    dpi = check_dpi(dpi)
    if kind == "png" and size_pt is not None:
        w, h = (round(v * dpi / 72) for v in size_pt)
        if max(w, h) > MAX_PIXELS:
            raise FigureError(
                f"a {w} x {h} pixel PNG is larger than cairo can make ({MAX_PIXELS}); lower --dpi or write SVG/PDF"
            )
    import cairosvg

    try:
        if kind == "png":
            # cairosvg maps 1pt to dpi/72 px when dpi is given and the SVG is sized in pt
            return cairosvg.svg2png(bytestring=svg.encode("utf-8"), dpi=dpi)
        return cairosvg.svg2pdf(bytestring=svg.encode("utf-8"))
    except (MemoryError, OSError, ValueError) as exc:  # cairo's errors (CairoError is a MemoryError/OSError)
        raise FigureError(f"cairo could not make the {kind.upper()}: {exc}") from None


def write(svg: str, path: str | os.PathLike, dpi: float = 300.0, size_pt: tuple[float, float] | None = None) -> Path:
    kind = output_type(path)
    data = render(svg, kind, dpi, size_pt)
    try:
        Path(path).write_bytes(data)
    except OSError as exc:
        raise FigureError(f"cannot write {str(path)!r}: {exc.strerror}") from None
    return Path(path)
