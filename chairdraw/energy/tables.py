"""The shipped data tables, loaded once into frozen, sourced objects.

Files live in ``chairdraw/data``: pipe-separated text with '#' comments and a header line, so that
a chemist can read and extend them with any editor. Every number carries a source key that
resolves to a citation in ``sources.txt``.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

from ..errors import DataFileError


@dataclass(frozen=True)
class Source:
    key: str
    citation: str
    status: str  # C, C2, M, estimate, placeholder

    @property
    def from_memory(self) -> bool:
        return self.status == "M"


@dataclass(frozen=True)
class AValue:
    label: str
    group: str  # substituent SMILES with '*' for the ring atom, as written in the file
    aprotic: float | None  # None only on context rows measured in water
    protic: float | None
    context: str | None
    sources: tuple[str, ...]
    note: str
    xh: float | None = None  # one 1,3-diaxial X/H interaction's part of the value; None: half of it

    def covers(self, solvent: str) -> bool:
        return self.aprotic is not None or (solvent == "protic" and self.protic is not None)

    def value(self, solvent: str) -> float:
        if solvent == "protic" and self.protic is not None:
            return self.protic
        if self.aprotic is None:
            raise ValueError(f"no {solvent} value for {self.label} ({self.context})")
        return self.aprotic


@dataclass(frozen=True)
class SubstituentClass:
    name: str
    smarts: str
    representative: str  # label of an AValue row
    pair_class: str


@dataclass(frozen=True)
class PairTerm:
    term: str  # syn-diaxial, gauche, anomeric
    a: str
    b: str
    value: float
    source: str
    note: str
    context: frozenset[str] | None = None  # the two ring positions' contexts; None: any positions


def _rows(name: str) -> list[tuple[int, dict[str, str]]]:
    text = resources.files("chairdraw").joinpath("data", name).read_text(encoding="utf-8")
    header: list[str] | None = None
    rows = []
    for number, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        cells = [c.strip() for c in line.split("|")]
        if header is None:
            header = cells
            continue
        if len(cells) != len(header):
            raise DataFileError(f"{name}, line {number}: {len(cells)} fields, the header has {len(header)}")
        rows.append((number, dict(zip(header, cells))))
    return rows


def _number(name: str, line: int, text: str) -> float:
    try:
        return float(text)
    except ValueError:
        raise DataFileError(f"{name}, line {line}: {text!r} is not a number") from None


@cache
def sources() -> dict[str, Source]:
    return {r["key"]: Source(r["key"], r["citation"], r["status"]) for _, r in _rows("sources.txt")}


@cache
def avalues() -> tuple[AValue, ...]:
    known = sources()
    out = []
    for line, r in _rows("avalues.txt"):
        keys = tuple(k.strip() for k in r["source"].split(";") if k.strip())
        for k in keys:
            if k not in known:
                raise DataFileError(f"avalues.txt, line {line}: unknown source {k!r}")
        context = None if r["context"] == "-" else r["context"]
        if r["aprotic"] == "-" and (context is None or r["protic"] == "-"):
            raise DataFileError(f"avalues.txt, line {line}: only a context row with a protic value may omit aprotic")
        out.append(
            AValue(
                label=r["label"],
                group=r["group"],
                aprotic=None if r["aprotic"] == "-" else _number("avalues.txt", line, r["aprotic"]),
                protic=None if r["protic"] == "-" else _number("avalues.txt", line, r["protic"]),
                context=context,
                sources=keys,
                note=r["note"],
                xh=None if r["xh"] == "-" else _number("avalues.txt", line, r["xh"]),
            )
        )
    return tuple(out)


@cache
def classes() -> tuple[SubstituentClass, ...]:
    labels = {a.label for a in avalues()}
    out = []
    for line, r in _rows("classes.txt"):
        if r["representative"] not in labels:
            raise DataFileError(f"classes.txt, line {line}: unknown representative {r['representative']!r}")
        out.append(SubstituentClass(r["class"], r["smarts"], r["representative"], r["pair_class"]))
    return tuple(out)


@cache
def drawing_labels() -> tuple[tuple[str, str], ...]:
    """(label, group SMILES) of labels.txt: names for drawing groups that have no A-value row."""
    return tuple((r["label"], r["group"]) for _, r in _rows("labels.txt"))


@cache
def alias_spellings() -> tuple[tuple[str, str], ...]:
    """(alias, group SMILES) of aliases.txt: other spellings of groups, for reading drawings."""
    return tuple((r["label"], r["group"]) for _, r in _rows("aliases.txt"))


@cache
def pair_terms() -> tuple[PairTerm, ...]:
    known = sources()
    out = []
    for line, r in _rows("pairs.txt"):
        if r["source"] not in known:
            raise DataFileError(f"pairs.txt, line {line}: unknown source {r['source']!r}")
        where = None if r["context"] == "-" else frozenset(r["context"].split("/"))
        if where is not None and len(r["context"].split("/")) != 2:
            raise DataFileError(f"pairs.txt, line {line}: context {r['context']!r} is not two contexts joined by '/'")
        value = _number("pairs.txt", line, r["value"])
        out.append(PairTerm(r["term"], r["a"], r["b"], value, r["source"], r["note"], where))
    return tuple(out)


@dataclass(frozen=True)
class GeminalPair:
    """A geminal pair measured as a pair: G(axial_group axial) - G(other axial), kcal/mol."""

    axial_group: str  # label of an AValue row
    other: str
    value: float
    source: str
    note: str


@cache
def geminal_pairs() -> tuple[GeminalPair, ...]:
    known = sources()
    labels = {a.label for a in avalues()}
    out = []
    for line, r in _rows("geminal.txt"):
        if r["source"] not in known:
            raise DataFileError(f"geminal.txt, line {line}: unknown source {r['source']!r}")
        for label in (r["axial"], r["other"]):
            if label not in labels:
                raise DataFileError(f"geminal.txt, line {line}: unknown group {label!r}")
        value = _number("geminal.txt", line, r["value"])
        out.append(GeminalPair(r["axial"], r["other"], value, r["source"], r["note"]))
    return tuple(out)


def citation(keys: tuple[str, ...] | str) -> str:
    """Full citation text for one or several source keys."""
    if isinstance(keys, str):
        keys = (keys,)
    table = sources()
    return "; ".join(table[k].citation for k in keys)
