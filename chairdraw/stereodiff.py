"""Two structures with the same constitution: where does their stereo differ?

The registered structure is mapped onto the drawing's atoms (every substructure mapping that can
matter) and each specified centre is compared through the mapping by chiral tag and neighbour
permutation parity; the mapping with the fewest differences is kept. Also here: which centres and
double bonds a registration leaves open, and the registration's variants (its 'and'/'or' groups
inverted or not). Atom numbers in messages count from 1.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from rdkit import Chem
from rdkit.Chem import rdCIPLabeler

from . import _rdkit
from .faces import CCW, CW, parity
from .perceive import Perception
from .read import Structure
from .rings import find_rings


@dataclass(frozen=True)
class CentreDifference:
    """A stereocentre whose configuration in the drawing differs from the registered one."""

    registered_atom: int  # number from 1, as in the registered structure
    drawn_atom: int  # number from 1, as in the drawing
    element: str
    registered_cip: str | None  # R/S (r/s) where CIP gives one
    drawn_cip: str | None
    locant: str | None = None  # the ring locant of the centre in the registered structure (C4, 2)

    @property
    def where(self) -> str:
        """'atom 8 (C4)': the atom number with the ring locant a chemist would use."""
        if self.locant is None:
            return f"atom {self.registered_atom}"
        locant = self.locant if self.locant[:1].isalpha() else f"ring locant {self.locant}"
        return f"atom {self.registered_atom} ({locant})"

    def to_dict(self) -> dict:
        return {
            "registered_atom_number": self.registered_atom,
            "locant": self.locant,
            "drawn_atom_number": self.drawn_atom,
            "element": self.element,
            "registered_cip": self.registered_cip,
            "drawn_cip": self.drawn_cip,
        }


def heavy(mol: Chem.Mol) -> Chem.Mol:
    heavy, _ = _rdkit.without_hs(mol)
    return heavy


def heavy_index(mol: Chem.Mol) -> dict[int, int]:
    """heavy-atom index -> index in the drawing as read (for numbers as in the file)."""
    _, new = _rdkit.without_hs(mol)
    return {v: k for k, v in new.items()}


def constitution(mol: Chem.Mol) -> str:
    try:
        return Chem.MolToInchi(mol, options="-SNon") or Chem.MolToSmiles(mol, isomericSmiles=False)
    except Exception:
        return Chem.MolToSmiles(mol, isomericSmiles=False)


def has_tags(mol: Chem.Mol) -> bool:
    return any(a.GetChiralTag() in (CW, CCW) for a in mol.GetAtoms())


def specified(mol: Chem.Mol, kind) -> list[int]:
    """Atoms (tetrahedral) or bonds (double) whose configuration the structure specifies."""
    info = Chem.FindPotentialStereo(mol)
    return [
        i.centeredOn for i in _rdkit.items(info) if i.type == kind and i.specified == Chem.StereoSpecified.Specified
    ]


def specified_centres(mol: Chem.Mol) -> list[int]:
    return specified(mol, Chem.StereoType.Atom_Tetrahedral)


def stereo_bonds(mol: Chem.Mol) -> list[int]:
    return specified(mol, Chem.StereoType.Bond_Double)


def unread_bonds(reg: Chem.Mol, drawn: Chem.Mol, matches, index: dict[int, int]) -> list[str]:
    """Registered E/Z double bonds that the drawing leaves open (drawn crossed, or 'either')."""
    if not matches:
        return []
    drawn_set = set(stereo_bonds(drawn))
    out = []
    for b in stereo_bonds(reg):
        bond = reg.GetBondWithIdx(b)
        i, j = matches[0].get(bond.GetBeginAtomIdx(), -1), matches[0].get(bond.GetEndAtomIdx(), -1)
        other = drawn.GetBondBetweenAtoms(i, j) if min(i, j) >= 0 else None
        if other is not None and other.GetIdx() not in drawn_set:
            out.append(
                f"the double bond between atoms {index.get(i, i) + 1} and {index.get(j, j) + 1} is drawn without"
                " a geometry (crossed or 'either'), but the registration sets its E/Z"
            )
    return out


def variants(reg: Structure, mol: Chem.Mol) -> list[Chem.Mol]:
    """The registered structure and every stereoisomer its registration counts as the same."""
    _, new = _rdkit.without_hs(reg.mol)
    # stereo groups hold the input's atom numbers; ``mol`` is the heavy-atom copy
    groups = [tuple(new[a] for a in g.atoms if a in new) for g in reg.stereo_groups if g.kind in ("and", "or")]
    if reg.stereo_meaning == "relative" and not groups:
        groups = [tuple(specified_centres(mol))]  # already heavy-atom numbers
    out = []
    for flips in itertools.product((False, True), repeat=len(groups)):
        variant = Chem.Mol(mol)
        for flip, group in zip(flips, groups):
            if flip:
                for a in group:
                    atom = variant.GetAtomWithIdx(a)
                    atom.SetChiralTag(CCW if atom.GetChiralTag() == CW else CW)
        out.append(variant)
    return out


MAX_MATCHES = 20000


def matches(reg: Chem.Mol, drawn: Chem.Mol) -> list[dict[int, int]]:
    """Every mapping of the registered structure's atoms onto the drawing's that can matter.

    End atoms that touch no stereocentre (the methyls of a TMS or tBu group, the O of a nitro
    group) are left out of the query: their permutations multiply the mappings (6^5 for a penta-
    TMS ether) without changing any centre's configuration, and a cap on the number of mappings
    would otherwise cut off the one with the fewest differences. Empty when only InChI's
    normalisation (tautomers, charges) equates the two."""
    centres = set(specified_centres(reg))
    keep = [
        a.GetIdx() for a in reg.GetAtoms() if a.GetDegree() != 1 or any(n.GetIdx() in centres for n in a.GetNeighbors())
    ]
    query = Chem.RWMol(reg)
    for idx in sorted(set(range(reg.GetNumAtoms())) - set(keep), reverse=True):
        query.RemoveAtom(idx)
    found = drawn.GetSubstructMatches(query.GetMol(), useChirality=False, uniquify=False, maxMatches=MAX_MATCHES)
    return [dict(zip(keep, m)) for m in found]


def unread_centres(reg, drawn, matches, seen: Perception | None, index: dict[int, int]) -> list[str]:
    """Registered stereocentres the drawing does not show, each with the reason."""
    why = dict(zip(seen.undetermined, seen.reasons)) if seen is not None else {}
    if not matches:  # no atom mapping: any undetermined atom may matter
        return list(dict.fromkeys(why.values()))
    out = []
    for c in specified_centres(reg):
        d = matches[0][c]
        if drawn.GetAtomWithIdx(d).GetChiralTag() in (CW, CCW):
            continue
        number = index.get(d, d) + 1
        out.append(
            why.get(index.get(d, d))
            or f"atom {number}: a registered stereocentre the drawing does not show (no wedge, not on a ring drawn as a chair)"
        )
    return list(dict.fromkeys(out))


def restricted(drawn: Chem.Mol, reg: Chem.Mol, matches) -> Chem.Mol:
    """The drawing without configuration at centres the registration leaves open."""
    open_centres = set(range(reg.GetNumAtoms())) - set(specified_centres(reg))
    out = Chem.Mol(drawn)
    if not matches:
        return out
    for c in open_centres:
        if c in matches[0]:
            out.GetAtomWithIdx(matches[0][c]).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    set_bonds = set(stereo_bonds(reg))
    for bond in reg.GetBonds():  # a double bond the registration leaves open is not compared either
        if bond.GetBondType() != Chem.BondType.DOUBLE or bond.GetIdx() in set_bonds:
            continue
        ends = matches[0].get(bond.GetBeginAtomIdx()), matches[0].get(bond.GetEndAtomIdx())
        other = out.GetBondBetweenAtoms(*ends) if None not in ends else None
        if other is not None and other.GetStereo() != Chem.BondStereo.STEREONONE:
            other.SetStereo(Chem.BondStereo.STEREONONE)
            for a in (other.GetBeginAtom(), other.GetEndAtom()):
                for b in a.GetBonds():
                    b.SetBondDir(Chem.BondDir.NONE)
    return out


def opened(drawn: Chem.Mol, reg: Chem.Mol, matches) -> int:
    """How many centres the drawing sets that the registration leaves open."""
    if not matches:
        return 0
    registered = {matches[0][c] for c in specified_centres(reg)}
    return len(set(specified_centres(drawn)) - registered)


def same_configuration(reg: Chem.Mol, drawn: Chem.Mol, match: dict[int, int], centre: int) -> bool | None:
    a, b = reg.GetAtomWithIdx(centre), drawn.GetAtomWithIdx(match[centre])
    if a.GetChiralTag() not in (CW, CCW) or b.GetChiralTag() not in (CW, CCW):
        return None
    if any(n.GetIdx() not in match for n in a.GetNeighbors()):
        return None
    mapped = [match[n.GetIdx()] for n in a.GetNeighbors()] + ["H"] * a.GetTotalNumHs()
    order = [n.GetIdx() for n in b.GetNeighbors()] + ["H"] * b.GetTotalNumHs()
    if sorted(map(str, mapped)) != sorted(map(str, order)):
        return None
    same_tag = a.GetChiralTag() == b.GetChiralTag()
    return same_tag == (parity(order, mapped) == 0)


def differences(
    variants, drawn: Chem.Mol, matches, drawn_mol: Chem.Mol, reg_index: dict[int, int]
) -> list[CentreDifference]:
    best: tuple[tuple[int, list[int]], list[int], Chem.Mol, dict[int, int]] | None = None
    for variant in variants:
        centres = specified_centres(variant)
        for match in matches:
            diff = [c for c in centres if same_configuration(variant, drawn, match, c) is False]
            key = (len(diff), sorted(diff))  # fewest differences; among equals the lowest atoms, whatever the drawing
            if best is None or key < best[0]:
                best = (key, diff, variant, match)
    if best is None:
        return []
    _, diff, variant, match = best
    reg_cip, drawn_cip = cip(variant), cip(drawn)
    locants = {a: ring.locants[k] for ring in find_rings(variant, fused=True)[0] for k, a in enumerate(ring.atoms)}
    index = heavy_index(drawn_mol)
    return [
        CentreDifference(
            reg_index.get(c, c) + 1,
            index.get(match[c], match[c]) + 1,
            variant.GetAtomWithIdx(c).GetSymbol(),
            reg_cip.get(c),
            drawn_cip.get(match[c]),
            locants.get(c),
        )
        for c in diff
    ]


def double_bond_differences(reg: Chem.Mol, drawn: Chem.Mol, matches, drawn_mol: Chem.Mol) -> str:
    """Double bonds whose E/Z (CIP) differs, as words; '' when none can be named."""
    if not matches:
        return ""
    index = heavy_index(drawn_mol)
    a, b = Chem.Mol(reg), Chem.Mol(drawn)
    try:
        rdCIPLabeler.AssignCIPLabels(a)
        rdCIPLabeler.AssignCIPLabels(b)
    except (RuntimeError, ValueError):
        return ""
    out = []
    for bond in a.GetBonds():
        if not bond.HasProp("_CIPCode"):
            continue
        i, j = matches[0].get(bond.GetBeginAtomIdx(), -1), matches[0].get(bond.GetEndAtomIdx(), -1)
        other = b.GetBondBetweenAtoms(i, j) if min(i, j) >= 0 else None
        drawn_label = other.GetProp("_CIPCode") if other is not None and other.HasProp("_CIPCode") else None
        if drawn_label != bond.GetProp("_CIPCode"):
            out.append(
                f"the double bond between atoms {bond.GetBeginAtomIdx() + 1} and {bond.GetEndAtomIdx() + 1}"
                f" ({bond.GetProp('_CIPCode')} registered, {drawn_label or 'not set'} drawn;"
                f" drawn atoms {index.get(i, i) + 1}, {index.get(j, j) + 1})"
            )
    return "; ".join(out)


def cip(mol: Chem.Mol) -> dict[int, str]:
    labelled = Chem.Mol(mol)
    try:
        rdCIPLabeler.AssignCIPLabels(labelled)
    except (RuntimeError, ValueError):
        return {}
    return {a.GetIdx(): a.GetProp("_CIPCode") for a in labelled.GetAtoms() if a.HasProp("_CIPCode")}
