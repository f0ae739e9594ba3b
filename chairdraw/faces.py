"""Top or bottom face of every ring substituent, exactly, from chiral tags and neighbour order.

No coordinates are used. The ring is oriented by its numbering: the top face is the one from
which atoms 0 -> 1 -> 2 run clockwise (the IUPAC convention for ring-conformation descriptors).
For a ring atom whose neighbours are listed (previous, next, s0, s1), RDKit's counter-clockwise
tag means s0 is on the top face; any other neighbour order is brought to that one by counting
the parity of the permutation. An implicit hydrogen counts as the last neighbour, as RDKit has it.

The inverse, ``set_faces``, writes chiral tags for wanted faces; the two are tested as a round
trip against InChI and against faces read from RDKit 3D chairs.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from rdkit import Chem

from .errors import StereoError
from .rings import ChairRing

CCW = Chem.ChiralType.CHI_TETRAHEDRAL_CCW
CW = Chem.ChiralType.CHI_TETRAHEDRAL_CW
TOP, BOTTOM = "top", "bottom"


@dataclass(frozen=True)
class Slot:
    """One exocyclic bond position of a ring atom: a substituent, a hydrogen or a lone pair."""

    ring_index: int
    ring_atom: int
    atom: int | None  # the attached atom in the input's numbering; None for implicit H / lone pair
    element: str  # symbol of the attached atom, 'H', or 'LP' for a lone pair
    face: str | None  # None where the centre inverts fast (ring N-H, N-R)
    inverting: bool = False

    @property
    def is_group(self) -> bool:
        return self.element not in ("H", "LP")


Tops = Sequence["bool | None"]  # per slot: True top face, False bottom, None inverting


def tops_of(slots: tuple[Slot, ...]) -> tuple[bool | None, ...]:
    """The faces of slots as a face assignment: True top, False bottom, None inverting."""
    return tuple(None if s.face is None else s.face == TOP for s in slots)


def parity(order: list, target: list) -> int:
    """0 if ``order`` is an even permutation of ``target``, else 1."""
    perm = [order.index(x) for x in target]
    odd = 0
    seen = [False] * len(perm)
    for i in range(len(perm)):
        if seen[i]:
            continue
        j, length = i, 0
        while not seen[j]:
            seen[j] = True
            j = perm[j]
            length += 1
        odd ^= (length - 1) & 1
    return odd


def _neighbour_order(atom: Chem.Atom) -> list:
    """Neighbours in the order chiral tags refer to, implicit H last (as tokens 'H0', 'H1')."""
    order: list = [b.GetOtherAtomIdx(atom.GetIdx()) for b in atom.GetBonds()]
    order += [f"H{k}" for k in range(atom.GetTotalNumHs())]
    return order


def ring_slots(mol: Chem.Mol, ring: ChairRing, arbitrary: Mapping[int, bool] | None = None) -> tuple[Slot, ...]:
    """Every exocyclic position of the ring with its face.

    Ring atoms without a chiral tag get an arbitrary but fixed choice (s0 on top); callers make
    sure that only atoms that are not stereocentres, or whose stereo was assigned, reach here.
    """
    slots: list[Slot] = []
    members = set(ring.atoms)
    for i, idx in enumerate(ring.atoms):
        if i in ring.trigonal:
            continue
        atom = mol.GetAtomWithIdx(idx)
        order = _neighbour_order(atom)
        prev, nxt = ring.neighbours(i)
        exo = [n for n in order if n not in (prev, nxt)]
        if not exo:
            continue  # ring O, ring S: lone pairs only
        if atom.GetSymbol() == "N" and (len(order) == 3 or any(_is_h(mol, n) for n in exo)):
            slots.extend(_inverting(mol, i, idx, exo))
            continue
        if len(exo) != 2:
            raise StereoError(f"ring atom {idx} has {len(exo)} exocyclic neighbours; expected 2")
        s0, s1 = exo
        tag = atom.GetChiralTag()
        if tag in (CW, CCW):
            effective = tag if parity(order, [prev, nxt, s0, s1]) == 0 else (CW if tag == CCW else CCW)
            s0_top = effective == CCW
        else:
            s0_top = True
        for s, top in ((s0, s0_top), (s1, not s0_top)):
            slots.append(Slot(i, idx, _atom(s), _element(mol, s), TOP if top else BOTTOM))
    del members
    return tuple(slots)


def _inverting(mol: Chem.Mol, i: int, idx: int, exo: list) -> list[Slot]:
    out = [Slot(i, idx, _atom(s), _element(mol, s), None, inverting=True) for s in exo]
    if len(out) == 1:
        out.append(Slot(i, idx, None, "LP", None, inverting=True))
    return out


def _is_h(mol: Chem.Mol, n) -> bool:
    return isinstance(n, str) or mol.GetAtomWithIdx(n).GetAtomicNum() == 1


def _atom(n) -> int | None:
    return None if isinstance(n, str) else n


def _element(mol: Chem.Mol, n) -> str:
    if isinstance(n, str):
        return "H"
    atom = mol.GetAtomWithIdx(n)
    if atom.GetAtomicNum() == 1 and atom.GetIsotope() in (2, 3):
        return "D" if atom.GetIsotope() == 2 else "T"  # isotopes are groups with A-values of their own
    return atom.GetSymbol()


def set_faces(mol: Chem.Mol, ring: ChairRing, faces: Mapping[int, str]) -> Chem.Mol:
    """A copy of ``mol`` with chiral tags on the ring atoms that put substituent atoms on the
    given faces. ``faces`` maps a substituent atom index to 'top' or 'bottom'; each ring atom
    needs at most one entry (its other neighbour goes on the other face).

    Tags are left as written, also on atoms that are not stereocentres (an embedding then honours
    the choice). They are not "cleaned": RDKit's AssignStereochemistry(cleanIt=True) in the new
    perception mode rewrites ring tags of symmetric polyols (scyllo- and myo-type inositols seen
    here), turning one configuration into another."""
    out = Chem.Mol(mol)
    for i, idx in enumerate(ring.atoms):
        atom = out.GetAtomWithIdx(idx)
        order = _neighbour_order(atom)
        prev, nxt = ring.neighbours(i)
        exo = [n for n in order if n not in (prev, nxt)]
        wanted = [(n, faces[n]) for n in exo if not isinstance(n, str) and n in faces]
        if not wanted:
            continue
        if len(exo) != 2:
            raise StereoError(f"ring atom {idx} cannot carry a face: it has {len(exo)} exocyclic neighbours")
        s0, s1 = exo
        n, face = wanted[0]
        s0_top = (face == TOP) == (n == s0)
        effective = CCW if s0_top else CW
        tag = effective if parity(order, [prev, nxt, s0, s1]) == 0 else (CW if effective == CCW else CCW)
        atom.SetChiralTag(tag)
    forget_stereo_perception(out)
    return out


_PERCEIVED = ("_ringStereoAtoms", "_ringStereoOtherAtom", "_ringStereochemCand", "_ChiralityPossible", "_CIPCode")


def forget_stereo_perception(mol: Chem.Mol) -> None:
    """Drop what RDKit perceived on the atoms from the tags they had before they were rewritten:
    the SMILES writer reads the ring-stereo partners stored there ('_ringStereoAtoms') and would
    write the old relation of a 1,4-pair. The molecule's own "perceived" mark stays: a fresh
    perception in the new mode writes SMILES of some inositol configurations that read back as
    another isomer (seen with RDKit 2026.09), while the tags themselves are right."""
    for i in range(mol.GetNumAtoms()):
        atom = mol.GetAtomWithIdx(i)
        for prop in _PERCEIVED:
            if atom.HasProp(prop):
                atom.ClearProp(prop)
    # (the molecule keeps its "stereo perceived" mark, so the writer takes the tags as they are)


def mirror(mol: Chem.Mol) -> Chem.Mol:
    """The mirror image: every tetrahedral tag inverted."""
    out = Chem.Mol(mol)
    for atom in out.GetAtoms():
        tag = atom.GetChiralTag()
        if tag == CW:
            atom.SetChiralTag(CCW)
        elif tag == CCW:
            atom.SetChiralTag(CW)
    return out
