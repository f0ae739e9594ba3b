"""The energy of one chair as a list of named, sourced terms (additive model).

* A-value of every axial group (the ring position's own value where the table has one);
* syn-1,3-diaxial pairs, net of the two X/H halves already inside the A-values;
* vicinal gauche pairs (equatorial/equatorial and axial/equatorial neighbours);
* geminal pairs that were measured as a pair (``geminal.txt``), replacing additivity;
* the anomeric effect for O-linked groups and halogens next to a ring oxygen.

A ``ChairModel`` is built once per ring: which pairs of groups can interact and with which table
row does not depend on the configuration or the chair, so every term is made once and reused
across the chairs and the relative configurations of the ring. Warnings say where the model is on
thin ice: estimated groups, values from memory, cyclohexane values used in a heterocycle, geminal
pairs, pairs with no published interaction value, aqueous values used in another solvent.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from ..chairs import AXIAL, EQUATORIAL
from ..rings import ChairRing
from ..substituents import Group
from . import tables

# a ring position: (ring atom, attached atom or None, element symbol); the same in every chair
Key = tuple[int, "int | None", str]


@dataclass(frozen=True)
class Term:
    kind: str  # a-value, syn-diaxial, gauche, geminal, anomeric
    name: str
    atoms: tuple[int, ...]
    value: float  # kcal/mol, added to this chair's energy
    sources: tuple[str, ...]
    estimated: bool = False

    def to_dict(self) -> dict:
        return {
            "kind": self.kind,
            "name": self.name,
            "atoms": list(self.atoms),
            "value_kcal_mol": round(self.value, 4),
            "source": tables.citation(self.sources),
            "source_keys": list(self.sources),
            "estimated": self.estimated,
        }


NO_POSITION_VALUE = "cyclohexane A-value used (no value for this ring position): "


def context(ring: ChairRing, i: int) -> str | None:
    """Ring heteroatoms seen from ring index i, e.g. 'O1+O3'; 'N-ring' on a ring nitrogen."""
    if ring.elements[i] == "N":
        return "N-ring"
    parts = []
    for j, element in enumerate(ring.elements):
        if element != "C" and j != i:
            d = abs(j - i)
            parts.append((min(d, 6 - d), element))
    if not parts:
        return None
    return "+".join(f"{e}{d}" for d, e in sorted(parts, key=lambda p: (p[0], p[1])))


def _pair(term: str, a: str, b: str) -> tables.PairTerm | None:
    for row in tables.pair_terms():
        if row.term == term and {row.a, row.b} == {a, b} and (a == b) == (row.a == row.b):
            return row
    return None


def _anomeric(pair_class: str, solvent: str) -> tables.PairTerm | None:
    for row in tables.pair_terms():
        if row.term == "anomeric" and row.a == pair_class and row.b in (solvent, "any"):
            return row
    return None


def _geminal(a: Group, b: Group) -> tables.GeminalPair | None:
    if a.estimated_as or b.estimated_as:
        return None
    for row in tables.geminal_pairs():
        if {row.axial_group, row.other} == {a.label, b.label} and a.label != b.label:
            return row
    return None


@dataclass
class _Entry:
    """One group position of the ring with everything that does not depend on the chair."""

    key: Key
    index: int
    group: Group
    atoms: tuple[int, ...]
    value: float  # the A-value used for this position
    axial_term: Term
    axial_warnings: tuple[str, ...]
    anomeric: Term | None


class ChairModel:
    """The additive model for one ring and its groups; ``evaluate`` gives one chair's terms."""

    def __init__(self, ring: ChairRing, groups: Mapping[Key, Group], solvent: str, indices: Mapping[Key, int]):
        self.ring = ring
        self.solvent = solvent
        self.entries = [self._entry(k, indices[k], g) for k, g in groups.items()]
        by_order = sorted(range(len(self.entries)), key=lambda n: self.entries[n].index)
        # (ring distance, entry numbers, entries) of every pair on different ring atoms
        self._pairs: list[tuple[int, int, int, _Entry, _Entry]] = []
        self._geminal: list[tuple[int, _Entry, _Entry, tables.GeminalPair]] = []
        for x, n in enumerate(by_order):
            a = self.entries[n]
            for m in by_order[x + 1 :]:
                b = self.entries[m]
                d = (b.index - a.index) % 6
                if d == 0:
                    row = _geminal(a.group, b.group)
                    if row is not None:
                        first, second = (a, b) if a.group.label == row.axial_group else (b, a)
                        self._geminal.append((self.entries.index(first), first, second, row))
                elif a.index < b.index:
                    self._pairs.append((d, n, m, a, b))
        self._anomeric = [(n, e.anomeric) for n, e in enumerate(self.entries) if e.anomeric is not None]
        self._cache: dict[tuple, tuple[Term | None, str | None]] = {}

    def _entry(self, key: Key, index: int, g: Group) -> _Entry:
        loc = self.ring.locants[index]
        ctx = context(self.ring, index)
        value, row, matched = g.avalue(self.solvent, ctx)
        atoms = (key[0],) if key[1] is None else (key[0], key[1])
        name = (
            f"axial {g.label} at {loc}"
            + (f" ({row.note})" if row.context and row.note else "")
            + (f" (estimated as {g.estimated_as}: value of {row.label})" if g.estimated_as else "")
        )
        sources = (("class",) + row.sources) if g.estimated_as else row.sources
        term = Term("a-value", name, atoms, value, sources, estimated=g.estimated_as is not None)
        warnings = []
        if g.estimated_as is None and any(tables.sources()[k].from_memory for k in row.sources[:1]):
            warnings.append(f"the A-value of {g.label} at {loc} ({value:g}) is from memory, not from a checked compilation")
        if ctx is not None and not matched:
            warnings.append(f"{NO_POSITION_VALUE}{g.label} at {loc}")
        anomeric = None
        ring = self.ring
        if ring.elements[index] == "C" and "O" in (ring.elements[(index - 1) % 6], ring.elements[(index + 1) % 6]):
            row_a = _anomeric(g.pair_class, self.solvent)
            if row_a is not None:
                anomeric = Term("anomeric", f"anomeric effect, axial {g.label} at {loc}", atoms, row_a.value, (row_a.source,))
        return _Entry(key, index, g, atoms, value, term, tuple(warnings), anomeric)

    def evaluate(self, axial: Sequence[bool]) -> tuple[float, list[Term], list[str]]:
        """(energy, terms, warnings) of the chair in which entry n is axial when ``axial[n]``."""
        terms: list[Term] = []
        warnings: list[str] = []
        for n, e in enumerate(self.entries):
            if axial[n]:
                terms.append(e.axial_term)
                warnings.extend(e.axial_warnings)
        for d, n, m, a, b in self._pairs:
            both = axial[n] and axial[m]
            if d in (2, 4):
                if not both:
                    continue
                term, warning = self._syn_diaxial(a, b)
            elif d in (1, 5) and not both:
                term, warning = self._gauche(a, b, axial[n], axial[m])
            else:
                continue
            if term is not None:
                terms.append(term)
            if warning is not None:
                warnings.append(warning)
        for n, first, second, row in self._geminal:
            if axial[n]:
                terms.append(self._geminal_term(first, second, row))
        for n, term in self._anomeric:
            if axial[n]:
                terms.append(term)
        return sum(t.value for t in terms), terms, warnings

    # --- pair terms, each made once per ring ------------------------------------------------------

    def _where(self, a: _Entry, b: _Entry) -> str:
        loc = self.ring.locants
        return f"{a.group.label}/{b.group.label} at {loc[a.index]},{loc[b.index]}"

    def _aqueous(self, row: tables.PairTerm) -> str:
        if self.solvent != "protic" and "aqueous" in row.note:
            return "; value measured in water"
        return ""

    def _syn_diaxial(self, a: _Entry, b: _Entry) -> tuple[Term | None, str | None]:
        key = ("syn", a.key, b.key)
        if key not in self._cache:
            row = _pair("syn-diaxial", a.group.pair_class, b.group.pair_class)
            where = self._where(a, b)
            if row is None:
                self._cache[key] = (
                    None,
                    f"no published syn-1,3-diaxial value for {where}; only the A-values are counted",
                )
            else:
                net = row.value - a.value / 2 - b.value / 2
                name = (
                    f"syn-1,3-diaxial {where} ({row.value:g} less the two X/H halves in the A-values"
                    f"{self._aqueous(row)})"
                )
                self._cache[key] = (Term("syn-diaxial", name, a.atoms + b.atoms, net, (row.source,)), None)
        return self._cache[key]

    def _gauche(self, a: _Entry, b: _Entry, a_axial: bool, b_axial: bool) -> tuple[Term | None, str | None]:
        kinds = "/".join(sorted("ax" if x else "eq" for x in (a_axial, b_axial)))
        key = ("gauche", a.key, b.key, kinds)
        if key not in self._cache:
            row = _pair("gauche", a.group.pair_class, b.group.pair_class)
            term = None
            if row is not None:
                name = f"gauche {self._where(a, b)} ({kinds}{self._aqueous(row)})"
                term = Term("gauche", name, a.atoms + b.atoms, row.value, (row.source,))
            self._cache[key] = (term, None)
        return self._cache[key]

    def _geminal_term(self, first: _Entry, second: _Entry, row: tables.GeminalPair) -> Term:
        key = ("geminal", first.key, second.key)
        if key not in self._cache:
            value = row.value - (first.value - second.value)
            name = (
                f"geminal {first.group.label}/{second.group.label} at {self.ring.locants[first.index]}, "
                f"{first.group.label} axial: measured pair value {row.value:+g} replaces "
                f"A({first.group.label}) - A({second.group.label})"
            )
            self._cache[key] = (Term("geminal", name, first.atoms + second.atoms[1:], value, (row.source,)), None)
        term = self._cache[key][0]
        assert term is not None
        return term

    # --- warnings about the ring as a whole -------------------------------------------------------

    def ring_warnings(self) -> list[str]:
        """Estimated groups and geminal pairs (the same in every chair and configuration)."""
        out = []
        measured = {frozenset((a.key, b.key)) for _, a, b, _ in self._geminal}
        per_index: dict[int, list[_Entry]] = {}
        for e in self.entries:
            per_index.setdefault(e.index, []).append(e)
        for i, here in sorted(per_index.items()):
            where = self.ring.locants[i]
            for e in here:
                g = e.group
                if not g.estimated_as:
                    continue
                value = g.rows[0].aprotic
                if g.estimated_as == "unclassified":
                    out.append(f"{g.label} at {where}: no A-value and no class; a placeholder of {value:g} kcal/mol is used")
                else:
                    out.append(
                        f"{g.label} at {where} is not in the A-value table: estimated as {g.estimated_as} "
                        f"(value of {g.rows[0].label}, {value:g} kcal/mol)"
                    )
            if len(here) == 2 and self.ring.elements[i] == "C":
                a, b = here
                if frozenset((a.key, b.key)) in measured:
                    out.append(
                        f"geminal {a.group.label}/{b.group.label} at {where}: the measured pair value is used "
                        "instead of the two A-values"
                    )
                else:
                    out.append(
                        f"geminal {a.group.label}/{b.group.label} at {where}: A-values are not additive for "
                        "geminal pairs (1-methyl-1-phenylcyclohexane prefers axial phenyl, Eliel & Manoharan 1981)"
                    )
        return out


__all__ = ["ChairModel", "Key", "Term", "context", "AXIAL", "EQUATORIAL", "NO_POSITION_VALUE"]
