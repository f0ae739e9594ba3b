"""Which six-membered rings can take a chair, numbered the way a chemist would number them.

A ring is chair-capable when its six atoms are sp3 C, N, O or S with no endocyclic multiple bond
and no aromaticity; an exocyclic C=O or C=C (cyclohexanones, methylenecyclohexanes) is allowed,
as long as the two trigonal atoms are not neighbours. Rings that share atoms with another ring
(fused, spiro, bridged) are refused for now with a reason; separate rings elsewhere in the
molecule are still analysed.

Numbering follows the lowest-locant habits of IUPAC names: heteroatoms first (O before S before N),
then trigonal (C=O) atoms, then substituted atoms. Pyranoses get sugar numbering (O5, C1..C5, with
C1 the anomeric carbon), so that their chairs come out named 4C1 and 1C4.
"""

from __future__ import annotations

from dataclasses import dataclass

from rdkit import Chem

from .molgraph import MolGraph

CHAIR_ELEMENTS = {"C", "N", "O", "S"}
_SENIORITY = {"O": 0, "S": 1, "N": 2}

# parent-ring names by heteroatom locants (IUPAC/Hantzsch-Widman names in common use)
KINDS: dict[tuple[tuple[int, str], ...], str] = {
    (): "cyclohexane",
    ((1, "O"),): "oxane",
    ((1, "S"),): "thiane",
    ((1, "N"),): "piperidine",
    ((1, "O"), (2, "O")): "1,2-dioxane",
    ((1, "O"), (3, "O")): "1,3-dioxane",
    ((1, "O"), (4, "O")): "1,4-dioxane",
    ((1, "S"), (3, "S")): "1,3-dithiane",
    ((1, "S"), (4, "S")): "1,4-dithiane",
    ((1, "O"), (3, "S")): "1,3-oxathiane",
    ((1, "O"), (4, "S")): "1,4-oxathiane",
    ((1, "N"), (2, "N")): "hexahydropyridazine",
    ((1, "N"), (3, "N")): "hexahydropyrimidine",
    ((1, "N"), (4, "N")): "piperazine",
    ((1, "O"), (2, "N")): "1,2-oxazinane",
    ((1, "O"), (3, "N")): "1,3-oxazinane",
    ((1, "O"), (4, "N")): "morpholine",
    ((1, "S"), (3, "N")): "1,3-thiazinane",
    ((1, "S"), (4, "N")): "thiomorpholine",
    ((1, "O"), (3, "O"), (5, "O")): "1,3,5-trioxane",
}


@dataclass(frozen=True)
class ChairRing:
    """A chair-capable ring: atoms in numbering order (index 0 carries locant ``locants[0]``)."""

    atoms: tuple[int, ...]
    kind: str
    locants: tuple[str, ...]
    elements: tuple[str, ...]
    trigonal: tuple[int, ...]  # ring indices of atoms with an exocyclic double bond, or planar N/O/S
    ammonium: tuple[int, ...] = ()  # ring indices of nitrogens without a lone pair (R2NH2+, R4N+)

    def index(self, atom: int) -> int:
        return self.atoms.index(atom)

    def neighbours(self, i: int) -> tuple[int, int]:
        return self.atoms[(i - 1) % 6], self.atoms[(i + 1) % 6]

    def hetero(self, i: int) -> bool:
        return self.elements[i] != "C"


@dataclass(frozen=True)
class RefusedRing:
    atoms: tuple[int, ...]
    reason: str

    def to_dict(self) -> dict:
        return {"atoms": list(self.atoms), "reason": self.reason}


def find_rings(
    mol: Chem.Mol, graph: MolGraph | None = None, fused: bool = False
) -> tuple[list[ChairRing], list[RefusedRing]]:
    """Every six-membered ring of the molecule, either accepted as a chair ring or refused.

    ``fused=True`` also accepts rings of fused and spiro systems (each ring on its own): reading a
    drawing needs only the ring's atoms, while the energy model does not cover them yet."""
    graph = graph or MolGraph(mol)
    accepted: list[ChairRing] = []
    refused: list[RefusedRing] = []
    all_rings = graph.rings
    for ring in all_rings:
        if len(ring) != 6:
            continue
        reason = _flat(graph, ring)
        if reason is None:
            facts = _facts(graph, ring)
            reason = _refusal(graph, ring, all_rings, facts, fused)
            if reason is None:
                accepted.append(_numbered(ring, facts))
                continue
        refused.append(RefusedRing(ring, reason))
    known = {frozenset(r) for r in all_rings}
    for ring in _hidden_six_rings(graph, all_rings):
        if frozenset(ring) not in known:
            known.add(frozenset(ring))
            refused.append(
                RefusedRing(
                    ring,
                    "bridged ring system (a six-membered ring outside the smallest set of rings): not supported yet",
                )
            )
    return accepted, refused


def _hidden_six_rings(graph: MolGraph, all_rings: list[tuple[int, ...]]) -> list[tuple[int, ...]]:
    """Six-membered cycles of polycyclic systems that RDKit's SSSR leaves out (norbornane's)."""
    sets = [set(r) for r in all_rings]
    polycyclic = {a for k, r in enumerate(sets) for a in r if any(r & q for m, q in enumerate(sets) if m != k)}
    if not polycyclic:
        return []
    found: dict[frozenset, tuple[int, ...]] = {}

    def walk(path: list[int]) -> None:
        # each cycle is met from its lowest atom, in both directions; the dict keeps one
        for j in graph.neighbours[path[-1]]:
            if j not in polycyclic:
                continue
            if len(path) == 6:
                if j == path[0]:
                    found.setdefault(frozenset(path), tuple(path))
            elif j not in path and j > path[0]:
                walk(path + [j])

    for start in sorted(polycyclic):
        walk([start])
    return list(found.values())


@dataclass(frozen=True)
class _Facts:
    """What numbering and refusal need to know about one ring atom, read once."""

    symbol: str
    degree: int
    trigonal: bool  # exocyclic double bond on C or N (S(=O)2 stays tetrahedral), or a planar N/O/S
    oxo: bool  # exocyclic C=O
    double_to: str | None  # element of the exocyclic double-bond partner (C=O: 'O')
    planar: bool  # ring N, O or S conjugated with a neighbour (amide, ester, N-aryl): sp2 in RDKit
    ammonium: bool  # ring N without a lone pair (four bonds, or a positive charge)
    substituted: bool  # a non-hydrogen exocyclic neighbour
    o_single: bool  # exocyclic O by a single bond
    on_single: bool  # exocyclic O or N by a single bond


def _facts(graph: MolGraph, ring: tuple[int, ...]) -> dict[int, _Facts]:
    members = set(ring)
    out = {}
    for i in ring:
        symbol = graph.symbol(i)
        trig = oxo = subst = o_single = on_single = False
        double_to = None
        for j in graph.neighbours[i]:
            if j in members:
                continue
            z = graph.z[j]
            subst = subst or z > 1
            order = graph.order[(i, j)]
            if order == 2:
                trig = trig or symbol in ("C", "N")
                oxo = oxo or z == 8
                double_to = graph.symbol(j)
            elif order == 1:
                o_single = o_single or z == 8
                on_single = on_single or z in (7, 8)
        degree = len(graph.neighbours[i])
        planar = symbol != "C" and graph.mol.GetAtomWithIdx(i).GetHybridization() == Chem.HybridizationType.SP2
        ammonium = symbol == "N" and (graph.charge(i) > 0 or degree + graph.hydrogens(i) == 4)
        out[i] = _Facts(symbol, degree, trig or planar, oxo, double_to, planar, ammonium, subst, o_single, on_single)
    return out


def _flat(graph: MolGraph, ring: tuple[int, ...]) -> str | None:
    """The cheap refusals, before anything else is read: odd elements, aromatic or unsaturated rings."""
    odd = [i for i in ring if graph.symbol(i) not in CHAIR_ELEMENTS]
    if odd:
        return f"ring atom {odd[0]} is {graph.symbol(odd[0])}: only rings of C, N, O and S are analysed"
    orders = [graph.order[(ring[k], ring[(k + 1) % 6])] for k in range(6)]
    if 1.5 in orders:
        return "aromatic ring: flat, not a chair"
    for k, order in enumerate(orders):
        if order != 1:
            return (
                f"endocyclic double bond between atoms {ring[k]} and {ring[(k + 1) % 6]}: half-chair ring, not analysed"
            )
    return None


def _refusal(
    graph: MolGraph, ring: tuple[int, ...], all_rings: list[tuple[int, ...]], facts: dict[int, _Facts], fused: bool
) -> str | None:
    members = set(ring)
    for other in all_rings:
        if other == ring:
            continue
        shared = members.intersection(other)
        if not shared:
            continue
        if len(shared) == 1:
            what = "spiro"
        elif len(shared) == 2 and tuple(shared) in graph.order:
            what = "fused"
        else:
            what = "bridged"
        if fused and what != "bridged":
            continue
        return (
            f"{what} ring system (shares atoms {', '.join(map(str, sorted(shared)))} with another ring): "
            "not supported yet"
        )
    for i in ring:
        odd = _not_tetrahedral(graph, i, facts[i])
        if odd:
            return f"ring atom {i} {odd}: not a chair ring atom"
    for i in ring:
        if facts[i].symbol == "S" and facts[i].degree == 3:
            return f"ring sulfoxide at atom {i}: sulfur stereo is not modelled yet"
    trigonal = [k for k, i in enumerate(ring) if facts[i].trigonal]
    if len(trigonal) > 2:
        return f"{len(trigonal)} trigonal ring atoms: too flat for the chair model"
    if len(trigonal) == 2 and (trigonal[1] - trigonal[0]) % 6 in (1, 5):
        if any(facts[ring[k]].planar for k in trigonal):
            return (
                "conjugated ring heteroatom beside a trigonal ring atom (lactone, lactam, enol ether, enamine): "
                "two neighbouring planar ring atoms, too flat for the chair model"
            )
        return "two neighbouring trigonal ring atoms: too flat for the chair model"
    return None


_BONDS_AND_H = {"C": (4,), "N": (3, 4), "O": (2,), "S": (2, 3, 4)}


def _not_tetrahedral(graph: MolGraph, i: int, f: _Facts) -> str | None:
    """Why a ring atom cannot sit in a chair as drawn (a radical, a carbocation or carbanion, an
    odd count of bonds and hydrogens), or None."""
    if graph.mol.GetAtomWithIdx(i).GetNumRadicalElectrons():
        return "has an unpaired electron (a radical)"
    charge = graph.charge(i)
    if f.symbol == "C" and charge:
        return "is a carbocation" if charge > 0 else "is a carbanion"
    if f.trigonal:
        return None  # a C=O carbon or a planar N has three
    total = f.degree + graph.hydrogens(i)
    if f.symbol == "N" and total == 4 and charge <= 0:
        # a dative bond from the nitrogen's lone pair (N->O, N->metal) leaves it tetrahedral
        bonds = graph.mol.GetAtomWithIdx(i).GetBonds()
        if any(b.GetBondType() == Chem.BondType.DATIVE and b.GetBeginAtomIdx() == i for b in bonds):
            return None
    if total not in _BONDS_AND_H[f.symbol] or (f.symbol == "N" and total == 4 and charge <= 0):
        return f"({f.symbol}) has {total} bonds and hydrogens"
    return None


def _numbered(ring: tuple[int, ...], facts: dict[int, _Facts]) -> ChairRing:
    symbols = {i: facts[i].symbol for i in ring}
    orders = [ring[start:] + ring[:start] for start in range(6)]
    orders = [o for forward in orders for o in (forward, forward[:1] + forward[:0:-1])]
    sugar = _pyranose_order(orders, facts)
    order = sugar or _lowest_locants(orders, facts)
    elements = tuple(symbols[a] for a in order)
    hetero = tuple((k + 1, e) for k, e in enumerate(elements) if e != "C")
    locants: tuple[str, ...]
    if sugar:
        kind, locants = "pyranose", ("O5", "C1", "C2", "C3", "C4", "C5")
    else:
        kind = KINDS.get(hetero) or "heterocyclohexane (" + ",".join(f"{e}{k}" for k, e in hetero) + ")"
        locants = tuple(str(k + 1) for k in range(6))
    trig = [a for a in ring if facts[a].trigonal]
    if trig and kind == "cyclohexane":
        partners = sorted({facts[a].double_to or "?" for a in trig})
        kind = (
            "cyclohexanone" if partners == ["O"] else f"cyclohexane (exocyclic {', '.join('C=' + p for p in partners)})"
        )
    trigonal = tuple(k for k, a in enumerate(order) if facts[a].trigonal)
    ammonium = tuple(k for k, a in enumerate(order) if facts[a].ammonium)
    return ChairRing(atoms=order, kind=kind, locants=locants, elements=elements, trigonal=trigonal, ammonium=ammonium)


def _lowest_locants(orders: list[tuple[int, ...]], facts: dict[int, _Facts]) -> tuple[int, ...]:
    """The numbering that IUPAC's lowest-locant habits pick: heteroatoms first (O, S, N), then
    trigonal (C=O) atoms, then carbons bearing O or N (alcohols, ethers and amines name that
    carbon C1), then substituted atoms, then the lowest atom indices."""

    def criteria(a: int) -> tuple:
        f = facts[a]
        return (
            f.symbol != "C",
            f.trigonal,
            f.symbol == "C" and f.on_single,
            f.substituted,
        )

    flags = {a: criteria(a) for a in orders[0]}
    seniority = {a: _SENIORITY.get(facts[a].symbol, 3) for a in orders[0]}

    def key(order: tuple[int, ...]):
        # per criterion, the set of ring positions that meet it as a bit mask with position 0 the
        # highest bit: with as many positions set in every numbering (the same atoms), lower
        # locants are the larger mask
        masks = [0, 0, 0, 0]
        for k, a in enumerate(order):
            for c, hit in enumerate(flags[a]):
                if hit:
                    masks[c] |= 32 >> k
        return (-masks[0], [seniority[a] for a in order if flags[a][0]], -masks[1], -masks[2], -masks[3], order)

    # the first criterion that any atom meets puts such an atom at position 1 (the earlier
    # criteria tie): only numberings that start there can win
    first = next((c for c in range(4) if any(f[c] for f in flags.values())), None)
    if first is not None:
        orders = [o for o in orders if flags[o[0]][first]]
    return min(orders, key=key)


def _pyranose_order(orders: list[tuple[int, ...]], facts: dict[int, _Facts]) -> tuple[int, ...] | None:
    """Sugar numbering for an oxane with an O-substituted anomeric carbon and >= 3 ring C-O."""
    elements = sorted(f.symbol for f in facts.values())
    if elements != ["C"] * 5 + ["O"]:
        return None
    o_carbons = {i for i, f in facts.items() if f.symbol == "C" and f.o_single}
    if len(o_carbons) < 3:
        return None
    candidates = [o for o in orders if facts[o[0]].symbol == "O" and o[1] in o_carbons]
    if not candidates:
        return None
    # both neighbours of O5 carry O (rare): prefer the carbon bearing two oxygens (ketose C2
    # is not handled here) or else the lower atom index
    return min(candidates, key=lambda o: (-sum(1 for a in o if a in o_carbons and o.index(a) <= 1), list(o)))
