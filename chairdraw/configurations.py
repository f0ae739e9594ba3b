"""Every distinct relative configuration of a ring whose stereocentres the input left open.

Faces are enumerated directly (which of the two exocyclic positions of each open centre is on
top), not through chiral tags and identity strings, so that a sugar with five open centres costs
32 small tuples instead of 64 InChIs. Two assignments are the same configuration when a symmetry
of the ring (a rotation or reflection of the numbering that maps every ring atom onto one of the
same canonical rank) or, where nothing else in the molecule is chiral, the mirror image turns one
into the other. Reversing the numbering turns the top face into the bottom face.
"""

from __future__ import annotations

import itertools
from collections.abc import Mapping, Sequence

from rdkit import Chem

from ._rdkit import items
from .faces import BOTTOM, TOP, Slot, tops_of
from .rings import ChairRing


def ring_symmetries(mol: Chem.Mol, ring: ChairRing) -> list[tuple[tuple[int, ...], bool]]:
    """(index map, numbering reversed) for every rotation/reflection that keeps the ring's ranks."""
    return _symmetries_and_ranks(mol, ring)[0]


def _symmetries_and_ranks(mol: Chem.Mol, ring: ChairRing) -> tuple[list[tuple[tuple[int, ...], bool]], list[int]]:
    """The ring symmetries and the atom ranks they were read from: canonical ranks with the ring's
    own tags cleared (stereo elsewhere in the molecule still breaks a symmetry)."""
    bare = Chem.Mol(mol)
    for atom in ring.atoms:
        bare.GetAtomWithIdx(atom).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    ranks = items(Chem.CanonicalRankAtoms(bare, breakTies=False, includeChirality=True))
    ring_ranks = [ranks[a] for a in ring.atoms]
    out = []
    for shift in range(6):
        for reverse in (False, True):
            perm = tuple(((-i if reverse else i) + shift) % 6 for i in range(6))
            if all(ring_ranks[perm[i]] == ring_ranks[i] for i in range(6)):
                out.append((perm, reverse))
    return out, ranks


def _principal(slots: tuple[Slot, ...], ranks: dict[int | None, int]) -> dict[int, int]:
    """Slot number of the higher-ranked exocyclic position of each ring atom, where the two differ."""
    by_index: dict[int, list[int]] = {}
    for j, s in enumerate(slots):
        if s.face is not None:
            by_index.setdefault(s.ring_index, []).append(j)
    out = {}
    for i, here in by_index.items():
        if len(here) != 2:
            continue
        a, b = (ranks.get(slots[j].atom, -1) for j in here)
        if a != b:
            out[i] = here[0] if a > b else here[1]
    return out


# faces in a pattern: 0 no principal group, 1 top, 2 bottom; _FLIP turns one face into the other
_FLIP = (0, 2, 1)


def _images(symmetries: list[tuple[tuple[int, ...], bool]], mirror_ok: bool) -> list[tuple[tuple[int, ...], bool]]:
    """Each symmetry (and its mirror image, where allowed) as (source index of each place, flip faces)."""
    out = []
    for perm, reverse in symmetries:
        source = [0] * 6
        for i in range(6):
            source[perm[i]] = i
        out.append((tuple(source), reverse))
        if mirror_ok:
            out.append((tuple(source), not reverse))
    return out


def stereo_units(
    centres: list[int], status: Mapping[int, str], groups: Sequence[tuple[str, tuple[int, ...]]]
) -> tuple[list[list[int]], dict[int, str]]:
    """The ring's stereocentres whose faces are turned over together when relative configurations
    are enumerated, and the stereo-group name of each specified centre where that matters.

    An unspecified or unknown centre is a unit of its own. Specified centres keep their relative
    configuration within one enhanced-stereo group ('abs', '&1', 'or1' ...; centres in no group
    are absolute); centres in different groups have no stated relation, so every group but one
    (the absolute one, else the first met in ring order) is a unit."""
    names: dict[int, str] = {}
    counts = {"and": 0, "or": 0}
    for kind, atoms in groups:
        if kind == "absolute":
            name = "abs"
        else:
            counts[kind] += 1
            name = f"{'&' if kind == 'and' else 'or'}{counts[kind]}"
        for a in atoms:
            names[a] = name
    specified = [a for a in centres if status[a] == "specified"]
    by_group: dict[str, list[int]] = {}
    for a in specified:
        by_group.setdefault(names.get(a, "abs"), []).append(a)
    units = [[a] for a in centres if status[a] != "specified"]
    if len(by_group) < 2:
        return units, {}
    reference = "abs" if "abs" in by_group else next(iter(by_group))
    units += [atoms for name, atoms in by_group.items() if name != reference]
    return units, {a: names.get(a, "abs") for a in specified}


def enumerate_faces(
    mol: Chem.Mol, ring: ChairRing, slots: tuple[Slot, ...], units: list[list[int]], mirror_ok: bool
) -> list[tuple[bool | None, ...]]:
    """Distinct face assignments of the ring got by turning over the faces of each unit of
    stereocentres (``stereo_units``; the other centres keep theirs), each as the face of every
    slot (True top, False bottom, None inverting: see ``faces.tops_of``)."""
    symmetries, ranks_all = _symmetries_and_ranks(mol, ring)
    ranks: dict[int | None, int] = {a: r for a, r in enumerate(ranks_all)}
    principal = _principal(slots, ranks)
    images = _images(symmetries, mirror_ok)
    unit_index = [[ring.atoms.index(a) for a in unit] for unit in units]
    # the slots whose faces turning a unit over turns over
    turned = [[j for j, s in enumerate(slots) if s.ring_index in index and s.face is not None] for index in unit_index]
    base = list(tops_of(slots))
    base_pattern = [0] * 6
    for i, j in principal.items():
        base_pattern[i] = 1 if base[j] else 2
    seen: set[tuple[int, ...]] = set()
    out = []
    for flips in itertools.product((False, True), repeat=len(unit_index)):
        pattern = list(base_pattern)
        for index, f in zip(unit_index, flips):
            if f:
                for i in index:
                    pattern[i] = _FLIP[pattern[i]]
        key = min(
            tuple([_FLIP[pattern[k]] for k in source] if flip else [pattern[k] for k in source])
            for source, flip in images
        )
        if key in seen:
            continue
        seen.add(key)
        tops = list(base)
        for js, f in zip(turned, flips):
            if f:
                for j in js:
                    tops[j] = not tops[j]
        out.append(tuple(tops))
    return out


def faces_of(slots: tuple[Slot, ...], tops: Sequence[bool | None] | None = None) -> dict[int, str]:
    """Substituent atom -> face, one entry per ring atom (for ``faces.set_faces``); with ``tops``,
    the faces of that assignment instead of the slots' own."""
    out: dict[int, str] = {}
    done: set[int] = set()
    for j, s in enumerate(slots):
        if s.atom is not None and s.face is not None and s.ring_index not in done:
            out[s.atom] = s.face if tops is None else (TOP if tops[j] else BOTTOM)
            done.add(s.ring_index)
    return out
