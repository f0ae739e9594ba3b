"""The energy of one chair as a list of named, sourced terms (additive model).

* A-value of every axial group (the ring position's own value where the table has one);
* syn-1,3-diaxial pairs, net of the two X/H interactions already inside the A-values;
* vicinal gauche pairs (equatorial/equatorial and axial/equatorial neighbours);
* geminal pairs that were measured as a pair (``geminal.txt``), replacing additivity;
* the anomeric effect for O-linked groups and halogens next to a ring oxygen.

A ``ChairModel`` is built once per ring: which pairs of groups can interact and with which table
row does not depend on the configuration or the chair, so every term is made once, when the
model is built, and reused across the chairs and the relative configurations of the ring. Warnings say where the model is on
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
    """Ring heteroatoms seen from ring index i, e.g. 'O1+O3'; 'N-ring' on a ring nitrogen. A ring
    nitrogen without a lone pair (an ammonium) is 'N+': the piperidine rows, measured on the free
    amine and against the lone pair, do not apply to it; a planar one (amide, N-aryl) is 'Nsp2'."""
    if ring.elements[i] == "N":
        return "N+ring" if i in ring.ammonium else "N-ring"
    parts = []
    for j, element in enumerate(ring.elements):
        if element != "C" and j != i:
            if j in ring.ammonium:
                element = "N+"
            elif j in ring.trigonal:  # a planar N/O (amide, N-aryl): the sp3 ring's rows do not apply
                element += "sp2"
            d = abs(j - i)
            parts.append((min(d, 6 - d), element))
    if not parts:
        return None
    return "+".join(f"{e}{d}" for d, e in sorted(parts, key=lambda p: (p[0], p[1])))


def _pair(term: str, a: str, b: str, where: tuple[str | None, str | None] = (None, None)) -> tables.PairTerm | None:
    """The table row for a pair of groups of classes a and b at ring positions with the contexts
    ``where``: a row for exactly those positions if there is one, else the general row."""
    general = None
    for row in tables.pair_terms():
        if row.term == term and {row.a, row.b} == {a, b} and (a == b) == (row.a == row.b):
            if row.context is None:
                general = general or row
            elif None not in where and row.context == frozenset(where):
                return row
    return general


def _anomeric(pair_class: str, solvent: str, term: str = "anomeric") -> tables.PairTerm | None:
    for row in tables.pair_terms():
        if row.term == term and row.a == pair_class and row.b in (solvent, "any"):
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
    context: str | None  # ring heteroatoms seen from this position (see ``context``)
    xh: float  # the part of ``value`` made by one 1,3-diaxial X/H interaction


@dataclass(frozen=True)
class _Pair:
    """Two groups on different ring atoms: the terms they bring, made once."""

    n: int  # entry numbers
    m: int
    syn: bool  # 1,3 on the ring (a syn-diaxial pair when both are axial); else neighbours
    diaxial: Term | None = None
    diaxial_warning: str | None = None
    gauche_mixed: Term | None = None  # axial/equatorial
    gauche_equatorial: Term | None = None  # equatorial/equatorial
    gross: float = 0.0  # the published syn-diaxial pair value itself (before the X/H parts)
    gauche_warning: str | None = None  # neighbours with no published gauche value


class ChairModel:
    """The additive model for one ring and its groups; ``evaluate`` gives one chair's terms."""

    def __init__(self, ring: ChairRing, groups: Mapping[Key, Group], solvent: str):
        self.ring = ring
        self.solvent = solvent
        self.entries = [self._entry(k, ring.atoms.index(k[0]), g) for k, g in groups.items()]
        by_order = sorted(range(len(self.entries)), key=lambda n: self.entries[n].index)
        self._pairs: list[_Pair] = []
        self._geminal: list[tuple[int, Term]] = []  # (entry axial in the chair that gets it, term)
        self.measured_geminal: set[frozenset[Key]] = set()
        for x, n in enumerate(by_order):
            for m in by_order[x + 1 :]:
                a, b = self.entries[n], self.entries[m]
                d = b.index - a.index
                if d == 0:
                    row = _geminal(a.group, b.group)
                    if row is not None:
                        first, second = (n, m) if a.group.label == row.axial_group else (m, n)
                        self._geminal.append((first, self._geminal_term(first, second, row)))
                        self.measured_geminal.add(frozenset((a.key, b.key)))
                elif d in (2, 4):
                    self._pairs.append(self._syn_diaxial(n, m))
                elif d in (1, 5):
                    self._pairs.append(self._vicinal(n, m))
        self._anomeric = [(n, e.anomeric) for n, e in enumerate(self.entries) if e.anomeric is not None]
        # (anomeric entry, neighbour entry, term): added where the first is equatorial, the second axial
        self._anomeric_neighbour = [(n, m, term) for n, _ in self._anomeric for m, term in self._neighbour_terms(n)]

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
            warnings.append(
                f"the A-value of {g.label} at {loc} ({value:g}) is from memory, not from a checked compilation"
            )
        if ctx is not None and not matched:
            warnings.append(f"{NO_POSITION_VALUE}{g.label} at {loc}")
        anomeric = None
        ring = self.ring
        if ring.elements[index] == "C" and "O" in (ring.elements[(index - 1) % 6], ring.elements[(index + 1) % 6]):
            row_a = _anomeric(g.pair_class, self.solvent)
            if row_a is not None:
                anomeric = Term(
                    "anomeric", f"anomeric effect, axial {g.label} at {loc}", atoms, row_a.value, (row_a.source,)
                )
        xh = row.xh if (matched and row.xh is not None) else value / 2
        return _Entry(key, index, g, atoms, value, term, tuple(warnings), anomeric, ctx, xh)

    def evaluate(self, axial: Sequence[bool]) -> tuple[float, list[Term], list[str], float]:
        """(energy, terms, warnings, largest single interaction) of the chair in which entry n is
        axial when ``axial[n]``. The largest interaction is the A-value of an axial group or a
        published syn-1,3-diaxial pair value, whichever is larger (it decides the twist-boat warning)."""
        terms: list[Term] = []
        warnings: list[str] = []
        largest = 0.0
        for n, e in enumerate(self.entries):
            if axial[n]:
                terms.append(e.axial_term)
                warnings.extend(e.axial_warnings)
                largest = max(largest, e.value)
        for p in self._pairs:
            a, b = axial[p.n], axial[p.m]
            if p.syn:
                if a and b:
                    largest = max(largest, p.gross)
                    if p.diaxial is not None:
                        terms.append(p.diaxial)
                    if p.diaxial_warning is not None:
                        warnings.append(p.diaxial_warning)
            elif not (a and b):  # axial/axial neighbours are anti: no gauche term
                term = p.gauche_mixed if (a or b) else p.gauche_equatorial
                if term is not None:
                    terms.append(term)
                elif p.gauche_warning is not None:
                    warnings.append(p.gauche_warning)
        for n, term in self._geminal:
            if axial[n]:
                terms.append(term)
        for n, term in self._anomeric:
            if axial[n]:
                terms.append(term)
        for n, m, term in self._anomeric_neighbour:
            if axial[m] and not axial[n]:
                terms.append(term)
        return sum(t.value for t in terms), terms, warnings, largest

    def _neighbour_terms(self, n: int) -> list[tuple[int, Term]]:
        """The extra cost of an equatorial anomeric group when the group on the next ring carbon
        (C2 of a pyranose) is axial, where the table has one (Angyal: O1(eq)/O2(ax) 1.0, not 0.55)."""
        a = self.entries[n]
        ring = self.ring
        side = next((k for k in ((a.index - 1) % 6, (a.index + 1) % 6) if ring.elements[k] == "C"), None)
        out = []
        for m, b in enumerate(self.entries):
            if b.index != side:
                continue
            row = _anomeric(a.group.pair_class, self.solvent, "anomeric-2-axial")
            if row is not None and b.group.pair_class == "O":
                loc = ring.locants
                name = (
                    f"equatorial {a.group.label} at {loc[a.index]} beside axial {b.group.label} at "
                    f"{loc[b.index]} ({row.note}{self._aqueous(row)})"
                )
                out.append((m, Term("anomeric", name, a.atoms + b.atoms, row.value, (row.source,))))
        return out

    # --- pair terms ---------------------------------------------------------------------------

    def _where(self, a: _Entry, b: _Entry) -> str:
        loc = self.ring.locants
        return f"{a.group.label}/{b.group.label} at {loc[a.index]},{loc[b.index]}"

    def _aqueous(self, row: tables.PairTerm) -> str:
        if self.solvent != "protic" and "aqueous" in row.note:
            return "; value measured in water"
        return ""

    def _syn_diaxial(self, n: int, m: int) -> _Pair:
        a, b = self.entries[n], self.entries[m]
        row = _pair("syn-diaxial", a.group.pair_class, b.group.pair_class, (a.context, b.context))
        where = self._where(a, b)
        if row is None:
            warning = f"no published syn-1,3-diaxial value for {where}; only the A-values are counted"
            return _Pair(n, m, True, diaxial_warning=warning)
        net = row.value - a.xh - b.xh
        name = (
            f"syn-1,3-diaxial {where} ({row.value:g} less the two X/H interactions it replaces, "
            f"{a.xh:.3g} and {b.xh:.3g}, counted in the A-values{self._aqueous(row)})"
        )
        clamped: str | None = None
        if net < 0:
            # a pair measured for smaller groups (Me/Me) cannot make two large groups cost less
            # together than apart: count nothing beyond the A-values, and say so
            name += ", counted as 0: they exceed the pair value"
            clamped = (
                f"syn-1,3-diaxial {where}: the published pair value ({row.value:g}, {row.note or row.source}) is "
                "smaller than the two X/H interactions already in the A-values, so nothing is added; the real "
                "interaction of these groups is probably larger"
            )
            net = 0.0
        term = Term("syn-diaxial", name, a.atoms + b.atoms, net, (row.source,))
        return _Pair(n, m, True, diaxial=term, diaxial_warning=clamped, gross=row.value)

    def _vicinal(self, n: int, m: int) -> _Pair:
        a, b = self.entries[n], self.entries[m]
        row = _pair("gauche", a.group.pair_class, b.group.pair_class)
        if row is None:
            if "H" in (a.group.pair_class, b.group.pair_class):  # an N-H, D or T: nothing to miss
                return _Pair(n, m, False)
            warning = f"no published gauche value for {self._where(a, b)}; only the A-values are counted"
            return _Pair(n, m, False, gauche_warning=warning)

        def gauche(kinds: str) -> Term:
            name = f"gauche {self._where(a, b)} ({kinds}{self._aqueous(row)})"
            return Term("gauche", name, a.atoms + b.atoms, row.value, (row.source,))

        return _Pair(n, m, False, gauche_mixed=gauche("ax/eq"), gauche_equatorial=gauche("eq/eq"))

    def _geminal_term(self, first: int, second: int, row: tables.GeminalPair) -> Term:
        a, b = self.entries[first], self.entries[second]
        value = row.value - (a.value - b.value)
        name = (
            f"geminal {a.group.label}/{b.group.label} at {self.ring.locants[a.index]}, "
            f"{a.group.label} axial: measured pair value {row.value:+g} replaces "
            f"A({a.group.label}) - A({b.group.label})"
        )
        return Term("geminal", name, a.atoms + b.atoms[1:], value, (row.source,))

    # --- warnings about the ring as a whole -------------------------------------------------------

    def ring_warnings(self) -> list[str]:
        """Estimated groups and geminal pairs (the same in every chair and configuration)."""
        out = []
        per_index: dict[int, list[_Entry]] = {}
        for e in self.entries:
            per_index.setdefault(e.index, []).append(e)
        for i, here in sorted(per_index.items()):
            where = self.ring.locants[i]
            for e in here:
                g = e.group
                if not g.estimated_as:
                    continue
                value = g.rows[0].value(self.solvent)
                if g.estimated_as == "unclassified":
                    out.append(
                        f"{g.label} at {where}: no A-value and no class; a placeholder of {value:g} kcal/mol is used"
                    )
                else:
                    out.append(
                        f"{g.label} at {where} is not in the A-value table: estimated as {g.estimated_as} "
                        f"(value of {g.rows[0].label}, {value:g} kcal/mol)"
                    )
            # two equal groups: one is axial in each chair, so whatever the pair costs cancels in the ΔG
            # (large groups are named by formula only, so their values are compared too)
            same = here[0].group.fragment == here[-1].group.fragment and here[0].value == here[-1].value
            if len(here) == 2 and self.ring.elements[i] == "C" and not same:
                a, b = here
                if frozenset((a.key, b.key)) in self.measured_geminal:
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
