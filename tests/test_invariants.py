"""Invariants of the exact core (faces and chairs) on thousands of random substituted rings.

Random cyclohexanes and oxanes with random substituents (geminal pairs allowed) and random chiral
tags are written as SMILES, sanitised by RDKit and re-written as a random (non-canonical) SMILES,
so that neighbour orders, ring-closure positions and implicit-H positions vary as well.

1. Ring flip: in every ring, every fixed-face position keeps its face and swaps axial <-> equatorial
   between the two chairs (checked on ``analyze()`` output and on the low-level ``place()``).
2. Outside check in 3D: RDKit's ETKDG embeds the molecule with the six ring atoms pinned to an
   ideal chair 0 (ring numbered clockwise seen from +z, ring indices 0, 2, 4 up). The chirality
   read back from the 3D geometry alone must equal the input's (atom by atom, and as standard
   InChI); then, from RDKit's coordinates only, the side of every substituent bond must equal
   chairdraw's face, its angle to the normal must give chairdraw's chair-0 orientation, and any
   two substituents are on the same side exactly when chairdraw gives them the same face.
3. Round trips: faces -> ``set_faces`` on a copy with every ring tag cleared -> the input's standard
   InChI; random faces -> ``set_faces`` -> ``ring_slots`` gives the faces back; and hydrogens as
   atoms (AddHs) give the same faces as implicit ones, and the same groups (a regression: explicit
   hydrogens once changed the group recognition).
4. A table of known molecules with outside references named in comments.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, event, given, settings
from hypothesis import strategies as st
from rdkit import Chem
from rdkit.Chem import rdCIPLabeler, rdDistGeom, rdForceFieldHelpers
from rdkit.Geometry import Point3D

import chairdraw
from chairdraw import _rdkit
from chairdraw.chairs import AXIAL, EQUATORIAL, place, points_up
from chairdraw.errors import ChairdrawError
from chairdraw.faces import BOTTOM, TOP, ring_slots, set_faces
from chairdraw.rings import find_rings

# --- random molecules --------------------------------------------------------------------------

SUBSTITUENTS = ("C", "O", "F", "Cl", "N", "CC", "C(C)C", "OC", "C(=O)OC")
TAGS = ("", "@", "@@")  # unspecified, counter-clockwise, clockwise (as written)
MOSTLY_TAGGED = ("", "@", "@", "@@", "@@")  # for the 3D check, where only tagged atoms can be checked

COMMON = dict(deadline=None, derandomize=True, database=None, suppress_health_check=[HealthCheck.too_slow])


@st.composite
def ring_smiles(draw, tags: tuple[str, ...] = TAGS) -> str:
    """A random cyclohexane or oxane with random substituents and random ring stereo."""
    ring_o = draw(st.sampled_from((None, 0, 1, 2, 3, 4, 5)))  # about half oxanes, O anywhere in the writing
    if ring_o is not None and draw(st.booleans()):
        ring_o = None
    tokens = []
    for k in range(6):
        closure = "1" if k in (0, 5) else ""
        if k == ring_o:
            tokens.append("O" + closure)
            continue
        subs = draw(st.lists(st.sampled_from(SUBSTITUENTS), min_size=0, max_size=2))
        if not subs:
            tokens.append("C" + closure)
            continue
        tag = draw(st.sampled_from(tags))
        hydrogen = "H" if len(subs) == 1 else ""
        tokens.append(f"[C{tag}{hydrogen}]{closure}" + "".join(f"({s})" for s in subs))
    mol = Chem.MolFromSmiles("".join(tokens))
    assume(mol is not None)
    # a random non-canonical SMILES of the same molecule: other neighbour orders for the same stereo
    seed = draw(st.integers(min_value=0, max_value=2**31 - 1))
    return Chem.MolToRandomSmilesVect(mol, 1, randomSeed=seed)[0]


def analysed(smiles: str):
    """chairdraw's analysis and the input molecule (same atom numbering); skip what it refuses."""
    try:
        structure = chairdraw.read(smiles)
        analysis = chairdraw.analyze(structure)
    except ChairdrawError as exc:
        event(f"chairdraw refused: {type(exc).__name__}")
        assume(False)
        raise  # unreachable: assume(False) raises
    assume(len(analysis.rings) > 0)
    return analysis, structure.mol


def tagged(mol: Chem.Mol, atom: int) -> bool:
    return mol.GetAtomWithIdx(atom).GetChiralTag() in (
        Chem.ChiralType.CHI_TETRAHEDRAL_CW,
        Chem.ChiralType.CHI_TETRAHEDRAL_CCW,
    )


def inchi(mol: Chem.Mol) -> str:
    return _rdkit.standard_inchi(mol)


def cleared(mol: Chem.Mol, atoms) -> Chem.Mol:
    out = Chem.Mol(mol)
    for a in atoms:
        out.GetAtomWithIdx(a).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    return out


# --- 1. ring flip ------------------------------------------------------------------------------


@settings(max_examples=1500, **COMMON)
@given(ring_smiles())
def test_ring_flip_swaps_orientation_and_keeps_face(smiles):
    analysis, mol = analysed(smiles)
    for rr in analysis.rings:
        c0, c1 = rr.chairs
        assert len(c0.positions) == len(c1.positions)
        for k, up_atoms in enumerate((c0.up_atoms, c1.up_atoms)):
            assert set(up_atoms) == {a for i, a in enumerate(rr.atoms) if points_up(k, i)}
        for p0, p1 in zip(c0.positions, c1.positions):
            assert (p0.ring_atom, p0.atom, p0.label) == (p1.ring_atom, p1.atom, p1.label)
            if p0.inverting:
                continue
            assert p0.face == p1.face, smiles
            assert {p0.orientation, p1.orientation} == {AXIAL, EQUATORIAL}, smiles
            for chair, p in ((c0, p0), (c1, p1)):
                # axial exactly when the face is the side the ring atom points to
                assert (p.orientation == AXIAL) == ((p.face == TOP) == (p.ring_atom in chair.up_atoms))
        for chair in (c0, c1):
            by_atom: dict[int, list[str]] = {}
            for p in chair.positions:
                by_atom.setdefault(p.ring_atom, []).append(p.orientation)
            for orientations in by_atom.values():
                assert sorted(orientations) == [AXIAL, EQUATORIAL]  # one of each on every ring atom

    # the same on the low-level API
    rings, _ = find_rings(mol)
    for ring in rings:
        slots = ring_slots(mol, ring)
        chair0, chair1 = place(0, slots), place(1, slots)
        for a, b in zip(chair0, chair1):
            assert a.slot == b.slot
            if a.slot.face is None:
                continue
            assert a.face == b.face == a.slot.face
            assert a.orientation != b.orientation
            assert {a.orientation, b.orientation} == {AXIAL, EQUATORIAL}


# --- 2. the outside check: RDKit 3D chairs ------------------------------------------------------

CHAIR_R, CHAIR_Z = 1.446, 0.25  # ideal chair: C-C 1.530 A, torsions +-59 deg (common practice)
AXIAL_COS, EQUATORIAL_COS = 0.75, 0.5  # |cos(bond, normal)| above: axial; below: equatorial
EMBED_SEED = 0xC4A12


def ideal_chair0() -> list[Point3D]:
    """Chair 0 with top = +z: ring index k at angle -60k degrees (clockwise seen from +z), indices
    0, 2, 4 at +z."""
    return [
        Point3D(
            CHAIR_R * math.cos(-k * math.pi / 3),
            CHAIR_R * math.sin(-k * math.pi / 3),
            CHAIR_Z if k % 2 == 0 else -CHAIR_Z,
        )
        for k in range(6)
    ]


def top_normal(points: np.ndarray) -> np.ndarray:
    """Unit normal on the side from which points[0] -> points[1] -> points[2] ... run clockwise.

    For a polygon running counter-clockwise seen from a side, each cross product p_i x p_(i+1) of
    centred positions points towards the viewer (right-hand rule); the minus sign turns it to the
    side from which the ring runs clockwise, chairdraw's top face. Checked by
    ``test_top_normal_sign_convention``.
    """
    c = points - points.mean(axis=0)
    n = -sum(np.cross(c[i], c[(i + 1) % len(c)]) for i in range(len(c)))
    return n / np.linalg.norm(n)


def local_top_normal(ring: np.ndarray, k: int) -> np.ndarray:
    """Normal of the plane (k-1, k, k+1) on the top side: the turn (p_k - p_(k-1)) x (p_(k+1) - p_k)
    of a ring running clockwise seen from the top points away from the viewer, hence the minus."""
    before, here, after = ring[(k - 1) % 6], ring[k], ring[(k + 1) % 6]
    m = -np.cross(here - before, after - here)
    return m / np.linalg.norm(m)


def test_top_normal_sign_convention():
    # a hexagon in the xy plane, listed at angles 0, -60, -120 ... degrees: seen from +z (x to the
    # right, y up) it runs clockwise, so its top normal is +z; listed the other way round it is -z
    clockwise_from_above = np.array([[math.cos(-k * math.pi / 3), math.sin(-k * math.pi / 3), 0.0] for k in range(6)])
    assert np.allclose(top_normal(clockwise_from_above), [0, 0, 1])
    assert np.allclose(top_normal(clockwise_from_above[::-1]), [0, 0, -1])
    # a puckered chair does not change it, nor does starting the numbering elsewhere
    chair = np.array([[p.x, p.y, p.z] for p in ideal_chair0()])
    assert np.allclose(top_normal(chair), [0, 0, 1])
    assert np.allclose(top_normal(np.roll(chair, 2, axis=0)), [0, 0, 1])
    for k in range(6):
        assert local_top_normal(clockwise_from_above, k) @ [0, 0, 1] == pytest.approx(1)
        assert local_top_normal(chair, k)[2] > 0.5


def embed_chair0(mol: Chem.Mol, ring_atoms: tuple[int, ...]) -> Chem.Mol | None:
    """AddHs and ETKDG with the ring pinned to chair 0 (a coordinate map); None on failure."""
    mh = Chem.AddHs(mol)
    ps = rdDistGeom.ETKDGv3()
    ps.randomSeed = EMBED_SEED
    ps.useRandomCoords = True  # required for the coordMap to be used as fixed positions
    ps.enforceChirality = True
    ps.maxIterations = 50
    ps.SetCoordMap(dict(zip(ring_atoms, ideal_chair0())))
    if rdDistGeom.EmbedMolecule(mh, ps) != 0:
        return None
    # ETKDG's loose distance bounds leave crowded substituents splayed (an equatorial bond 0.76
    # off the plane was seen); an MMFF relaxation with the ring held fixed repairs the angles
    props = rdForceFieldHelpers.MMFFGetMoleculeProperties(mh)
    if props is not None:
        ff = rdForceFieldHelpers.MMFFGetMoleculeForceField(mh, props)
        for atom in ring_atoms:
            ff.AddFixedPoint(atom)
        ff.Minimize(maxIts=2000)
    return mh


def stereo_from_geometry(mh: Chem.Mol) -> Chem.Mol:
    """A copy of the embedded molecule whose chiral tags come from its 3D coordinates only."""
    m = Chem.Mol(mh)
    for atom in m.GetAtoms():
        atom.SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    Chem.AssignStereochemistryFrom3D(m, replaceExistingTags=True)
    return m


def embedding_kept_the_stereo(mol: Chem.Mol, mh: Chem.Mol) -> bool:
    """Every tagged atom of the input has the same tag when read back from the 3D geometry, and the
    standard InChI from the geometry (with the input's open centres left open) is the input's."""
    from_3d = stereo_from_geometry(mh)
    open_ = [a.GetIdx() for a in mol.GetAtoms() if not tagged(mol, a.GetIdx())]
    if any(
        from_3d.GetAtomWithIdx(a.GetIdx()).GetChiralTag() != a.GetChiralTag()
        for a in mol.GetAtoms()
        if tagged(mol, a.GetIdx())
    ):
        return False
    flat = Chem.RemoveHs(cleared(from_3d, open_))
    flat.RemoveAllConformers()
    return inchi(flat) == inchi(mol)


@settings(max_examples=400, **COMMON)
@given(ring_smiles(MOSTLY_TAGGED))
def test_faces_and_chair0_orientations_agree_with_rdkit_3d_chair(smiles):
    analysis, mol = analysed(smiles)
    rr = analysis.rings[0]
    centres = [a for a in rr.atoms if tagged(mol, a)]
    assume(centres)  # only tagged ring atoms have a face fixed by the structure
    mh = embed_chair0(mol, rr.atoms)
    if mh is None:
        event("embedding failed")
    assume(mh is not None)
    kept = embedding_kept_the_stereo(mol, mh)
    if not kept:
        event("embedding lost the stereo")
    assume(kept)

    xyz = mh.GetConformer().GetPositions()
    ring = xyz[list(rr.atoms)]
    n = top_normal(ring)
    height = (ring - ring.mean(axis=0)) @ n
    # RDKit really gave chair 0: ring indices 0, 2, 4 above the mean plane, 1, 3, 5 below
    assert all((h > 0) == (k % 2 == 0) for k, h in enumerate(height)), height
    assert n[2] > 0.99  # and the pinned ring sits where it was put: top is +z

    sides: list[tuple[str, float]] = []  # (chairdraw face, side from RDKit's coordinates)
    for result in analysis.rings:  # one result per relative configuration of the open centres
        assert result.atoms == rr.atoms
        pairs: dict[int, list] = {}
        for p in result.chairs[0].positions:
            if p.ring_atom in centres:
                pairs.setdefault(p.ring_atom, []).append(p)
        for ring_atom, here in pairs.items():
            hs = [nb.GetIdx() for nb in mh.GetAtomWithIdx(ring_atom).GetNeighbors() if nb.GetAtomicNum() == 1]
            assert len(here) == 2 and len([p for p in here if p.atom is None]) == len(hs)
            others = [p.atom if p.atom is not None else hs.pop() for p in here]
            bonds = [xyz[o] - xyz[ring_atom] for o in others]
            bonds = [b / np.linalg.norm(b) for b in bonds]
            local = local_top_normal(ring, rr.atoms.index(ring_atom))
            assert local @ n > 0
            for p, bond in zip(here, bonds):
                cos = float(bond @ n)
                side = float(bond @ local)
                # the face: the side of the plane of the ring atom and its two ring neighbours
                # (the two exocyclic bonds of a tetrahedral atom are always on opposite sides)
                assert (TOP if side > 0 else BOTTOM) == p.face, (smiles, p, side)
                # and the side of the mean plane, for every bond clearly off it; an equatorial
                # bond lies within about 20 degrees of the mean plane, and in a crowded chair held
                # by the coordMap it can tip across (seen: +0.22 for an equatorial iPr between two
                # axial iPr after MMFF), so its face is checked against its partner below instead
                if abs(cos) >= EQUATORIAL_COS:
                    assert (TOP if cos > 0 else BOTTOM) == p.face, (smiles, p, cos)
                elif (TOP if cos > 0 else BOTTOM) != p.face:
                    event("equatorial bond across the mean plane (crowded chair)")
                if abs(cos) > AXIAL_COS:
                    assert p.orientation == AXIAL, (smiles, p, cos)
                elif abs(cos) < EQUATORIAL_COS:
                    assert p.orientation == EQUATORIAL, (smiles, p, cos)
                else:
                    event("bond in the ambiguous band 0.5-0.75")
                sides.append((p.face, side))
            # of the two positions of a ring atom, the top one is the one higher along n
            higher = max(range(2), key=lambda j: float(bonds[j] @ n))
            assert (here[higher].face, here[1 - higher].face) == (TOP, BOTTOM), (smiles, here)
    # cis/trans: same face exactly when the same side, for every pair of positions
    for i, (face_a, side_a) in enumerate(sides):
        for face_b, side_b in sides[i + 1 :]:
            assert (face_a == face_b) == ((side_a > 0) == (side_b > 0))


# --- 3. round trips ----------------------------------------------------------------------------


def substituents_by_ring_atom(mol: Chem.Mol, ring) -> dict[int, list[int]]:
    """The exocyclic heavy (explicit) neighbours of every ring atom."""
    members = set(ring.atoms)
    out = {}
    for a in ring.atoms:
        subs = [nb.GetIdx() for nb in mol.GetAtomWithIdx(a).GetNeighbors() if nb.GetIdx() not in members]
        if subs:
            out[a] = subs
    return out


@settings(max_examples=1500, **COMMON)
@given(ring_smiles(), st.data())
def test_faces_round_trip_to_the_same_inchi(smiles, data):
    analysis, mol = analysed(smiles)
    rings, _ = find_rings(mol)
    assert [r.atoms for r in rings] == [rr.atoms for rr in analysis.rings[:1]]
    ring = rings[0]
    face_of = {(p.ring_atom, p.atom): p.face for p in analysis.rings[0].chairs[0].positions}
    # one substituent per tagged ring atom is enough (its partner goes on the other face); of a
    # geminal pair, either one may be the one named
    faces: dict[int, str] = {}
    for ring_atom, subs in substituents_by_ring_atom(mol, ring).items():
        if tagged(mol, ring_atom):
            sub = data.draw(st.sampled_from(subs))
            faces[sub] = face_of[(ring_atom, sub)]
    rebuilt = set_faces(cleared(mol, ring.atoms), ring, faces)
    assert inchi(rebuilt) == inchi(mol), (smiles, faces)


@settings(max_examples=1500, **COMMON)
@given(ring_smiles(), st.data())
def test_set_faces_then_ring_slots_gives_the_faces_back(smiles, data):
    mol = Chem.MolFromSmiles(smiles)
    rings, _ = find_rings(mol)
    assume(rings)
    ring = rings[0]
    base = cleared(mol, ring.atoms)
    faces: dict[int, str] = {}
    partner_of: dict[int, int | None] = {}
    for subs in substituents_by_ring_atom(base, ring).values():
        sub = data.draw(st.sampled_from(subs))
        faces[sub] = data.draw(st.sampled_from((TOP, BOTTOM)))
        partner_of[sub] = next((s for s in subs if s != sub), None)
    out = set_faces(base, ring, faces)
    read_back = {slot.atom: slot for slot in ring_slots(out, ring) if slot.atom is not None}
    for sub, face in faces.items():
        if not tagged(out, read_back[sub].ring_atom):
            continue  # RDKit dropped the tag: not a stereocentre, its face is arbitrary
        assert read_back[sub].face == face, (smiles, faces)
        partner = partner_of[sub]
        if partner is not None:
            assert read_back[partner].face == (BOTTOM if face == TOP else TOP)
    # the tags that RDKit kept are real stereo: doing it again from scratch gives the same molecule
    again = set_faces(cleared(out, ring.atoms), ring, faces)
    assert inchi(again) == inchi(out)


@settings(max_examples=1000, **COMMON)
@given(ring_smiles())
def test_explicit_hydrogens_change_no_face(smiles):
    # hydrogens as atoms (AddHs, or a molfile that draws them) must give the same faces as
    # implicit ones: the implicit H is the last neighbour in RDKit's tag order, an H atom is not
    mol = Chem.MolFromSmiles(smiles)
    mh = Chem.AddHs(mol)
    rings, _ = find_rings(mol)
    rings_h, _ = find_rings(mh)
    assume(rings)
    assert [r.atoms for r in rings_h] == [r.atoms for r in rings]
    implicit = {}
    for slot in ring_slots(mol, rings[0]):
        implicit[(slot.ring_atom, slot.atom if slot.atom is not None else "H")] = slot.face
    for slot in ring_slots(mh, rings_h[0]):
        if not tagged(mol, slot.ring_atom):
            continue
        assert slot.atom is not None
        key = (slot.ring_atom, "H" if mh.GetAtomWithIdx(slot.atom).GetAtomicNum() == 1 else slot.atom)
        assert slot.face == implicit[key], (smiles, slot)


def test_explicit_hydrogens_change_no_group():
    # minimal example found while checking faces with explicit hydrogens; A(Me) = 1.74 kcal/mol
    # (Booth & Everett 1980, as in test_cli)
    plain = chairdraw.analyze("CC1CCCCC1").rings[0]
    explicit = chairdraw.analyze(Chem.AddHs(Chem.MolFromSmiles("CC1CCCCC1"))).rings[0]
    labels = [[p.label for p in r.chairs[0].positions if p.label != "H"] for r in (plain, explicit)]
    assert labels == [["Me"], ["Me"]]
    assert explicit.delta_g_kcal_mol == pytest.approx(plain.delta_g_kcal_mol)


# --- 4. known molecules ------------------------------------------------------------------------


@dataclass(frozen=True)
class Known:
    smiles: str
    cip: dict[int, str]  # atom index -> CIP label from RDKit's new labeler (the outside reference)
    patterns: tuple[tuple[str, ...], ...]  # per chair: orientations of the heavy substituents
    in_chair: dict[str, dict[int, str]] = field(default_factory=dict)  # chair name -> {atom: orientation}
    locants: dict[int, str] = field(default_factory=dict)  # atom index -> locant, numbered by hand


EQ, AX = EQUATORIAL, AXIAL
# D-glucopyranose as written below: O6 = 0, C6 = 1, C5 = 2, O5 = 3, C1 = 4, O1 = 5, C2 = 6, O2 = 7,
# C3 = 8, O3 = 9, C4 = 10, O4 = 11
GLUCOSE_LOCANTS = {3: "O5", 4: "C1", 6: "C2", 8: "C3", 10: "C4", 2: "C5"}

KNOWN = {
    # beta-D-glucopyranose: every ring substituent equatorial in 4C1 (textbook, e.g. Eliel & Wilen,
    # Stereochemistry of Organic Compounds, 1994); C1 R, C2 R, C3 S, C4 S, C5 R is beta-D
    "beta-D-glucopyranose": Known(
        "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O",
        {4: "R", 6: "R", 8: "S", 10: "S", 2: "R"},
        ((EQ,) * 5, (AX,) * 5),
        {"4C1": {5: EQ, 7: EQ, 9: EQ, 11: EQ, 1: EQ}},
        GLUCOSE_LOCANTS,
    ),
    # alpha-D-glucopyranose: the same but C1 S; in 4C1 the anomeric OH is axial, the rest
    # equatorial (textbook: alpha-D-glucose has the 1-OH axial in its 4C1 chair)
    "alpha-D-glucopyranose": Known(
        "OC[C@H]1O[C@H](O)[C@H](O)[C@@H](O)[C@@H]1O",
        {4: "S", 6: "R", 8: "S", 10: "S", 2: "R"},
        ((AX, EQ, EQ, EQ, EQ), (AX, AX, AX, AX, EQ)),
        {"4C1": {5: AX, 7: EQ, 9: EQ, 11: EQ, 1: EQ}, "1C4": {5: EQ, 7: AX, 9: AX, 11: AX, 1: AX}},
        GLUCOSE_LOCANTS,
    ),
    # (-)-menthol is (1R,2S,5R)-5-methyl-2-(propan-2-yl)cyclohexan-1-ol (PubChem CID 16666, whose
    # isomeric SMILES this is); its three substituents are all equatorial in one chair (textbook)
    "(-)-menthol": Known(
        "C[C@@H]1CC[C@H]([C@@H](C1)O)C(C)C",
        {5: "R", 4: "S", 1: "R"},
        ((EQ, EQ, EQ), (AX, AX, AX)),
    ),
    # cis-1,2-dimethylcyclohexane is the meso (1R,2S) isomer: one Me axial, one equatorial in both chairs
    "cis-1,2-dimethylcyclohexane": Known("C[C@H]1CCCC[C@H]1C", {1: "S", 6: "R"}, ((AX, EQ), (AX, EQ))),
    # trans-1,2-dimethylcyclohexane (1R,2R): diequatorial or diaxial
    "trans-1,2-dimethylcyclohexane": Known("C[C@@H]1CCCC[C@H]1C", {1: "R", 6: "R"}, ((EQ, EQ), (AX, AX))),
    # cis-1,3-dimethylcyclohexane is the meso (1R,3S) isomer: diequatorial or diaxial
    "cis-1,3-dimethylcyclohexane": Known("C[C@@H]1CCC[C@H](C)C1", {1: "R", 5: "S"}, ((EQ, EQ), (AX, AX))),
    # trans-1,3-dimethylcyclohexane (1S,3S): one axial, one equatorial in both chairs
    "trans-1,3-dimethylcyclohexane": Known("C[C@H]1CCC[C@H](C)C1", {1: "S", 5: "S"}, ((AX, EQ), (AX, EQ))),
}


@pytest.mark.parametrize("name", list(KNOWN))
def test_known_molecules(name):
    case = KNOWN[name]
    mol = Chem.MolFromSmiles(case.smiles)
    rdCIPLabeler.AssignCIPLabels(mol)
    labels = {a.GetIdx(): a.GetProp("_CIPCode") for a in mol.GetAtoms() if a.HasProp("_CIPCode")}
    assert labels == case.cip  # the SMILES is the isomer the name says

    (rr,) = chairdraw.analyze(case.smiles).rings
    patterns = sorted(tuple(sorted(p.orientation for p in c.positions if p.label != "H")) for c in rr.chairs)
    assert patterns == sorted(tuple(sorted(p)) for p in case.patterns)
    by_name = {c.name: c for c in rr.chairs}
    for name_, wanted in case.in_chair.items():
        got = {p.atom: p.orientation for p in by_name[name_].positions if p.atom in wanted}
        assert got == wanted, name_
    if case.locants:
        assert dict(zip(rr.atoms, rr.locants)) == case.locants
        # IUPAC 4C1: with the ring numbered clockwise seen from above, C4 is above the reference
        # plane and C1 below; chairdraw's top is that "above"
        at = {loc: a for a, loc in case.locants.items()}
        for chair in rr.chairs:
            up, down = chair.name.split("C")
            assert at[f"C{up}"] in chair.up_atoms and at[f"C{down}"] not in chair.up_atoms
