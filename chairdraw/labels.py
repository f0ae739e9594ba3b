"""Condensed substituent labels: CO2Me, CH2OH, OTBS, NHAc, as drawn beside a chair.

A label is read with ``grammar/labels.lark`` into units (an atom symbol, an abbreviation or a
bracketed run, each with its count and charge). A label whose bond leaves the chair to the left is
written with its units in reverse order, so that the atom bonded to the ring stays next to the
bond: CO2Me -> MeO2C, CH2OH -> HOH2C, CH(CH3)2 -> (H3C)2HC (common practice in structure drawing).
Counts are drawn as subscripts and charges as superscripts.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache

from lark import Lark, Token, Transformer, UnexpectedInput, UnexpectedToken

from .errors import LabelError

NORMAL, SUB, SUP = "normal", "sub", "sup"
# report labels that a structure drawing writes with the usual abbreviation (common practice)
DRAWN_AS = {"COMe": "Ac", "cHex": "Cy", "SiMe3": "TMS", "COPh": "Bz", "CH2Ph": "Bn"}
# on a nitrogen, an alkoxycarbonyl is a carbamate protecting group and is written as one
ON_NITROGEN = {"CO2tBu": "Boc", "CO2Bn": "Cbz"}
_SHOWN = {"#": "\u2261", "-": "\u2212"}  # triple bond, minus sign: what a printed label shows


@dataclass(frozen=True)
class Unit:
    """One unit of a label: its head (a symbol, or a bracketed run of units), count and charge."""

    head: str | tuple[Unit, ...]
    count: str = ""
    charge: str = ""

    def runs(self, reverse: bool = False) -> list[tuple[str, str]]:
        if isinstance(self.head, str):
            out = [(_SHOWN.get(self.head, self.head), NORMAL)]
        else:
            inner = reversed(self.head) if reverse else self.head
            out = [("(", NORMAL)] + [r for u in inner for r in u.runs(reverse)] + [(")", NORMAL)]
        if self.count:
            out.append((self.count, SUB))
        if self.charge:
            out.append(("".join(_SHOWN.get(c, c) for c in self.charge), SUP))
        return out

    def text(self) -> str:
        head = self.head if isinstance(self.head, str) else "(" + "".join(u.text() for u in self.head) + ")"
        return head + self.count + self.charge


@dataclass(frozen=True)
class Label:
    """A parsed label. ``runs(reverse)`` gives (text, normal/sub/sup) pieces, merged where the
    kind does not change; the attachment unit comes first, or last when reversed."""

    text: str
    units: tuple[Unit, ...]
    charge: str = ""  # the charge of the whole group (NH3+): written last in either direction

    def groups(self) -> list[tuple[Unit, ...]]:
        """Units as they move when the label is reversed: a bracketed =O or =S, written (O) or (S),
        stays with the atom before it (S(O)Me -> MeS(O), P(O)Ph2 -> Ph2P(O)); any other bracket
        is a group of its own ((Me)2N)."""
        out: list[tuple[Unit, ...]] = []
        for u in self.units:
            oxo = (
                not isinstance(u.head, str)
                and not u.count
                and len(u.head) == 1
                and u.head[0].head in ("O", "S")
                and not u.head[0].count
            )
            if out and oxo and out[-1][-1].head != "H":
                out[-1] = out[-1] + (u,)
            else:
                out.append((u,))
        return out

    def runs(self, reverse: bool = False) -> list[tuple[str, str]]:
        groups = list(reversed(self.groups())) if reverse else self.groups()
        pieces = [r for g in groups for u in g for r in u.runs(reverse)]
        if self.charge:
            pieces.append(("".join(_SHOWN.get(c, c) for c in self.charge), SUP))
        merged: list[tuple[str, str]] = []
        for piece, kind in pieces:
            if merged and merged[-1][1] == kind:
                merged[-1] = (merged[-1][0] + piece, kind)
            else:
                merged.append((piece, kind))
        return merged

    def attachment(self, reverse: bool = False) -> tuple[int, int]:
        """(start, end) character offsets, in the joined runs, of the attachment unit's first
        symbol: the glyphs a bond to the ring should point at."""
        groups = list(reversed(self.groups())) if reverse else self.groups()
        before = sum(len(t) for g in (groups[:-1] if reverse else []) for u in g for t, _ in u.runs(reverse))
        head = self.units[0].runs(reverse)[0][0]
        return before, before + len(head)

    def reversed_text(self) -> str:
        return "".join(t for t, _ in self.runs(reverse=True))


class _Build(Transformer):
    def start(self, units):
        return tuple(units)

    def unit(self, items):
        head, count, charge = items[0], "", ""
        for item in items[1:]:
            if isinstance(item, Token) and item.type == "COUNT":
                count = str(item)
            elif isinstance(item, Token) and item.type == "CHARGE":
                charge = str(item)
        return Unit(head, count, charge)

    def abbreviation(self, items):
        return str(items[0])

    element = bond = abbreviation

    def bracket(self, units):
        return tuple(units)


@cache
def _parser() -> Lark:
    return Lark.open_from_package("chairdraw", "labels.lark", ("grammar",), parser="lalr")


@cache
def parse_label(text: str) -> Label:
    """Read a condensed label; a bad one raises LabelError with a caret under the problem."""
    if not text or not text.strip():
        raise LabelError("empty label")
    try:
        tree = _parser().parse(text)
    except UnexpectedInput as exc:
        column = getattr(exc, "column", None)
        if isinstance(exc, UnexpectedToken) and exc.token.type == "$END":
            column = len(text) + 1
        column = column if isinstance(column, int) and column > 0 else len(text) + 1
        what = "label ends too early" if column > len(text) else f"unexpected {text[column - 1]!r}"
        caret = f"  {text}\n  {' ' * (column - 1)}^"
        raise LabelError(f"{what} at column {column} of {text!r}", column=column, detail=caret) from None
    units = _Build().transform(tree)
    last = units[-1]
    if len(units) > 1 and last.charge:  # NH3+ is the charged group H3N+, not N then H3+
        return Label(text, units[:-1] + (Unit(last.head, last.count),), last.charge)
    return Label(text, units)


def can_parse(text: str) -> bool:
    try:
        parse_label(text)
    except LabelError:
        return False
    return True
