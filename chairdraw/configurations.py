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
from dataclasses import replace

from rdkit import Chem

from .faces import BOTTOM, TOP, Slot
from .rings import ChairRing

Pattern = tuple[str, ...]


def ring_symmetries(mol: Chem.Mol, ring: ChairRing) -> list[tuple[tuple[int, ...], bool]]:
    """(index map, numbering reversed) for every rotation/reflection that keeps the ring's ranks."""
    return _symmetries_and_ranks(mol, ring)[0]


def _symmetries_and_ranks(mol: Chem.Mol, ring: ChairRing) -> tuple[list[tuple[tuple[int, ...], bool]], list[int]]:
    """The ring symmetries and the atom ranks they were read from: canonical ranks with the ring's
    own tags cleared (stereo elsewhere in the molecule still breaks a symmetry)."""
    bare = Chem.Mol(mol)
    for atom in ring.atoms:
        bare.GetAtomWithIdx(atom).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    ranks = list(Chem.CanonicalRankAtoms(bare, breakTies=False, includeChirality=True))
    ring_ranks = [ranks[a] for a in ring.atoms]
    out = []
    for shift in range(6):
        for reverse in (False, True):
            perm = tuple(((-i if reverse else i) + shift) % 6 for i in range(6))
            if all(ring_ranks[perm[i]] == ring_ranks[i] for i in range(6)):
                out.append((perm, reverse))
    return out, ranks


def _principal(slots: tuple[Slot, ...], ranks: dict[int | None, int]) -> dict[int, Slot]:
    """The higher-ranked exocyclic position of each ring atom, where the two differ."""
    by_index: dict[int, list[Slot]] = {}
    for s in slots:
        if s.face is not None:
            by_index.setdefault(s.ring_index, []).append(s)
    out = {}
    for i, here in by_index.items():
        if len(here) != 2:
            continue
        a, b = (ranks.get(s.atom, -1) for s in here)
        if a != b:
            out[i] = here[0] if a > b else here[1]
    return out


def _pattern(slots: tuple[Slot, ...], principal_atoms: dict[int, int | None]) -> Pattern:
    faces = {(s.ring_index, s.atom): s.face for s in slots}
    return tuple(
        faces[(i, principal_atoms[i])] or "" if i in principal_atoms else "" for i in range(6)  # type: ignore[misc]
    )


_FLIPPED = {TOP: BOTTOM, BOTTOM: TOP}


def _flip(face: str) -> str:
    return _FLIPPED.get(face, face)


def _canonical(pattern: Pattern, symmetries, mirror_ok: bool) -> Pattern:
    images = []
    for perm, reverse in symmetries:
        moved = [""] * 6
        for i in range(6):
            moved[perm[i]] = _flip(pattern[i]) if reverse else pattern[i]
        images.append(tuple(moved))
        if mirror_ok:
            images.append(tuple(_flip(f) for f in moved))
    return min(images)


def enumerate_faces(
    mol: Chem.Mol, ring: ChairRing, slots: tuple[Slot, ...], open_atoms: list[int], mirror_ok: bool
) -> list[tuple[Slot, ...]]:
    """Distinct face assignments of the open centres (the fixed ones keep theirs)."""
    symmetries, ranks_all = _symmetries_and_ranks(mol, ring)
    ranks: dict[int | None, int] = {a: r for a, r in enumerate(ranks_all)}
    principal = {i: s.atom for i, s in _principal(slots, ranks).items()}
    open_index = [ring.atoms.index(a) for a in open_atoms]
    # each slot and its face-flipped twin, made once
    twins = [(s, replace(s, face=_flip(s.face)) if s.face is not None and s.ring_index in open_index else s) for s in slots]
    base = _pattern(slots, principal)
    seen: set[Pattern] = set()
    out = []
    for flips in itertools.product((False, True), repeat=len(open_index)):
        flipped = {i for i, f in zip(open_index, flips) if f}
        pattern = tuple(_flip(face) if i in flipped else face for i, face in enumerate(base))
        key = _canonical(pattern, symmetries, mirror_ok)
        if key in seen:
            continue
        seen.add(key)
        out.append(tuple(twin if s.ring_index in flipped else s for s, twin in twins))
    return out


def faces_of(slots: tuple[Slot, ...]) -> dict[int, str]:
    """Substituent atom -> face, one entry per ring atom (for ``faces.set_faces``)."""
    out: dict[int, str] = {}
    done: set[int] = set()
    for s in slots:
        if s.atom is not None and s.face is not None and s.ring_index not in done:
            out[s.atom] = s.face
            done.add(s.ring_index)
    return out
