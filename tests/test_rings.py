"""Ring perception (chairdraw.rings) through chairdraw.analyze: which rings are accepted, how they
are named and numbered, and why the others are refused.

Numbering rules checked are the IUPAC lowest-locant habits (heteroatoms first, O before N, then the
C=O carbon, then the carbon bearing OH/NH2, then substituents) and carbohydrate numbering for
pyranoses (IUPAC 2-Carb-7, Pure Appl. Chem. 1996, 68, 1919): common practice, no energy values.
"""

from __future__ import annotations

import pytest
from rdkit import Chem

import chairdraw


def rings_of(smiles: str) -> chairdraw.Analysis:
    return chairdraw.analyze(smiles)


def only_ring(smiles: str) -> chairdraw.RingResult:
    analysis = rings_of(smiles)
    assert len(analysis.rings) == 1, [r.kind for r in analysis.rings]
    return analysis.rings[0]


def mol(smiles: str) -> Chem.Mol:
    return Chem.MolFromSmiles(smiles)


def element_at(smiles: str, ring: chairdraw.RingResult, locant: str) -> str:
    return mol(smiles).GetAtomWithIdx(ring.atoms[ring.locants.index(locant)]).GetSymbol()


def substituent_locants(ring: chairdraw.RingResult) -> dict[str, str]:
    """label -> locant of every non-H group (chair 0; both chairs hold the same groups)."""
    return {p.label: p.locant for p in ring.chairs[0].positions if p.label not in ("H", "lone pair")}


# --- accepted kinds ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "smiles, kind, hetero",
    [
        ("C1CCCCC1", "cyclohexane", {}),
        ("C1CCOCC1", "oxane", {"1": "O"}),
        ("C1CCNCC1", "piperidine", {"1": "N"}),
        ("C1COCOC1", "1,3-dioxane", {"1": "O", "3": "O"}),
        ("C1CNCCO1", "morpholine", {"1": "O", "4": "N"}),
        ("C1COCCN1", "morpholine", {"1": "O", "4": "N"}),
        ("C1CCSCC1", "thiane", {"1": "S"}),
        ("C1COCCO1", "1,4-dioxane", {"1": "O", "4": "O"}),
    ],
)
def test_accepted_kinds_and_heteroatom_locants(smiles, kind, hetero):
    ring = only_ring(smiles)
    assert ring.kind == kind
    assert ring.locants == ("1", "2", "3", "4", "5", "6")
    assert len(set(ring.atoms)) == 6
    for locant in ring.locants:
        assert element_at(smiles, ring, locant) == hetero.get(locant, "C")


def test_ring_atoms_are_a_closed_cycle_in_order():
    smiles = "C1CNCCO1"
    ring = only_ring(smiles)
    m = mol(smiles)
    for k in range(6):
        assert m.GetBondBetweenAtoms(ring.atoms[k], ring.atoms[(k + 1) % 6]) is not None


BETA_GLC = "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O"  # beta-D-glucopyranose (InChI-checked in test_energy)


@pytest.mark.parametrize(
    "smiles",
    [BETA_GLC, "C([C@@H]1[C@H]([C@@H]([C@H]([C@@H](O1)O)O)O)O)O", "O[C@@H]1O[C@H](CO)[C@@H](O)[C@H](O)[C@H]1O"],
    ids=["glucose", "glucose-pubchem-order", "glucose-anomeric-first"],
)
def test_pyranose_sugar_numbering(smiles):
    ring = only_ring(smiles)
    m = mol(smiles)
    assert ring.kind == "pyranose"
    assert ring.locants == ("O5", "C1", "C2", "C3", "C4", "C5")
    atom = {loc: m.GetAtomWithIdx(a) for loc, a in zip(ring.locants, ring.atoms)}
    assert atom["O5"].GetSymbol() == "O"
    members = set(ring.atoms)

    def exo(loc):
        return sorted(n.GetSymbol() for n in atom[loc].GetNeighbors() if n.GetIdx() not in members)

    # C1 is the anomeric carbon: next to O5 and bearing OH; C5 carries the CH2OH (exocyclic carbon)
    assert m.GetBondBetweenAtoms(atom["O5"].GetIdx(), atom["C1"].GetIdx()) is not None
    assert exo("C1") == ["O"]
    assert exo("C5") == ["C"]
    assert {c.name for c in ring.chairs} == {"4C1", "1C4"}
    assert substituent_locants(ring)["CH2OH"] == "C5"


@pytest.mark.parametrize(
    "smiles, carbonyl_locant, methyl_locant",
    [
        ("O=C1CCCCC1", "1", None),
        ("CC1CCC(=O)CC1", "1", "4"),
        ("CC1CCCC(=O)C1", "1", "3"),  # 3-methyl, not 5-methyl
        ("CC1CCCCC1=O", "1", "2"),
    ],
)
def test_cyclohexanone_carbonyl_at_1(smiles, carbonyl_locant, methyl_locant):
    ring = only_ring(smiles)
    m = mol(smiles)
    assert ring.kind == "cyclohexanone"
    assert len(ring.trigonal_atoms) == 1
    c_o = ring.trigonal_atoms[0]
    assert ring.locants[ring.atoms.index(c_o)] == carbonyl_locant
    assert any(
        n.GetSymbol() == "O" and m.GetBondBetweenAtoms(c_o, n.GetIdx()).GetBondType() == Chem.BondType.DOUBLE
        for n in m.GetAtomWithIdx(c_o).GetNeighbors()
    )
    assert any("trigonal" in w for w in ring.warnings)
    if methyl_locant:
        assert substituent_locants(ring) == {"Me": methyl_locant}


# --- refusals -----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "smiles, words, n_refused",
    [
        ("c1ccccc1", ["aromatic"], 1),
        ("C1CC=CCC1", ["half-chair"], 1),
        ("C1CCC2CCCCC2C1", ["fused", "not supported yet"], 2),  # decalin
        ("C[C@@H]1CC[C@H]2CCCC[C@@H]2C1", ["fused", "not supported yet"], 2),  # a substituted trans-decalin
        ("C1CCC2(CC1)CCCCC2", ["spiro", "not supported yet"], 2),  # spiro[5.5]undecane
        ("C1CC2CCC1CC2", ["bridged", "not supported yet"], 3),  # bicyclo[2.2.2]octane
        ("C1CC[Si](C)(C)CC1", ["Si", "only rings of C, N, O and S"], 1),
        ("O=C1CCCCC1=O", ["two neighbouring trigonal"], 1),
        ("O=S1CCCCC1", ["sulfoxide"], 1),
        # a lactone and a lactam: the ester/amide puts two neighbouring ring atoms in one plane
        # (half-chair or sofa rings, common practice)
        ("O=C1CCCCO1", ["lactone", "too flat"], 1),
        ("O=C1CCCCN1", ["lactam", "too flat"], 1),
        ("C=C1CCCCO1", ["enol ether", "too flat"], 1),
        ("C1CC[CH]CC1", ["radical"], 1),
        ("C1CC[C+](C)CC1", ["carbocation"], 1),
        ("C1CC[C-](C)CC1", ["carbanion"], 1),
        ("C1CC[O+](C)CC1", ["has 3 bonds and hydrogens"], 1),
    ],
    ids=[
        "benzene",
        "cyclohexene",
        "decalin",
        "methyldecalin",
        "spiro",
        "bicyclooctane",
        "silinane",
        "1,2-dione",
        "sulfoxide",
        "valerolactone",
        "valerolactam",
        "methylene-oxane",
        "radical",
        "carbocation",
        "carbanion",
        "oxonium",
    ],
)
def test_refusals_with_reasons(smiles, words, n_refused):
    analysis = rings_of(smiles)
    assert analysis.rings == ()
    assert len(analysis.refused) == n_refused
    for refused in analysis.refused:
        assert len(refused.atoms) == 6
        for word in words:
            assert word in refused.reason, refused.reason
        assert refused.to_dict()["reason"] == refused.reason
    assert "no ring that can take a chair" in analysis.notes


def test_ring_info_behind_the_polycyclic_refusals():
    # what RDKit's ring perception gives: decalin and the spirane have two 6-rings, the [2.2.2]
    # bicycle three (symmetrised SSSR), norbornane only two 5-rings
    # (keep the molecule alive while its RingInfo is read: a temporary's RingInfo dangles)
    mols = {s: mol(s) for s in ("C1CCC2CCCCC2C1", "C1CCC2(CC1)CCCCC2", "C1CC2CCC1CC2", "C1CC2CCC1C2")}
    sizes = {s: sorted(len(r) for r in m.GetRingInfo().AtomRings()) for s, m in mols.items()}
    assert sizes == {
        "C1CCC2CCCCC2C1": [6, 6],
        "C1CCC2(CC1)CCCCC2": [6, 6],
        "C1CC2CCC1CC2": [6, 6, 6],
        "C1CC2CCC1C2": [5, 5],
    }
    spiro_rings = [set(r) for r in mols["C1CCC2(CC1)CCCCC2"].GetRingInfo().AtomRings()]
    assert len(spiro_rings[0] & spiro_rings[1]) == 1
    decalin_rings = [set(r) for r in mols["C1CCC2CCCCC2C1"].GetRingInfo().AtomRings()]
    assert len(decalin_rings[0] & decalin_rings[1]) == 2


def test_norbornane_six_ring_refused_as_bridged():
    # norbornane's six-membered ring (C1-C2-C3-C4-C5-C6; common practice) is outside RDKit's SSSR
    # (two 5-rings);
    # every six-membered ring must still be accepted or refused, never silently dropped
    analysis = rings_of("C1CC2CCC1C2")
    assert analysis.rings == ()
    assert len(analysis.refused) == 1
    assert "bridged" in analysis.refused[0].reason
    assert set(analysis.refused[0].atoms) == {0, 1, 2, 3, 4, 5}


def test_bicyclooctane_hidden_ring_refused_once():
    # bicyclo[2.2.2]octane has three six-membered rings (common practice), two in RDKit's SSSR;
    # all three are refused as bridged
    analysis = rings_of("C1CC2CCC1CC2")
    assert analysis.rings == ()
    assert len({frozenset(r.atoms) for r in analysis.refused}) == 3 == len(analysis.refused)
    assert all("bridged" in r.reason for r in analysis.refused)


# --- several rings ------------------------------------------------------------------------------


def test_phenylcyclohexane_analyses_cyclohexane_refuses_phenyl():
    smiles = "C1CCC(CC1)c1ccccc1"
    analysis = rings_of(smiles)
    m = mol(smiles)
    assert len(analysis.rings) == 1 and len(analysis.refused) == 1
    ring = analysis.rings[0]
    assert ring.kind == "cyclohexane"
    assert not any(m.GetAtomWithIdx(a).GetIsAromatic() for a in ring.atoms)
    refused = analysis.refused[0]
    assert "aromatic" in refused.reason
    assert all(m.GetAtomWithIdx(a).GetIsAromatic() for a in refused.atoms)
    assert substituent_locants(ring) == {"Ph": "1"}


def test_bicyclohexyl_both_rings_analysed():
    analysis = rings_of("C1CCC(CC1)C1CCCCC1")
    assert len(analysis.rings) == 2
    assert analysis.refused == ()
    a, b = analysis.rings
    assert not set(a.atoms) & set(b.atoms)
    assert all(r.kind == "cyclohexane" for r in analysis.rings)
    assert all(substituent_locants(r) == {"cHex": "1"} for r in analysis.rings)


def test_separate_rings_of_different_kinds():
    # 4-cyclohexylmorpholine: a morpholine and a cyclohexane, joined through N4
    analysis = rings_of("C1CCC(CC1)N1CCOCC1")
    assert sorted(r.kind for r in analysis.rings) == ["cyclohexane", "morpholine"]


# --- lowest locants -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    "smiles, expected",
    [
        ("C[C@H]1CC[C@H](O)CC1", [("Me", "4"), ("OH", "1")]),  # trans-4-methylcyclohexanol
        ("C[C@H]1CC[C@@H](O)CC1", [("Me", "4"), ("OH", "1")]),  # cis
        ("CC1CCC(O)CC1", [("Me", "4"), ("OH", "1")]),  # unspecified: both configurations
        ("CC1CCCCC1O", [("Me", "2"), ("OH", "1")]),  # 2-methylcyclohexanol, not 6-
        ("CC1CCCC(N)C1", [("Me", "3"), ("NH2", "1")]),  # 3-methylcyclohexanamine, not 5-
        ("CC1CCCC(C)C1", [("Me", "1"), ("Me", "3")]),  # 1,3-dimethyl, not 1,5-
        ("CC1CCCOC1", [("Me", "3")]),  # 3-methyloxane: O1 first, then Me at 3 not 5
        ("CC1CCCCN1C", [("Me", "1"), ("Me", "2")]),  # 1,2-dimethylpiperidine
    ],
)
def test_lowest_locants(smiles, expected):
    analysis = rings_of(smiles)
    assert analysis.rings
    for ring in analysis.rings:
        where = sorted((p.label, p.locant) for p in ring.chairs[0].positions if p.label not in ("H", "lone pair"))
        assert where == expected


def test_unspecified_4_methylcyclohexanol_gives_cis_and_trans():
    analysis = rings_of("CC1CCC(O)CC1")
    labels = sorted(r.configuration.label for r in analysis.rings)
    assert labels == ["r-1,c-4 (cis)", "r-1,t-4 (trans)"]


@pytest.mark.parametrize(
    "smiles",
    ["CC(=O)N1CCCC[C@@H]1C", "CC(C)(C)OC(=O)N1CCCC[C@@H]1C", "c1ccccc1N1CCCC[C@@H]1C"],
    ids=["N-acetyl", "N-Boc", "N-phenyl"],
)
def test_planar_ring_nitrogen_is_trigonal_and_the_free_amine_values_are_not_used(smiles):
    # an amide, carbamate or N-aryl ring nitrogen is planar (RDKit: sp2): it has no axial or
    # equatorial substituent, and a 2-substituent next to it often prefers axial (A(1,3) strain;
    # Johnson, Chem. Rev. 1968, 68, 375, from memory), so the 2-methylpiperidine value (measured
    # on the free amine, Eliel 1980) must not be used and the report must warn
    ring = only_ring(smiles)
    assert ring.kind == "piperidine"
    assert ring.trigonal_atoms == (ring.atoms[0],)
    assert all(p.ring_atom != ring.atoms[0] for c in ring.chairs for p in c.positions)
    assert any("A(1,3) strain" in w for w in ring.warnings)
    terms = [t for c in ring.chairs for t in c.terms if t.kind == "a-value"]
    assert terms and all("eliel1980" not in t.sources for t in terms)


def test_no_a13_warning_without_a_group_beside_the_planar_nitrogen():
    ring = only_ring("CC(C)(C)OC(=O)N1CC[C@@H](C)CC1")
    assert not any("A(1,3) strain" in w for w in ring.warnings)


@pytest.mark.parametrize(
    "smiles, kind",
    [
        ("CC1CCC(=O)CC1", "cyclohexanone"),
        ("CC1CCC(=N)CC1", "cyclohexane (exocyclic C=N)"),
        ("CC1CCC(=S)CC1", "cyclohexane (exocyclic C=S)"),
        ("C=C1CCC(C)CC1", "cyclohexane (exocyclic C=C)"),
    ],
)
def test_exocyclic_double_bond_named_by_its_partner(smiles, kind):
    assert only_ring(smiles).kind == kind


def test_ring_ammonium_does_not_take_the_free_amine_values():
    # a piperidinium has no lone pair on N: the N-methylpiperidine value (against the lone pair)
    # and the 2-methylpiperidine value (free amine) do not apply (common practice)
    ring = only_ring("C[C@H]1CC[C@@H](C)[N+](C)(C)C1")
    terms = [t for c in ring.chairs for t in c.terms if t.kind == "a-value"]
    # every axial Me gets the cyclohexane value, A(Me) 1.74 (Booth & Everett 1980), with a warning
    assert terms and all(t.value == pytest.approx(1.74) for t in terms)
    assert any("cyclohexane values are used" in w for w in ring.warnings)
    assert not any("twist-boat" in w for w in ring.warnings)


def test_ring_without_carbon_is_named_from_its_lowest_locant():
    # cyclo-S6 is a chair (common practice); its descriptor needs a reference atom that is not C
    ring = only_ring("S1SSSSS1")
    assert {c.name for c in ring.chairs} == {"1C4", "4C1"}
    assert ring.degenerate


def test_ammonium_n_h_has_no_lone_pair_value():
    # the piperidine N-H value (0.4, against the lone pair) cannot apply to R2NH2+ / R3NH+
    ring = only_ring("C[NH+]1CCCCC1")
    assert all("piperidine1970" not in t.sources for c in ring.chairs for t in c.terms)


@pytest.mark.parametrize("smiles", ["CN1(->O)CCCCC1", "C[N+]1([O-])CCCCC1", "C1CCN(->[Pt])CC1"])
def test_ring_nitrogen_with_a_dative_bond_stays_a_chair_atom(smiles):
    # an N-oxide written with a dative bond or charge-separated, and an N bound to a metal, are
    # tetrahedral ring nitrogens (common practice)
    assert len(rings_of(smiles).rings) == 1
