"""Golden figures: the SVG of a few figures, compared after normalising (numbers to 0.1 pt,
attributes sorted), must stay what a person looked at and approved (tests/golden/*.svg). After an intended change, look at the new PNGs
(chairdraw draw ... -o x.png) and regenerate with CHAIRDRAW_GOLDEN=write pytest tests/test_golden.py.
"""

from __future__ import annotations

import os
import re
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

import chairdraw

GOLDEN = Path(__file__).parent / "golden"
FIGURES = {
    "cis-4-methylcyclohexanol": "C[C@H]1CC[C@@H](O)CC1",
    "beta-D-glucopyranose": "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O",
    "4-methylcyclohexanone": "C[C@@H]1CCC(=O)CC1",
}
_NUMBER = re.compile(r"-?\d+\.\d+")


def normalise(svg: str) -> str:
    root = ET.fromstring(svg)
    lines = []
    for el in root.iter():
        attrs = " ".join(
            f"{k}={_NUMBER.sub(lambda m: f'{float(m.group()):.1f}', v)}" for k, v in sorted(el.attrib.items())
        )
        text = (el.text or "").strip()
        lines.append(f"{el.tag.split('}')[-1]} {attrs} {text}".rstrip())
    return "\n".join(lines) + "\n"


@pytest.mark.parametrize("name", sorted(FIGURES))
def test_golden_svg(name):
    svg = chairdraw.draw(FIGURES[name]).svg()
    path = GOLDEN / f"{name}.svg"  # the approved figure itself, viewable in any browser
    if os.environ.get("CHAIRDRAW_GOLDEN") == "write":
        path.write_text(svg, encoding="utf-8")
    want = normalise(path.read_text(encoding="utf-8"))
    assert normalise(svg) == want, (
        f"{name}: the figure changed; look at it, then regenerate (see this file's docstring)"
    )
