"""Published checks of the energy model (chairdraw.energy) through chairdraw.analyze.

Every number checked here is a published value; its source is named beside it. Tags: [C] read
in a compilation with the primary paper named, [C2] secondary compilation only,
[M] from memory (said so beside the test), "common practice" where no paper is needed.

Every analysis goes through ``run()``, which also checks that every term of every chair has a
non-empty source citation in ``to_dict()``: the "every number is sourced" promise holds for every
result these tests produce.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from rdkit import Chem
from rdkit.Chem import AllChem, rdCIPLabeler

import chairdraw
from chairdraw.energy import equilibrium

TOL = 0.01 + 1e-9  # "within 0.01 kcal/mol"; the epsilon absorbs float noise (2.21 - 2.2 > 0.01)


# --- helpers ---------------------------------------------------------------------------------


def assert_sourced(analysis: chairdraw.Analysis) -> None:
    for ring in analysis.to_dict()["rings"]:
        for chair in ring["chairs"]:
            for term in chair["terms"]:
                assert term["source"].strip(), f"term without a source: {term}"
                assert term["source_keys"], f"term without source keys: {term}"


def run(smiles: str, **kw) -> chairdraw.Analysis:
    analysis = chairdraw.analyze(smiles, **kw)
    assert_sourced(analysis)
    return analysis


def only_ring(smiles: str, **kw) -> chairdraw.RingResult:
    analysis = run(smiles, **kw)
    assert len(analysis.rings) == 1, [r.kind for r in analysis.rings]
    return analysis.rings[0]


def groups(chair: chairdraw.Chair) -> list[chairdraw.Position]:
    return [p for p in chair.positions if p.label not in ("H", "lone pair")]


def chair_with(ring: chairdraw.RingResult, label: str, orientation: str) -> chairdraw.Chair:
    found = [c for c in ring.chairs if any(p.label == label and p.orientation == orientation for p in c.positions)]
    assert len(found) == 1, f"{label} {orientation}: {len(found)} chairs"
    return found[0]


def absolute(chair: chairdraw.Chair) -> float:
    """Chair energy on a common scale: the sum of its terms (energy_kcal_mol is relative per ring)."""
    return sum(t.value for t in chair.terms)


def faces_3d(smiles: str, seed: int = 42) -> list[int]:
    """+1/-1 per ring carbon bearing exactly one heavy substituent and one H, in ring order:
    which side of the ring mean plane the substituent is on (relative to its H), from an
    RDKit ETKDG 3D embedding. Independent of chairdraw's own face perception."""
    mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
    assert AllChem.EmbedMolecule(mol, randomSeed=seed) == 0
    pos = mol.GetConformer().GetPositions()
    ring = next(r for r in mol.GetRingInfo().AtomRings() if len(r) == 6)
    centre = pos[list(ring)].mean(axis=0)
    normal = np.linalg.svd(pos[list(ring)] - centre)[2][2]
    out = []
    for idx in ring:
        exo = [n for n in mol.GetAtomWithIdx(idx).GetNeighbors() if n.GetIdx() not in ring]
        heavy = [n.GetIdx() for n in exo if n.GetAtomicNum() > 1]
        hs = [n.GetIdx() for n in exo if n.GetAtomicNum() == 1]
        if len(heavy) == 1 and len(hs) == 1:
            out.append(1 if (pos[heavy[0]] - pos[hs[0]]) @ normal > 0 else -1)
    return out


def is_cis_3d(smiles: str) -> bool:
    sides = faces_3d(smiles)
    assert len(sides) == 2, sides
    return sides[0] == sides[1]


def inchi(smiles: str) -> str:
    return Chem.MolToInchi(Chem.MolFromSmiles(smiles))


# --- 1. A-values of monosubstituted cyclohexanes ---------------------------------------------------
#
# (id, SMILES, solvent, expected: number (within 0.01) or (low, high) where the compilations give a
# range, source)
A_VALUES = [
    ("F", "FC1CCCCC1", "aprotic", 0.25, "Reich [C]: Jensen 1969 0.28, Schneider 1978 0.36"),
    ("Cl", "ClC1CCCCC1", "aprotic", 0.5, "Reich [C]: Jensen 1969 0.53, Schneider 1978 0.51"),
    ("Br", "BrC1CCCCC1", "aprotic", 0.45, "Reich [C]: Jensen 1969, Schneider 1978"),
    ("I", "IC1CCCCC1", "aprotic", 0.45, "Reich [C]: Jensen 1969 0.47, Schneider 1978 0.49"),
    ("OH-aprotic", "OC1CCCCC1", "aprotic", 0.6, "E&W 1994 Table 11.7 [C2]: 0.6 in cyclohexane"),
    ("OH-protic", "OC1CCCCC1", "protic", 1.0, "E&W 1994 [C2] 1.0 in isopropanol; Schneider 1978 [C]"),
    ("OMe", "COC1CCCCC1", "aprotic", 0.6, "Reich [C] 0.60 (Schneider 0.75); E&W 0.6"),
    ("OAc", "CC(=O)OC1CCCCC1", "aprotic", 0.7, "Reich [C]: Jensen 1969 0.71"),
    ("OSiMe3", "C[Si](C)(C)OC1CCCCC1", "aprotic", (0.74, 1.31), "Schneider 1978 0.74, Eliel & Satici 1994 1.31 [C]"),
    ("SH", "SC1CCCCC1", "aprotic", 1.2, "Jensen 1969 1.17, Schneider 1978 1.22 [C]"),
    ("SMe", "CSC1CCCCC1", "aprotic", 1.0, "Reich [C]"),
    ("NH2-aprotic", "NC1CCCCC1", "aprotic", 1.2, "E&W 1994 [C] 1.2 in toluene; Schneider 1978 1.23"),
    ("NH2-protic", "NC1CCCCC1", "protic", 1.7, "E&W 1994 [C] 1.7 in MeOCH2CH2OH/water"),
    ("NMe2", "CN(C)C1CCCCC1", "aprotic", 2.1, "Reich [C]"),
    ("NH3+", "[NH3+]C1CCCCC1", "aprotic", 1.9, "Reich [C]"),
    ("NO2", "[O-][N+](=O)C1CCCCC1", "aprotic", 1.1, "Jensen 1969 1.05, Schneider 1978 1.13, E&W 1.1 [C]"),
    ("CN", "N#CC1CCCCC1", "aprotic", 0.2, "Jensen 1969, Schneider 1978 0.21, E&W 0.2 [C]"),
    ("N3", "[N-]=[N+]=NC1CCCCC1", "aprotic", 0.6, "Schneider 1978 0.62 [C]"),
    ("C#CH", "C#CC1CCCCC1", "aprotic", 0.45, "Jensen 1969 0.41, Schneider 1978 0.52 [C]"),
    ("CH=CH2", "C=CC1CCCCC1", "aprotic", (1.5, 1.7), "Eliel & Manoharan 1981 1.35/1.68; E&W 1.5 [C]"),
    ("CHO", "O=CC1CCCCC1", "aprotic", 0.7, "E&W 0.7; Reich 0.8 [C]"),
    ("COMe", "CC(=O)C1CCCCC1", "aprotic", 1.2, "E&W 1.2; Reich 1.17 [C]"),
    ("CO2H", "OC(=O)C1CCCCC1", "aprotic", 1.4, "E&W 1.4; Reich 1.35 [C]"),
    ("CO2Me", "COC(=O)C1CCCCC1", "aprotic", 1.3, "Jensen 1969 1.27-1.31 [C]"),
    ("CO2Et", "CCOC(=O)C1CCCCC1", "aprotic", 1.2, "E&W 1.2 [C]"),
    ("CONH2", "NC(=O)C1CCCCC1", "aprotic", 1.3, "from memory [M, low confidence]: by analogy with CO2R"),
    ("Me", "CC1CCCCC1", "aprotic", 1.74, "Booth & Everett 1980, -dG(300 K) [C]; Reich 1.70"),
    ("Et", "CCC1CCCCC1", "aprotic", 1.79, "Booth & Everett 1980, -dG(300 K) [C]"),
    ("iPr", "CC(C)C1CCCCC1", "aprotic", 2.2, "E&W 2.2; Booth & Everett 1980 2.21 [C]"),
    (
        "tBu",
        "CC(C)(C)C1CCCCC1",
        "aprotic",
        (4.7, 5.0),
        "4.9 (Manoharan & Eliel 1984, from memory); E&W 4.8, Reich >4.5 [C]",
    ),
    ("CH2OH", "OCC1CCCCC1", "aprotic", 1.8, "from memory [M, low confidence]: not found"),
    ("CF3", "FC(F)(F)C1CCCCC1", "aprotic", 2.4, "Carcenac et al., dynamic 19F NMR [C/C2]"),
    ("CHF2", "FC(F)C1CCCCC1", "aprotic", 1.85, "Carcenac et al. [C2]"),
    ("Ph", "c1ccc(cc1)C1CCCCC1", "aprotic", (2.8, 3.0), "E&W 2.8, Reich 3.0 [C]"),
    ("SiMe3", "C[Si](C)(C)C1CCCCC1", "aprotic", 2.5, "Kitching, Olszowy, Drew & Adcock 1982 [C]"),
    ("GeMe3", "C[Ge](C)(C)C1CCCCC1", "aprotic", 2.1, "Kitching et al. 1982 [C]"),
    ("SnMe3", "C[Sn](C)(C)C1CCCCC1", "aprotic", 1.1, "Kitching et al. 1982 [C]"),
    ("HgBr", "Br[Hg]C1CCCCC1", "aprotic", 0.0, "Reich [C]"),
]


def _substituent_label(ring: chairdraw.RingResult) -> str:
    labels = {p.label for p in groups(ring.chairs[0])}
    assert len(labels) == 1, labels
    return labels.pop()


@pytest.mark.parametrize(
    "smiles, solvent, expected, source",
    [pytest.param(*row[1:], id=f"{row[0]}: {row[4]}") for row in A_VALUES],
)
def test_a_value_table(smiles, solvent, expected, source):
    ring = only_ring(smiles, solvent=solvent)
    assert ring.kind == "cyclohexane"
    if isinstance(expected, tuple):
        low, high = expected
        assert low - 1e-9 <= ring.delta_g_kcal_mol <= high + 1e-9, source
    else:
        assert ring.delta_g_kcal_mol == pytest.approx(expected, abs=TOL), source
    label = _substituent_label(ring)
    axial = chair_with(ring, label, "axial")
    a_terms = [t for t in axial.to_dict()["terms"] if t["kind"] == "a-value"]
    assert len(a_terms) == 1
    assert a_terms[0]["source"].strip()
    assert not a_terms[0]["estimated"]
    equatorial = chair_with(ring, label, "equatorial")
    assert equatorial.terms == ()
    if expected != 0.0:
        assert equatorial.favored and not axial.favored


def test_cyclohexyl_a_value():
    # cyclohexyl 2.2: E&W 2.2, Reich 2.15 [C]; bicyclohexyl has two identical rings
    analysis = run("C1CCC(CC1)C1CCCCC1")
    assert len(analysis.rings) == 2
    for ring in analysis.rings:
        assert ring.delta_g_kcal_mol == pytest.approx(2.2, abs=TOL)


def test_a_value_tbu_within_published_range():
    # tBu: 4.8 (Eliel & Wilen 1994 [C2]); Reich gives > 4.5; 4.9 is also quoted (Manoharan & Eliel
    # 1984 [M]); "use >= 4.7" (common practice). The table keeps the compiled 4.8: a value seen in a
    # compilation wins over one from memory.
    ring = only_ring("CC(C)(C)C1CCCCC1")
    assert 4.7 <= ring.delta_g_kcal_mol <= 4.9
    assert ring.delta_g_kcal_mol == pytest.approx(4.8, abs=TOL)


def test_a_value_deuterium():
    # D 0.008 (Tetrahedron Lett. 1989, 30, 1059, via Reich [C]); an explicit [2H] is a group of its own
    ring = only_ring("[2H]C1CCCCC1")
    axial = [c for c in ring.chairs if c.terms]
    assert len(axial) == 1
    assert axial[0].terms[0].sources == ("deuterium1989",)
    assert ring.delta_g_kcal_mol == pytest.approx(0.008, abs=1e-4)


# --- methylcyclohexane and tert-butylcyclohexane ---------------------------------------------------


def test_methylcyclohexane_95_percent_equatorial():
    # A = 1.74 (Booth & Everett 1980 [C]) gives K ~ 19, 95 % equatorial at 298 K
    ring = only_ring("CC1CCCCC1")
    fav = ring.favored
    assert fav is not None
    assert [p.orientation for p in groups(fav)] == ["equatorial"]
    assert 0.94 <= fav.population <= 0.96
    assert fav.population == pytest.approx(1 / (1 + math.exp(-1.74 / (equilibrium.R_KCAL * 298.15))), abs=1e-6)


def test_methylcyclohexane_more_equatorial_when_cold():
    # Boltzmann (common practice): same dG, lower T -> larger majority
    warm = only_ring("CC1CCCCC1").favored
    cold = only_ring("CC1CCCCC1", temperature=200).favored
    assert [p.orientation for p in groups(cold)] == ["equatorial"]
    assert cold.population > warm.population
    assert cold.population == pytest.approx(1 / (1 + math.exp(-1.74 / (equilibrium.R_KCAL * 200))), abs=1e-6)


def test_tert_butylcyclohexane_locked():
    # 4-tert-butyl locking: A(tBu) >= 4.7 (E&W 1994, Reich [C]), so > 99.9 % equatorial (fact of the trade)
    ring = only_ring("CC(C)(C)C1CCCCC1")
    fav = ring.favored
    assert [p.orientation for p in groups(fav)] == ["equatorial"]
    assert fav.population > 0.999


# --- dimethylcyclohexanes -------------------------------------------------------------------------
#
# Each isomer: (SMILES used, a second independent spelling, cis?). The SMILES are hand-written; the
# test cross-checks them twice: standard InChI against the second spelling, and cis/trans read from
# an RDKit 3D embedding (not from chairdraw's face perception).
DIMETHYL = {
    "cis-1,2": ("C[C@H]1CCCC[C@H]1C", "C1CC[C@@H](C)[C@@H](C)C1", True),
    "trans-1,2": (
        "C[C@H]1CCCC[C@@H]1C",
        "C1CC[C@H](C)[C@@H](C)C1",
        False,
    ),  # chiral: one enantiomer, same in both spellings
    "cis-1,3": ("C[C@H]1CCC[C@@H](C)C1", "C1[C@H](C)CCC[C@@H]1C", True),
    "trans-1,3": ("C[C@H]1CCC[C@H](C)C1", "C[C@@H]1C[C@@H](C)CCC1", False),
    "cis-1,4": ("C[C@H]1CC[C@@H](C)CC1", "C1C[C@H](C)CC[C@@H]1C", True),
    "trans-1,4": ("C[C@H]1CC[C@H](C)CC1", "C1C[C@@H](C)CC[C@@H]1C", False),
}


@pytest.mark.parametrize("name", list(DIMETHYL))
def test_dimethyl_smiles_are_the_named_isomer(name):
    smiles, other, cis = DIMETHYL[name]
    assert inchi(smiles) == inchi(other), "the two spellings must be one compound"
    assert inchi(smiles) != inchi(DIMETHYL[_partner(name)][0]), "cis and trans must differ"
    assert is_cis_3d(smiles) is cis
    assert is_cis_3d(other) is cis


def _partner(name: str) -> str:
    kind, where = name.split("-", 1)
    return ("trans" if kind == "cis" else "cis") + "-" + where


@pytest.mark.parametrize("name", ["cis-1,2", "trans-1,3", "cis-1,4"])
def test_dimethyl_degenerate(name):
    # ae <-> ea, degenerate, dG 0 (Yale chem220 teaching table [C2])
    ring = only_ring(DIMETHYL[name][0])
    assert ring.degenerate
    assert ring.delta_g_kcal_mol < 0.05
    assert not ring.chairs[0].favored and not ring.chairs[1].favored
    assert ring.favored is None
    for chair in ring.chairs:
        assert sorted(p.orientation for p in groups(chair)) == ["axial", "equatorial"]


@pytest.mark.parametrize(
    "name, low, high, source",
    [
        ("trans-1,2", 2.5, 2.8, "ee favoured by ~2.6-2.7 (derived [C2]); prep-book 2.8 [M]"),
        ("cis-1,3", 5.3, 5.6, "2 x 0.87 + 3.7 (Allinger & Miller 1961 via problem set [C2]); ~5.5 [M]"),
        ("trans-1,4", 3.4, 3.7, "2 x A(Me), Yale [C2]"),
    ],
)
def test_dimethyl_diequatorial(name, low, high, source):
    ring = only_ring(DIMETHYL[name][0])
    assert not ring.degenerate
    assert low <= ring.delta_g_kcal_mol <= high, source
    fav = ring.favored
    assert [p.orientation for p in groups(fav)] == ["equatorial", "equatorial"]
    other = next(c for c in ring.chairs if c is not fav)
    assert [p.orientation for p in groups(other)] == ["axial", "axial"]


@pytest.mark.parametrize(
    "stable, unstable, low, high",
    [
        # trans-1,4 more stable than cis by ~1.9 (Beckett, Pitzer & Spitzer 1947, from memory [M])
        ("trans-1,4", "cis-1,4", 1.7, 1.9),
        # trans-1,2 by ~1.9 and cis-1,3 by ~1.96 (same paper, from memory [M]); the additive model
        # gives one A(Me) = 1.74 for both, so only a loose window
        ("trans-1,2", "cis-1,2", 1.5, 2.1),
        ("cis-1,3", "trans-1,3", 1.5, 2.1),
    ],
)
def test_dimethyl_configurational_energy(stable, unstable, low, high):
    best = {name: min(absolute(c) for c in only_ring(DIMETHYL[name][0]).chairs) for name in (stable, unstable)}
    assert low <= best[unstable] - best[stable] <= high


# --- glucose -----------------------------------------------------------------------------------------
#
# Cross-checks of the hand-written SMILES: a second spelling (PubChem style) must give the same
# standard InChI, the InChIKeys are those of beta-/alpha-D-glucopyranose (from memory [M]), and the
# CIP labels match the IUPAC names (2R,3R,4S,5S,6R) / (2S,3R,4S,5S,6R)-6-(hydroxymethyl)oxane-2,3,4,5-tetrol.
BETA_GLC = "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O"
ALPHA_GLC = "OC[C@H]1O[C@H](O)[C@H](O)[C@@H](O)[C@@H]1O"
GLC_CHECKS = {
    BETA_GLC: ("C([C@@H]1[C@H]([C@@H]([C@H]([C@@H](O1)O)O)O)O)O", "WQZGKKKJIJFFOK-VFUOTHLCSA-N", "R"),
    ALPHA_GLC: ("C([C@@H]1[C@H]([C@@H]([C@H]([C@H](O1)O)O)O)O)O", "WQZGKKKJIJFFOK-DVKNGEFBSA-N", "S"),
}


@pytest.mark.parametrize("smiles", [BETA_GLC, ALPHA_GLC], ids=["beta", "alpha"])
def test_glucose_smiles_are_the_named_anomer(smiles):
    other, key, anomeric = GLC_CHECKS[smiles]
    mol = Chem.MolFromSmiles(smiles)
    assert Chem.MolToInchi(mol) == inchi(other)
    assert Chem.MolToInchiKey(mol) == key
    rdCIPLabeler.AssignCIPLabels(mol)
    # oxane numbering: C2 (anomeric, atom 4), C3 (atom 6), C4 (atom 8), C5 (atom 10), C6 (atom 2)
    labels = {a.GetIdx(): a.GetProp("_CIPCode") for a in mol.GetAtoms() if a.HasProp("_CIPCode")}
    assert [labels[i] for i in (4, 6, 8, 10, 2)] == [anomeric, "R", "S", "S", "R"]


@pytest.mark.parametrize("solvent", ["aprotic", "protic"])
def test_beta_glucose_all_equatorial_4c1(solvent):
    # beta-D-Glcp has every substituent equatorial in 4C1 (quimicaorganica; textbooks [C2])
    ring = only_ring(BETA_GLC, solvent=solvent)
    assert ring.kind == "pyranose"
    c41 = next(c for c in ring.chairs if c.name == "4C1")
    assert len(groups(c41)) == 5
    assert all(p.orientation == "equatorial" for p in groups(c41))
    assert c41.favored


@pytest.mark.parametrize("solvent", ["aprotic", "protic"])
def test_alpha_glucose_favours_4c1(solvent):
    # alpha-D-Glcp: axial OH-1 in 4C1, still 4C1 (textbook; Angyal 1969 [C] via Encycl. Phys. Sci. Technol.)
    ring = only_ring(ALPHA_GLC, solvent=solvent)
    c41 = next(c for c in ring.chairs if c.name == "4C1")
    assert c41.favored
    assert [p.locant for p in c41.axial()] == ["C1"]


def test_glucose_anomer_ratio_in_water():
    # alpha:beta = 36:64 in water (Carey, Organic Chemistry 5th ed.; quimicaorganica [C2]); window 0.2-0.45
    energies = []
    for smiles in (ALPHA_GLC, BETA_GLC):
        ring = only_ring(smiles, solvent="protic")
        energies.append(absolute(next(c for c in ring.chairs if c.name == "4C1")))
    alpha_fraction = equilibrium.populations(energies, 298.15)[0]
    assert 0.2 <= alpha_fraction <= 0.45


# Angyal's method (Encycl. Phys. Sci. Technol. 3rd ed. 2001, "Carbohydrates", Table V [C]): sum
# the factors present in each chair. Factors (kcal/mol): 1,3-diaxial O/O 1.5, O/C 2.5, O/H 0.45,
# C/H 0.9; gauche O/O 0.35, C/O 0.45; an equatorial O1 costs 0.55 more beside an equatorial O2 and
# 1.0 more beside an axial one. The sums below are done by hand, interaction by interaction.
BETA_L_IDO = "OC[C@@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O"  # C5 epimer of beta-D-Glcp
ALPHA_MAN = "OC[C@H]1O[C@H](O)[C@@H](O)[C@@H](O)[C@@H]1O"
BETA_MAN = "OC[C@H]1O[C@@H](O)[C@@H](O)[C@@H](O)[C@@H]1O"


def test_beta_glucose_chairs_by_angyals_factors():
    # 4C1, all equatorial: gauche O1/O2, O2/O3, O3/O4 3 x 0.35, O4/C6 0.45, equatorial O1 0.55 = 2.05
    # 1C4, all axial: O1/O3 1.5, O2/O4 1.5, O1/C6 2.5, O3/C6 2.5 = 8.0 (O2 and O4 have the ring O
    # as their other partner, O1 and O3 have C6); no gauche (axial neighbours are anti)
    ring = only_ring(BETA_GLC, solvent="protic")
    assert ring.favored.name == "4C1"
    assert ring.delta_g_kcal_mol == pytest.approx(8.0 - 2.05, abs=TOL)


def test_c5_epimer_of_glucose_by_angyals_factors():
    # 4C1 (C6 axial): C6/H1, C6/H3 2 x 0.9, gauche 3 x 0.35 + O4/C6 0.45, equatorial O1 0.55 = 3.85
    # 1C4 (O1-O4 axial): O1/O3 1.5, O2/O4 1.5, O1/H5 0.45, O3/H5 0.45, gauche O4/C6 0.45 = 4.35
    ring = only_ring(BETA_L_IDO, solvent="protic")
    assert ring.favored.name == "4C1"
    assert ring.delta_g_kcal_mol == pytest.approx(4.35 - 3.85, abs=TOL)


def test_mannose_anomer_ratio_in_water():
    # D-mannose in water is about 2:1 alpha:beta (65.5:34.5, Angyal 1969, from memory [M]; window
    # 0.55-0.80). By Angyal's factors (both 4C1, O2 axial): alpha has O1/H3, O1/H5 0.9; beta has
    # gauche O1/O2 0.35 and the equatorial-O1-beside-axial-O2 1.0; the rest is common to both
    energies = []
    for smiles in (ALPHA_MAN, BETA_MAN):
        ring = only_ring(smiles, solvent="protic")
        assert ring.favored.name == "4C1"
        energies.append(absolute(ring.favored))
    assert energies[1] - energies[0] == pytest.approx((0.35 + 1.0) - 0.9, abs=TOL)
    alpha_fraction = equilibrium.populations(energies, 298.15)[0]
    assert 0.55 <= alpha_fraction <= 0.80


# --- non-additivity and twist-boat warnings -------------------------------------------------------------


def test_geminal_methyl_phenyl_prefers_axial_phenyl():
    # 1-methyl-1-phenylcyclohexane prefers axial Ph by 0.32 kcal/mol although A(Ph) > A(Me):
    # Carey & Sundberg, Adv. Org. Chem. A, 5th ed., Ch. 2, Problem 5 [C2] (Eliel & Manoharan 1981 [M]).
    # The measured pair replaces the additive A(Ph) - A(Me) = +1.06 (geminal.txt)
    ring = only_ring("CC1(CCCCC1)c1ccccc1")
    assert any(p.label == "Ph" and p.orientation == "axial" for p in ring.favored.positions)
    assert ring.delta_g_kcal_mol == pytest.approx(0.32, abs=1e-6)
    geminal = [t for c in ring.chairs for t in c.terms if t.kind == "geminal"]
    assert len(geminal) == 1 and geminal[0].sources == ("careysundberg",)
    assert any("measured pair value" in w for w in ring.warnings)


def test_unmeasured_geminal_pair_warns_not_additive():
    # 1-methyl-1-ethyl: no measured pair in geminal.txt, so the additive sum is used and flagged;
    # A(Et) 1.79 and A(Me) 1.74 at 300 K (Booth & Everett 1980 [C])
    ring = only_ring("CCC1(C)CCCCC1")
    assert not any(t.kind == "geminal" for c in ring.chairs for t in c.terms)
    assert any("not additive" in w for w in ring.warnings)
    assert ring.delta_g_kcal_mol == pytest.approx(1.79 - 1.74, abs=TOL)


CIS_14_TBU = "CC(C)(C)[C@H]1CC[C@@H](C(C)(C)C)CC1"
TRANS_14_TBU = "CC(C)(C)[C@H]1CC[C@H](C(C)(C)C)CC1"


def test_di_tert_butyl_smiles_cis_trans():
    # 3D cross-check of the hand-written SMILES; second spellings compared by InChI
    assert is_cis_3d(CIS_14_TBU) and not is_cis_3d(TRANS_14_TBU)
    assert inchi(CIS_14_TBU) == inchi("C1C[C@H](C(C)(C)C)CC[C@@H]1C(C)(C)C")
    assert inchi(TRANS_14_TBU) == inchi("C1C[C@@H](C(C)(C)C)CC[C@@H]1C(C)(C)C")


def test_cis_1_4_di_tert_butyl_twist_boat_warning():
    # mostly twist-boat (Gill et al., J. Org. Chem. 2005, 70 (26) [C]): the chair model must warn
    ring = only_ring(CIS_14_TBU)
    assert any("twist-boat" in w for w in ring.warnings)
    # and the trans isomer (diequatorial, unstrained) must not
    assert not any("twist-boat" in w for w in only_ring(TRANS_14_TBU).warnings)


SYN_13_TBU = "CC(C)(C)[C@H]1CCC[C@@H](C(C)(C)C)C1"


def test_syn_diaxial_pair_never_makes_two_groups_cheaper_than_apart():
    # the Me/Me pair value (3.7, Allinger & Miller 1961) is smaller than the two X/H parts (halves) of two
    # t-Bu A-values (4.8 each, Eliel & Wilen 1994): the pair must add nothing rather than subtract
    assert is_cis_3d(SYN_13_TBU)
    ring = only_ring(SYN_13_TBU)
    diaxial = next(c for c in ring.chairs if not c.favored)
    pair = [t for t in diaxial.terms if t.kind == "syn-diaxial"]
    assert len(pair) == 1 and pair[0].value == 0.0
    assert ring.delta_g_kcal_mol >= 2 * 4.8 - TOL
    assert any("smaller than the two X/H interactions" in w for w in ring.warnings)


def test_dioxane_diaxial_methyl_pairs_use_the_dioxane_values():
    # 1,3-dioxanes: 2,4-diaxial Me/Me 4.7 and 4,6-diaxial Me/Me 5.0-5.2 kcal/mol (19.5 and
    # 21.0-21.6 kJ/mol; Pihlaja, Kivela, Vainiotalo & Steele, Molecules 2020, 25, 2762 [C]), net
    # of A(2-Me) 3.98 and A(4-Me) 2.9 (Eliel & Knoeber 1968 [M])
    cis_24 = "C[C@@H]1CCO[C@H](C)O1"
    cis_46 = "C[C@@H]1C[C@H](C)OCO1"
    assert is_cis_3d(cis_24) and is_cis_3d(cis_46)
    for smiles, gross, a, b in ((cis_24, 4.7, 3.98, 2.9), (cis_46, 5.1, 2.9, 2.9)):
        ring = only_ring(smiles)
        terms = [t for c in ring.chairs for t in c.terms if t.kind == "syn-diaxial"]
        assert len(terms) == 1 and terms[0].sources == ("pihlaja2020",)
        assert terms[0].value == pytest.approx(gross - a / 2 - b / 2, abs=TOL)
    # a cyclohexane keeps the general Me/Me value (Allinger & Miller 1961)
    ring = only_ring("C[C@H]1CCC[C@@H](C)C1")
    terms = [t for c in ring.chairs for t in c.terms if t.kind == "syn-diaxial"]
    assert len(terms) == 1 and terms[0].sources == ("allinger1961",)


def test_acetonide_twist_boat_warning_follows_the_diol_relationship():
    # 1,3-diol acetonides: the syn isomer (cis-4,6) is a chair with one acetonide Me axial; the anti
    # isomer (trans-4,6) puts a 4/6-Me syn-axial to the axial 2-Me in both chairs and is a twist-boat
    # (Rychnovsky, Rogers & Yang, J. Org. Chem. 1993, 58, 3511, from memory; common practice in
    # assigning 1,3-diols). An axial 2-Me alone (3.98) must not trigger the warning.
    syn = "C[C@@H]1C[C@H](C)OC(C)(C)O1"
    anti = "C[C@@H]1C[C@@H](C)OC(C)(C)O1"
    assert is_cis_3d(syn) and not is_cis_3d(anti)
    assert not any("twist-boat" in w for w in only_ring(syn).warnings)
    assert any("twist-boat" in w for w in only_ring(anti).warnings)


@pytest.mark.parametrize("smiles", ["BrC1(Cl)CCCCC1", "COC1CCCCO1", "CC1CCCCC1", "C[C@H]1CCCC[C@H]1C"])
def test_degenerate_exactly_when_the_reported_delta_g_is_below_the_cutoff(smiles):
    # 0.05 kcal/mol (common practice): judged on the value the report shows, not on float noise
    for solvent in ("aprotic", "protic"):
        ring = run(smiles, solvent=solvent).to_dict()["rings"][0]
        assert ring["degenerate"] == (ring["delta_g_kcal_mol"] < equilibrium.DEGENERATE_KCAL)


# --- anomeric effect and heterocycles -------------------------------------------------------------------


def test_2_methoxyoxane_axial():
    # anomeric effect: 27:73 eq:ax at room temperature (quimicaorganica [C2]); Praly & Lemieux 1987 [C]
    ring = only_ring("COC1CCCCO1")
    assert ring.kind == "oxane"
    fav = ring.favored
    assert [(p.label, p.orientation) for p in groups(fav)] == [("OMe", "axial")]
    assert 0.65 <= fav.population <= 0.80
    assert any(t.kind == "anomeric" for t in fav.terms)


@pytest.mark.parametrize(
    "smiles, locant, expected",
    [
        ("CC1CCCCO1", "2", 2.86),
        ("CC1CCCOC1", "3", 1.43),
        ("CC1CCOCC1", "4", 1.95),
    ],
    ids=["2-Me", "3-Me", "4-Me"],
)
def test_methyloxanes(smiles, locant, expected):
    # Eliel, Hargrave, Pietrusiewicz & Manoharan, JACS 1982, 104, 3635 — values from memory [M]
    ring = only_ring(smiles)
    assert ring.kind == "oxane"
    assert [p.locant for p in groups(ring.chairs[0])] == [locant]
    assert ring.delta_g_kcal_mol == pytest.approx(expected, abs=TOL)
    assert [p.orientation for p in groups(ring.favored)] == ["equatorial"]
    axial = chair_with(ring, "Me", "axial")
    assert axial.terms[0].sources == ("eliel1982",)


def test_n_methylpiperidine_methyl_equatorial_in_both_chairs():
    # N-Me equatorial (~2.7 in solution, from memory [M]); nitrogen inversion lets it stay equatorial
    ring = only_ring("CN1CCCCC1")
    assert ring.kind == "piperidine"
    for chair in ring.chairs:
        me = [p for p in chair.positions if p.label == "Me"]
        assert len(me) == 1
        assert me[0].orientation == "equatorial"
        assert me[0].inverting
        assert me[0].locant == "1"


# --- sources and estimates ------------------------------------------------------------------------------

ALL_SMILES = (
    [row[1] for row in A_VALUES]
    + [s for s, _, _ in DIMETHYL.values()]
    + [BETA_GLC, ALPHA_GLC, CIS_14_TBU, TRANS_14_TBU, "CC1(CCCCC1)c1ccccc1", "COC1CCCCO1"]
    + ["CC1CCCCO1", "CC1CCCOC1", "CC1CCOCC1", "CN1CCCCC1", "CCCCC1CCCCC1", "C1CCC(CC1)C1CCCCC1"]
)


@pytest.mark.parametrize("solvent", ["aprotic", "protic"])
def test_every_term_has_a_source(solvent):
    for smiles in ALL_SMILES:
        analysis = chairdraw.analyze(smiles, solvent=solvent)
        assert analysis.rings, smiles
        assert_sourced(analysis)


def test_unknown_group_is_estimated_and_named():
    # n-butyl is not in avalues.txt: borrowed from its class (primary alkyl -> Et), flagged
    ring = only_ring("CCCCC1CCCCC1")
    axial = [p for c in ring.chairs for p in groups(c) if p.orientation == "axial"]
    assert len(axial) == 1 and axial[0].estimated
    chair = next(c for c in ring.chairs if c.terms)
    assert chair.terms[0].estimated
    assert chair.to_dict()["terms"][0]["estimated"] is True
    assert any("estimated" in w and "primary alkyl" in w for w in ring.warnings), ring.warnings


def test_values_from_memory_are_warned():
    # CH2OH (not found in the compilations, [M]) carries a "from memory" warning
    ring = only_ring("OCC1CCCCC1")
    assert any("from memory" in w for w in ring.warnings)


@pytest.mark.parametrize("smiles", ["CC1CCCCO1", "CC1OCCCO1"], ids=["2-methyloxane", "2-methyl-1,3-dioxane"])
def test_memory_status_rows_are_warned(smiles):
    # the methyloxane (Eliel 1982) and methyl-1,3-dioxane (Eliel & Knoeber 1968) values are from memory [M]
    ring = only_ring(smiles)
    assert any("from memory" in w for w in ring.warnings), ring.warnings


def test_aqueous_pair_values_are_marked_outside_water():
    # Angyal's interaction values were measured in water (Encycl. Phys. Sci. Technol. 3rd ed., 2001,
    # "Carbohydrates", Table V [C]); in an aprotic solvent the term says so, in protic it does not
    beta_glucose = "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O"
    for solvent, marked in (("aprotic", True), ("protic", False)):
        ring = only_ring(beta_glucose, solvent=solvent)
        gauche = [t for c in ring.chairs for t in c.terms if t.kind == "gauche" and t.sources == ("angyal",)]
        assert gauche, solvent
        assert all(("measured in water" in t.name) == marked for t in gauche), solvent


def test_geminal_pair_term_in_json_validates():
    import jsonschema

    from chairdraw.schema import load

    data = run("CC1(CCCCC1)c1ccccc1").to_dict()
    jsonschema.validate(data, load())
    kinds = {t["kind"] for c in data["rings"][0]["chairs"] for t in c["terms"]}
    assert "geminal" in kinds


def test_temperature_far_from_room_temperature_is_noted():
    # A-values are free energies near 298 K; their entropy parts (e.g. iPr, Booth & Everett 1980)
    # are not modelled, so a run at 200 K says that the values were used unchanged
    assert any("used unchanged" in n for n in run("CC1CCCCC1", temperature=200).notes)
    assert not any("used unchanged" in n for n in run("CC1CCCCC1", temperature=310).notes)


def test_vicinal_pair_without_a_published_gauche_value_is_named():
    # gauche Me/Me 0.9 (E&W-derived table [C2]) and O/O 0.35 (Angyal [C]) are tabulated; Me/NH2 and
    # Cl/Cl are not: their gauche interaction is left out and the report must say so
    assert any("no published gauche value for NH2/Me" in w for w in only_ring("C[C@H]1CCCC[C@@H]1N").warnings)
    assert any("no published gauche value for Cl/Cl" in w for w in only_ring("Cl[C@H]1CCCC[C@@H]1Cl").warnings)
    assert not any("gauche value" in w for w in only_ring("C[C@H]1CCCC[C@@H]1C").warnings)


def test_geminal_pair_of_equal_groups_is_not_flagged():
    # 1,1-dimethylcyclohexane: one Me is axial in each chair, so the pair's cost cancels in the
    # chair equilibrium (the chairs are identical: common practice); no non-additivity warning
    ring = only_ring("CC1(C)CCCCC1")
    assert ring.degenerate
    assert not any("geminal" in w for w in ring.warnings)


@pytest.mark.parametrize("temperature", ["abc", None, 10**400, 0, -3, float("nan"), 1e-322])
def test_bad_temperatures_are_usage_errors(temperature):
    with pytest.raises(chairdraw.UsageError):
        chairdraw.analyze("CC1CCCCC1", temperature=temperature)


def test_dative_bond_in_a_substituent_is_cut_by_rdkit_not_a_crash():
    # an amine-borane on the ring: the group text written from the graph cannot be read back by
    # RDKit, so the group is cut off with RDKit's FragmentOnBonds instead (and estimated)
    ring = only_ring("N->BC1CCCCC1")
    group = next(p for p in ring.chairs[0].positions if p.label not in ("H",))
    assert group.estimated


def test_class_estimate_states_the_value_it_uses():
    # a CH2OMe estimated by class takes its representative's general value, and says which
    import re

    for solvent in ("aprotic", "protic"):
        ring = only_ring("COC[C@@H]1CCCO[C@@H]1C", solvent=solvent)
        said = [w for w in ring.warnings if "estimated as" in w]
        assert said
        value = float(re.search(r"([0-9.]+) kcal/mol\)", said[0]).group(1))
        used = [t.value for c in ring.chairs for t in c.terms if t.kind == "a-value" and t.estimated]
        assert used and all(v == pytest.approx(value) for v in used)


def test_geminal_groups_with_the_same_formula_but_different_structure_are_flagged():
    # CH2CH2OH and CH2OMe share the formula label C2H5O but are different groups
    ring = only_ring("OCCC1(COC)CCCCC1")
    assert any("not additive" in w for w in ring.warnings)


def test_no_gauche_warning_for_hydrogen_isotopes_or_n_h():
    for smiles in ("C[C@@H]1CCCCN1", "[2H][C@@H]1CCCC[C@H]1C"):
        assert not any("gauche value" in w for w in only_ring(smiles).warnings)


def test_large_geminal_groups_with_the_same_formula_are_still_flagged():
    # n-C20H41 and a branched C20H41 are named by formula only (too large for the table) but take
    # different class values: the pair is not two equal groups
    ring = only_ring("C" * 20 + "C1(C(C)" + "C" * 18 + ")CCCCC1")
    assert any("not additive" in w for w in ring.warnings)


def test_cis_2_methyl_5_tert_butyl_1_3_dioxane_puts_tbu_axial():
    """The classic 1,3-dioxane case (Eliel and co-workers; values from memory, see avalues.txt):
    an axial 5-group has ring-O lone pairs, not H atoms, syn to it, so 5-tBu costs only about
    1.4 kcal/mol and the 2-Me (3.98) stays equatorial, putting tBu axial in the cis isomer."""
    result = chairdraw.analyze("C[C@H]1OC[C@@H](C(C)(C)C)CO1")
    ring = result.rings[0]
    faces = {p.label: p.face for p in ring.chairs[0].positions if p.label in ("Me", "tBu")}
    assert faces["Me"] == faces["tBu"]  # cis
    favoured = {p.label: p.orientation for p in ring.favored.positions if p.label in ("Me", "tBu")}
    assert favoured == {"Me": "equatorial", "tBu": "axial"}
    assert 2.0 < ring.delta_g_kcal_mol < 3.2  # 3.98 - 1.4 = 2.6
    assert any("from memory" in w and "tBu" in w for w in ring.warnings)
