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


def render(svg: str, kind: str, dpi: float = 300.0) -> bytes:
    """The figure as bytes of ``kind`` (svg, png, pdf); ``dpi`` sets a PNG's resolution."""
    if kind == "svg":
        return svg.encode("utf-8")
    if kind not in TYPES:
        raise FigureError(f"unknown figure type {kind!r} (svg, png or pdf)")
    if not (isinstance(dpi, int | float) and 10 <= dpi <= 2400):
        raise FigureError(f"dpi must be a number from 10 to 2400, not {dpi!r}")
    import cairosvg

    if kind == "png":
        # cairosvg maps 1pt to dpi/72 px when dpi is given and the SVG is sized in pt
        return cairosvg.svg2png(bytestring=svg.encode("utf-8"), dpi=dpi)
    return cairosvg.svg2pdf(bytestring=svg.encode("utf-8"))


def write(svg: str, path: str | os.PathLike, dpi: float = 300.0) -> Path:
    kind = output_type(path)
    data = render(svg, kind, dpi)
    try:
        Path(path).write_bytes(data)
    except OSError as exc:
        raise FigureError(f"cannot write {str(path)!r}: {exc.strerror}") from None
    return Path(path)
