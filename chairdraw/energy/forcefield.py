"""MMFF94 energies of the two chairs of a ring (RDKit), the check where tables fall short.

Each chair is built by pinning the six ring atoms onto an ideal chair with the requested atoms up
(ETKDG coordinate map; random starting coordinates are required for the map to be honoured),
then minimised with MMFF94. A minimised structure only counts if it is still that chair, tested
with Cremer-Pople puckering (J. Am. Chem. Soc. 1975, 97, 1354) and the up/down pattern. These are
force-field energies (enthalpy-like), not free energies; compare them only with each other.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, replace
from typing import Any

import numpy as np
from rdkit import Chem
from rdkit.Chem import rdDistGeom, rdForceFieldHelpers
from rdkit.Geometry import Point3D

from ..chairs import points_up
from ..errors import EnergyError
from ..faces import ring_slots, set_faces
from ..rings import ChairRing

RADIUS, HEIGHT = 1.446, 0.25  # ideal chair: C-C 1.53 A, ring angle ~110 deg, torsions ~59 deg
# every seed is embedded and minimised and the lowest structure that keeps the chair counts: one
# structure per chair left side chains (a phenyl's rotation) wherever the embedding put them, and
# 1-methyl-1-phenylcyclohexane then came out 3.4 kcal/mol the wrong way
SEEDS = (0xC0FFEE, 7, 2024, 11, 42, 99, 123, 314)
BUDGET_S = 2.0  # per chair: no further seeds once a good structure is in hand and this time is spent
GIVE_UP_S = 4.0  # per chair: no further seeds after this, good structure or not
EMBED_TIMEOUT_S = 2  # RDKit's own limit on one embedding (seconds)
CHAIR_THETA = 25.0  # degrees from 0 or 180: a chair; half-chairs sit near 50


@dataclass(frozen=True)
class ChairGeometry:
    chair: int
    energy_kcal_mol: float
    theta_deg: float
    q_angstrom: float
    mol: Chem.Mol  # with hydrogens and the minimised conformer


def puckering(points: np.ndarray) -> tuple[float, float]:
    """Cremer-Pople total amplitude Q (A) and theta (deg, 0..180) of a six-membered ring."""
    r = points - points.mean(axis=0)
    j = np.arange(6)
    r1 = (r * np.sin(2 * np.pi * j / 6)[:, None]).sum(axis=0)
    r2 = (r * np.cos(2 * np.pi * j / 6)[:, None]).sum(axis=0)
    n = np.cross(r1, r2)
    n /= np.linalg.norm(n)
    z = r @ n
    q2c = math.sqrt(2 / 6) * float((z * np.cos(4 * np.pi * j / 6)).sum())
    q2s = -math.sqrt(2 / 6) * float((z * np.sin(4 * np.pi * j / 6)).sum())
    q3 = math.sqrt(1 / 6) * float((z * (-1.0) ** j).sum())
    q2 = math.hypot(q2c, q2s)
    return math.sqrt(q2 * q2 + q3 * q3), math.degrees(math.atan2(q2, q3))


def top_normal(points: np.ndarray) -> np.ndarray:
    """Unit normal on the side from which atoms 0 -> 1 -> 2 run clockwise."""
    r = points - points.mean(axis=0)
    n = -np.cross(r, np.roll(r, -1, axis=0)).sum(axis=0)
    return n / np.linalg.norm(n)


def up_pattern(points: np.ndarray) -> tuple[bool, ...]:
    z = (points - points.mean(axis=0)) @ top_normal(points)
    return tuple(bool(v > 0) for v in z)


def build_chair(
    mol: Chem.Mol, ring: ChairRing, chair: int, variant: str = "MMFF94", time_boxed: bool = False
) -> ChairGeometry:
    """The lowest MMFF94-minimised structure of ``chair`` over the seeds; EnergyError if none keeps it.
    ``time_boxed`` (the automatic check) stops early (BUDGET_S, GIVE_UP_S) and limits each
    embedding (EMBED_TIMEOUT_S); a check asked for runs every seed to the end.

    Faces are taken from ``ring_slots`` and written back as chiral tags on every substituted ring
    atom, stereocentre or not, so that the embedding puts each group on the same face as the
    analysis does (for a non-stereogenic atom the analysis' choice is arbitrary but fixed)."""
    mol, ring = _ring_fragment(mol, ring)
    slots = ring_slots(mol, ring)
    faces = {s.atom: s.face for s in slots if s.atom is not None and s.is_group and s.face is not None}
    mh = Chem.AddHs(set_faces(mol, ring, faces))
    want = tuple(points_up(chair, k) for k in range(6))
    coord_map = {}
    for k, atom in enumerate(ring.atoms):
        angle = -k * math.pi / 3  # clockwise seen from +z: +z is the top face
        coord_map[atom] = Point3D(RADIUS * math.cos(angle), RADIUS * math.sin(angle), HEIGHT if want[k] else -HEIGHT)
    best: ChairGeometry | None = None
    start = time.monotonic()
    for seed in SEEDS:
        spent = time.monotonic() - start
        if time_boxed and (spent > GIVE_UP_S or (best is not None and spent > BUDGET_S)):
            break
        params: Any = rdDistGeom.ETKDGv3()  # the RDKit stubs mistype its attributes
        params.randomSeed = seed
        params.useRandomCoords = True
        params.enforceChirality = True
        params.SetCoordMap(coord_map)
        if time_boxed:
            params.timeout = EMBED_TIMEOUT_S
        work = Chem.Mol(mh)
        try:
            if rdDistGeom.EmbedMolecule(work, params) < 0:
                continue
        except Exception as exc:  # RDKit raises C++ range errors on odd inputs
            raise EnergyError(f"the embedding failed ({exc})") from None
        props = rdForceFieldHelpers.MMFFGetMoleculeProperties(work, mmffVariant=variant)
        if props is None:
            raise EnergyError("MMFF94 has no parameters for this molecule")
        ff = rdForceFieldHelpers.MMFFGetMoleculeForceField(work, props)
        ff.Minimize(maxIts=2000)
        pts = work.GetConformer().GetPositions()[list(ring.atoms)]
        q, theta = puckering(pts)
        if up_pattern(pts) != want or not (theta < CHAIR_THETA or theta > 180 - CHAIR_THETA):
            continue
        if not _faces_hold(work, ring, faces, pts):
            continue
        energy = ff.CalcEnergy()
        if best is None or energy < best.energy_kcal_mol:
            best = ChairGeometry(chair, energy, theta, q, work)
    if best is None:
        limit = f" within the automatic check's {GIVE_UP_S:g} s" if time_boxed else ""
        raise EnergyError(
            f"no embedding kept chair {chair} of the ring of atoms {list(ring.atoms)}{limit} "
            f"({time.monotonic() - start:.1f} s)"
        )
    return best


def fragment_size(mol: Chem.Mol, ring: ChairRing) -> int:
    """Heavy atoms of the piece that holds the ring (what the embedding sees)."""
    piece = next(p for p in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if ring.atoms[0] in p)
    return sum(1 for a in piece if mol.GetAtomWithIdx(a).GetAtomicNum() > 1)


def _ring_fragment(mol: Chem.Mol, ring: ChairRing) -> tuple[Chem.Mol, ChairRing]:
    """Only the fragment that holds the ring (salts and solvents are left out of the embedding)."""
    pieces = Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False)
    if len(pieces) == 1:
        return mol, ring
    keep = next(p for p in pieces if ring.atoms[0] in p)
    index = {old: new for new, old in enumerate(sorted(keep))}
    editable = Chem.RWMol(mol)
    for atom in sorted((a for a in range(mol.GetNumAtoms()) if a not in index), reverse=True):
        editable.RemoveAtom(atom)
    fragment = editable.GetMol()
    Chem.SanitizeMol(fragment)
    moved = replace(ring, atoms=tuple(index[a] for a in ring.atoms))
    return fragment, moved


def _faces_hold(mol: Chem.Mol, ring: ChairRing, faces: dict, pts: np.ndarray) -> bool:
    normal = top_normal(pts)
    conf = mol.GetConformer()
    for atom, face in faces.items():
        ring_atom = next(n.GetIdx() for n in mol.GetAtomWithIdx(atom).GetNeighbors() if n.GetIdx() in ring.atoms)
        bond = np.array(conf.GetAtomPosition(atom)) - np.array(conf.GetAtomPosition(ring_atom))
        if (float(bond @ normal) > 0) != (face == "top"):
            return False
    return True


def chair_energies(
    mol: Chem.Mol, ring: ChairRing, variant: str = "MMFF94", time_boxed: bool = False
) -> tuple[float, float]:
    """MMFF94 energies (kcal/mol) of chair 0 and chair 1, relative to the lower one."""
    e0 = build_chair(mol, ring, 0, variant, time_boxed).energy_kcal_mol
    e1 = build_chair(mol, ring, 1, variant, time_boxed).energy_kcal_mol
    low = min(e0, e1)
    return e0 - low, e1 - low
