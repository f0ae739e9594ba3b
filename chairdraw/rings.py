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
    trigonal: tuple[int, ...]  # ring indices of atoms with an exocyclic double bond

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


def find_rings(mol: Chem.Mol) -> tuple[list[ChairRing], list[RefusedRing]]:
    """Every six-membered ring of the molecule, either accepted as a chair ring or refused."""
    info = mol.GetRingInfo()
    accepted: list[ChairRing] = []
    refused: list[RefusedRing] = []
    all_rings = [tuple(r) for r in info.AtomRings()]
    for ring in all_rings:
        if len(ring) != 6:
            continue
        reason = _refusal(mol, ring, all_rings)
        if reason:
            refused.append(RefusedRing(ring, reason))
        else:
            accepted.append(_numbered(mol, ring))
    known = {frozenset(r) for r in all_rings}
    for ring in _hidden_six_rings(mol, all_rings):
        if frozenset(ring) not in known:
            known.add(frozenset(ring))
            refused.append(RefusedRing(ring, "bridged ring system (a six-membered ring outside the smallest set of rings): not supported yet"))
    return accepted, refused


def _hidden_six_rings(mol: Chem.Mol, all_rings: list[tuple[int, ...]]) -> list[tuple[int, ...]]:
    """Six-membered cycles of polycyclic systems that RDKit's SSSR leaves out (norbornane's)."""
    shared = {a for r in all_rings for a in r if sum(a in q for q in all_rings) > 1}
    if not shared:
        return []
    in_rings = {a for r in all_rings for a in r}
    found: list[tuple[int, ...]] = []

    def walk(path: list[int]) -> None:
        last = path[-1]
        for n in mol.GetAtomWithIdx(last).GetNeighbors():
            j = n.GetIdx()
            if j not in in_rings:
                continue
            if len(path) == 6:
                if j == path[0]:
                    found.append(tuple(path))
                continue
            if j not in path and j > path[0]:
                walk(path + [j])

    for start in sorted(shared):
        walk([start])
    unique: dict[frozenset, tuple[int, ...]] = {}
    for cycle in found:
        unique.setdefault(frozenset(cycle), cycle)
    return list(unique.values())


def _refusal(mol: Chem.Mol, ring: tuple[int, ...], all_rings: list[tuple[int, ...]]) -> str | None:
    atoms = [mol.GetAtomWithIdx(i) for i in ring]
    odd = [a for a in atoms if a.GetSymbol() not in CHAIR_ELEMENTS]
    if odd:
        return f"ring atom {odd[0].GetIdx()} is {odd[0].GetSymbol()}: only rings of C, N, O and S are analysed"
    if any(a.GetIsAromatic() for a in atoms):
        return "aromatic ring: flat, not a chair"
    members = set(ring)
    for k in range(6):
        bond = mol.GetBondBetweenAtoms(ring[k], ring[(k + 1) % 6])
        if bond.GetBondType() != Chem.BondType.SINGLE:
            return (
                f"endocyclic double bond between atoms {ring[k]} and {ring[(k + 1) % 6]}: half-chair ring, not analysed"
            )
    for other in all_rings:
        if other == ring:
            continue
        shared = members & set(other)
        if not shared:
            continue
        if len(shared) == 1:
            what = "spiro"
        elif len(shared) == 2 and mol.GetBondBetweenAtoms(*shared) is not None:
            what = "fused"
        else:
            what = "bridged"
        return (
            f"{what} ring system (shares atoms {', '.join(map(str, sorted(shared)))} with another ring): "
            "not supported yet"
        )
    for a in atoms:
        if a.GetSymbol() == "S" and a.GetDegree() == 3:
            return f"ring sulfoxide at atom {a.GetIdx()}: sulfur stereo is not modelled yet"
    trigonal = [k for k, a in enumerate(atoms) if _trigonal(mol, a, members)]
    if len(trigonal) > 2:
        return f"{len(trigonal)} trigonal ring atoms: too flat for the chair model"
    if len(trigonal) == 2 and (trigonal[1] - trigonal[0]) % 6 in (1, 5):
        return "two neighbouring trigonal ring atoms: too flat for the chair model"
    return None


def _trigonal(mol: Chem.Mol, atom: Chem.Atom, members: set[int]) -> bool:
    """An exocyclic double bond makes C or N trigonal; S(=O)2 stays tetrahedral."""
    return atom.GetSymbol() in ("C", "N") and any(
        b.GetBondType() == Chem.BondType.DOUBLE and b.GetOtherAtomIdx(atom.GetIdx()) not in members
        for b in atom.GetBonds()
    )


def _substituted(mol: Chem.Mol, atom_idx: int, members: set[int]) -> bool:
    atom = mol.GetAtomWithIdx(atom_idx)
    return any(n.GetIdx() not in members and n.GetAtomicNum() > 1 for n in atom.GetNeighbors())


def _numbered(mol: Chem.Mol, ring: tuple[int, ...]) -> ChairRing:
    members = set(ring)
    symbols = {i: mol.GetAtomWithIdx(i).GetSymbol() for i in ring}
    trig = {i for i in ring if _trigonal(mol, mol.GetAtomWithIdx(i), members)}
    subst = {i for i in ring if _substituted(mol, i, members)}
    # alcohols, ethers and amines name the ring carbon bearing O or N as C1 (IUPAC habit)
    charac = {i for i in ring if symbols[i] == "C" and _o_or_n_substituted(mol, i, members)}

    def key(order: tuple[int, ...]):
        het = [k + 1 for k, a in enumerate(order) if symbols[a] != "C"]
        ranks = [_SENIORITY.get(symbols[a], 3) for a in order if symbols[a] != "C"]
        return (
            het,
            ranks,
            [k + 1 for k, a in enumerate(order) if a in trig],
            [k + 1 for k, a in enumerate(order) if a in charac],
            [k + 1 for k, a in enumerate(order) if a in subst],
            list(order),
        )

    orders = []
    for start in range(6):
        for step in (1, -1):
            orders.append(tuple(ring[(start + step * k) % 6] for k in range(6)))
    sugar = _pyranose_order(mol, orders, symbols, members)
    order = sugar or min(orders, key=key)
    elements = tuple(symbols[a] for a in order)
    hetero = tuple((k + 1, e) for k, e in enumerate(elements) if e != "C")
    locants: tuple[str, ...]
    if sugar:
        kind, locants = "pyranose", ("O5", "C1", "C2", "C3", "C4", "C5")
    else:
        kind = KINDS.get(hetero) or "heterocyclohexane (" + ",".join(f"{e}{k}" for k, e in hetero) + ")"
        locants = tuple(str(k + 1) for k in range(6))
    if trig and kind == "cyclohexane":
        kind = "cyclohexanone" if all(_exo_oxo(mol, a, members) for a in trig) else "cyclohexane (exocyclic C=C)"
    trigonal = tuple(k for k, a in enumerate(order) if a in trig)
    return ChairRing(atoms=order, kind=kind, locants=locants, elements=elements, trigonal=trigonal)


def _exo_oxo(mol: Chem.Mol, atom_idx: int, members: set[int]) -> bool:
    atom = mol.GetAtomWithIdx(atom_idx)
    return any(
        b.GetBondType() == Chem.BondType.DOUBLE and b.GetOtherAtom(atom).GetSymbol() == "O" for b in atom.GetBonds()
    )


def _o_substituted(mol: Chem.Mol, atom_idx: int, members: set[int], symbols=("O",)) -> bool:
    atom = mol.GetAtomWithIdx(atom_idx)
    return any(
        n.GetIdx() not in members
        and n.GetSymbol() in symbols
        and mol.GetBondBetweenAtoms(atom_idx, n.GetIdx()).GetBondType() == Chem.BondType.SINGLE
        for n in atom.GetNeighbors()
    )


def _o_or_n_substituted(mol: Chem.Mol, atom_idx: int, members: set[int]) -> bool:
    return _o_substituted(mol, atom_idx, members, ("O", "N"))


def _pyranose_order(mol, orders, symbols, members) -> tuple[int, ...] | None:
    """Sugar numbering for an oxane with an O-substituted anomeric carbon and >= 3 ring C-O."""
    elements = sorted(symbols.values())
    if elements != ["C"] * 5 + ["O"]:
        return None
    o_carbons = {i for i in members if symbols[i] == "C" and _o_substituted(mol, i, members)}
    if len(o_carbons) < 3:
        return None
    candidates = [o for o in orders if symbols[o[0]] == "O" and o[1] in o_carbons]
    if not candidates:
        return None
    # both neighbours of O5 carry O (rare): prefer the carbon bearing two oxygens (ketose C2
    # is not handled here) or else the lower atom index
    return min(candidates, key=lambda o: (-sum(1 for a in o if a in o_carbons and o.index(a) <= 1), list(o)))
