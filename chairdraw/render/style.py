"""One frozen style object for every figure: sizes in points, overridable from a TOML file.

The defaults follow the drawing settings many chemistry journals ask for in a single column
(bond length 14.4 pt, line width 0.6 pt, 10 pt sans-serif labels; common practice, from the
1996 ACS document settings that most journals still accept).
"""

from __future__ import annotations

import dataclasses
import math
import tomllib
from dataclasses import dataclass, fields
from pathlib import Path

from ..errors import FigureError
from .text import font_key

HYDROGENS = ("none", "stereo", "all")
# upper bounds of the sizes (pt, or a multiple for chair_scale): beyond them a figure is no longer
# a figure (and cairo's 32767-pixel limit is hit at print resolutions)
LARGEST = {
    "bond_length": 144.0,
    "line_width": 10.0,
    "font_size": 72.0,
    "caption_size": 72.0,
    "label_gap": 20.0,
    "margin": 144.0,
    "chair_spacing": 720.0,
    "row_spacing": 720.0,
    "crossing_gap": 20.0,
    "chair_scale": 5.0,
}
CHAIRS = ("both", "favored", "flip")


@dataclass(frozen=True)
class Style:
    bond_length: float = 14.4  # pt, ring bonds and substituent bonds
    line_width: float = 0.6  # pt
    font_size: float = 10.0  # pt, atom labels
    caption_size: float = 9.0  # pt, chair names, populations, energies, captions
    label_gap: float = 1.2  # pt between a label's glyphs and the end of its bond
    margin: float = 6.0  # pt around the figure
    chair_spacing: float = 62.0  # pt between the two chairs (holds the equilibrium arrows)
    row_spacing: float = 16.0  # pt between the rows of a figure with several rings
    crossing_gap: float = 2.0  # pt cut out of a ring bond where a bond in front crosses it
    hydrogens: str = "stereo"  # none | stereo (on stereocentres) | all
    units: str = "kcal"  # kcal | kJ
    numbering: bool = False  # ring locants beside the ring atoms
    chair_scale: float = 0.0  # chairs drawn at this multiple of bond_length; 0: as large as labels need
    # a TrueType/OpenType file for all text ("" = the shipped Liberation Sans, metric-compatible
    # with Arial), and one for bold text, the favoured chair's caption ("" = the shipped bold);
    # signs a font lacks (≡, Δ, •) come from the shipped font
    font_file: str = ""
    bold_font_file: str = ""

    def __post_init__(self):
        for f in fields(self):
            value = getattr(self, f.name)
            if f.type == "float":
                number = isinstance(value, int | float) and not isinstance(value, bool)
                if not (number and math.isfinite(value) and 0 <= value <= LARGEST[f.name]):
                    raise FigureError(
                        f"style {f.name} must be a number from 0 to {LARGEST[f.name]:g}, not {str(value)[:24]!r}"
                    )
            elif f.type == "bool" and not isinstance(value, bool):
                raise FigureError(f"style {f.name} must be true or false, not {str(value)[:24]!r}")
            elif f.type == "str" and not isinstance(value, str):
                raise FigureError(f"style {f.name} must be text, not {str(value)[:24]!r}")
        if self.bond_length <= 0 or self.font_size <= 0 or self.caption_size <= 0:
            raise FigureError("style bond_length, font_size and caption_size must be above 0")
        if self.hydrogens not in HYDROGENS:
            raise FigureError(f"style hydrogens must be one of {', '.join(HYDROGENS)}, not {self.hydrogens!r}")
        if self.units not in ("kcal", "kJ"):
            raise FigureError(f"style units must be kcal or kJ, not {self.units!r}")
        for name in ("font_file", "bold_font_file"):
            path = getattr(self, name)
            if path and not Path(path).is_file():
                raise FigureError(f"style {name}: no such file {path!r}")

    @property
    def font(self) -> str:
        """The font key of the text module ('' for the shipped font)."""
        return font_key(self.font_file, self.bold_font_file)

    def replace(self, **changes) -> Style:
        known = {f.name for f in fields(self)}
        unknown = sorted(set(changes) - known)
        if unknown:
            raise FigureError(f"unknown style setting {unknown[0]!r} (known: {', '.join(sorted(known))})")
        return dataclasses.replace(self, **{k: v for k, v in changes.items() if v is not None})


def load_style(path: str | Path, base: Style | None = None) -> Style:
    """A style from a TOML file of the Style fields (sizes in points), on top of ``base``."""
    try:
        with open(path, "rb") as handle:
            data = tomllib.load(handle)
    except OSError as exc:
        raise FigureError(f"cannot read style file {str(path)!r}: {exc.strerror}") from None
    except tomllib.TOMLDecodeError as exc:
        raise FigureError(f"style file {str(path)!r} is not valid TOML: {exc}") from None
    data = data.get("style", data)  # a [style] table, or the settings at top level
    if not isinstance(data, dict):
        raise FigureError(f"style file {str(path)!r}: 'style' must be a table of settings ([style])")
    for name in ("font_file", "bold_font_file"):  # a font named in the file is found beside the file
        value = data.get(name)
        if isinstance(value, str) and value and not Path(value).is_absolute():
            data[name] = str(Path(path).parent / value)
    return (base or Style()).replace(**data)
