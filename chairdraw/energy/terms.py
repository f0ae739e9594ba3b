"""The energy of one chair as a list of named, sourced terms (additive model).

* A-value of every axial group (the ring position's own value where the table has one);
* syn-1,3-diaxial pairs, net of the two X/H halves already inside the A-values;
* vicinal gauche pairs (equatorial/equatorial and axial/equatorial neighbours);
* the anomeric effect for O-linked groups and halogens next to a ring oxygen.

Warnings say where the model is on thin ice: estimated groups, values from memory, cyclohexane
values used in a heterocycle, geminal pairs, pairs with no published interaction value.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..chairs import AXIAL, EQUATORIAL, Placement
from ..faces import Slot
from ..rings import ChairRing
from ..substituents import Group
from . import tables


@dataclass(frozen=True)
class Term:
    kind: str  # a-value, syn-diaxial, gauche, anomeric
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


def chair_terms(
    ring: ChairRing,
    placements: tuple[Placement, ...],
    groups: dict[Slot, Group],
    solvent: str,
) -> tuple[list[Term], list[str]]:
    """Terms and warnings for one chair; ``groups`` holds the Group of every non-H position."""
    terms: list[Term] = []
    warnings: list[str] = []
    loc = ring.locants
    by_index: dict[int, list[tuple[Placement, Group]]] = {}
    axial_value: dict[Slot, float] = {}
    for p in placements:
        g = groups.get(p.slot)
        if g is None:
            continue
        by_index.setdefault(p.slot.ring_index, []).append((p, g))
        ctx = context(ring, p.slot.ring_index)
        value, row, matched = g.avalue(solvent, ctx)
        axial_value[p.slot] = value
        if p.orientation != AXIAL:
            continue
        if g.estimated_as is None and any(tables.sources()[k].from_memory for k in row.sources[:1]):
            warnings.append(
                f"the A-value of {g.label} at {loc[p.slot.ring_index]} ({value:g}) is from memory, "
                "not from a checked compilation"
            )
        terms.append(
            Term(
                "a-value",
                f"axial {g.label} at {loc[p.slot.ring_index]}"
                + (f" ({row.note})" if row.context and row.note else "")
                + (f" (estimated as {g.estimated_as}: value of {row.label})" if g.estimated_as else ""),
                _atoms(p),
                value,
                (("class",) + row.sources) if g.estimated_as else row.sources,
                estimated=g.estimated_as is not None,
            )
        )
        if ctx is not None and not matched:
            warnings.append(f"{NO_POSITION_VALUE}{g.label} at {loc[p.slot.ring_index]}")
    indices = sorted(by_index)
    for i in indices:
        for j in indices:
            if j <= i:
                continue
            d = (j - i) % 6
            for pa, ga in by_index[i]:
                for pb, gb in by_index[j]:
                    if d in (2, 4) and pa.orientation == AXIAL and pb.orientation == AXIAL:
                        _syn_diaxial(terms, warnings, ring, pa, ga, pb, gb, axial_value)
                    elif d in (1, 5) and not (pa.orientation == AXIAL and pb.orientation == AXIAL):
                        _gauche(terms, ring, pa, ga, pb, gb)
    for i, here in by_index.items():
        neighbours = [(i - 1) % 6, (i + 1) % 6]
        if ring.elements[i] != "C" or not any(ring.elements[n] == "O" for n in neighbours):
            continue
        for p, g in here:
            anomeric = _anomeric(g.pair_class, solvent)
            if anomeric is not None and p.orientation == AXIAL:
                terms.append(
                    Term(
                        "anomeric",
                        f"anomeric effect, axial {g.label} at {loc[i]}",
                        _atoms(p),
                        anomeric.value,
                        (anomeric.source,),
                    )
                )
    return terms, warnings


def _atoms(p: Placement) -> tuple[int, ...]:
    return (p.slot.ring_atom,) if p.slot.atom is None else (p.slot.ring_atom, p.slot.atom)


def _syn_diaxial(terms, warnings, ring, pa, ga, pb, gb, axial_value) -> None:
    row = _pair("syn-diaxial", ga.pair_class, gb.pair_class)
    where = f"{ga.label}/{gb.label} at {ring.locants[pa.slot.ring_index]},{ring.locants[pb.slot.ring_index]}"
    if row is None:
        warnings.append(f"no published syn-1,3-diaxial value for {where}; only the A-values are counted")
        return
    net = row.value - axial_value[pa.slot] / 2 - axial_value[pb.slot] / 2
    terms.append(
        Term(
            "syn-diaxial",
            f"syn-1,3-diaxial {where} ({row.value:g} less the two X/H halves in the A-values)",
            _atoms(pa) + _atoms(pb),
            net,
            (row.source,),
        )
    )


def _gauche(terms, ring, pa, ga, pb, gb) -> None:
    row = _pair("gauche", ga.pair_class, gb.pair_class)
    if row is None:
        return
    kinds = "/".join(sorted(("ax" if p.orientation == AXIAL else "eq") for p in (pa, pb)))
    terms.append(
        Term(
            "gauche",
            f"gauche {ga.label}/{gb.label} at {ring.locants[pa.slot.ring_index]},{ring.locants[pb.slot.ring_index]} ({kinds})",
            _atoms(pa) + _atoms(pb),
            row.value,
            (row.source,),
        )
    )


__all__ = ["Term", "chair_terms", "context", "AXIAL", "EQUATORIAL"]
