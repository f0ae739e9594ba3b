"""Figure -> SVG text (svgwrite): strokes as lines, text as glyph outlines, sized in points.

The root carries width and height in pt and a viewBox in the same numbers, so one SVG unit is one
point: cairosvg turns it into a PDF page of exactly that size and into a PNG at any dpi. Each
label is a group with an aria-label and a title holding its text; the figure has a title and a
description (what the picture says in words) for accessibility.
"""

from __future__ import annotations

import svgwrite

from ..layout import SUB_DROP, SUB_SCALE, SUP_RISE
from . import text as fonttext

_SHIFT = {"normal": 0.0, "sub": SUB_DROP, "sup": -SUP_RISE}
# characters XML 1.0 does not allow (a caption or molfile title may carry them): dropped
_NOT_XML = dict.fromkeys([c for c in range(32) if c not in (9, 10, 13)] + [0xFFFE, 0xFFFF])


def xml_text(text: str) -> str:
    return "".join(ch for ch in text.translate(_NOT_XML) if not 0xD800 <= ord(ch) <= 0xDFFF)


def to_svg(figure, debug: bool = False) -> str:
    w, h = figure.width, figure.height
    dwg = svgwrite.Drawing(size=(f"{w:.2f}pt", f"{h:.2f}pt"), viewBox=f"0 0 {w:.2f} {h:.2f}", debug=debug)
    dwg.attribs["role"] = "img"
    dwg.set_desc(
        title=xml_text(figure.title), desc=xml_text(figure.description)
    )  # the first children, read by screen readers
    dwg.add(dwg.rect(insert=(0, 0), size=(f"{w:.2f}", f"{h:.2f}"), fill="white"))
    lines = dwg.g(stroke="black", stroke_linecap="round", fill="none")
    for s in figure.strokes:
        lines.add(
            dwg.line(
                (round(s.start[0], 2), round(s.start[1], 2)),
                (round(s.end[0], 2), round(s.end[1], 2)),
                stroke_width=round(s.width, 3),
                class_=s.role,
            )
        )
    dwg.add(lines)
    heads = dwg.g(fill="black", stroke="none")
    for p in figure.polygons:
        heads.add(dwg.polygon([(round(x, 2), round(y, 2)) for x, y in p.points], class_=p.role))
    dwg.add(heads)
    for t in figure.texts:
        group = dwg.g(fill="black", class_=t.role)
        group.attribs["aria-label"] = xml_text(t.plain)
        group.set_desc(title=xml_text(t.plain))
        x = t.x
        for run in t.runs:
            size = t.size * (SUB_SCALE if run.kind != "normal" else 1)
            y = t.y + _SHIFT[run.kind] * t.size
            paths, x = fonttext.outline(run.text, x, y, size, t.weight, t.font)
            for d, transform in paths:
                group.add(dwg.path(d=d, transform=transform))
        dwg.add(group)
    return dwg.tostring()
