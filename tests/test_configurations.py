"""Unspecified ring stereo: one analysis per relative configuration, never a guess.

The outside reference for the counts is RDKit's stereoisomer enumeration with standard InChI as
identity, enantiomers merged (a relative configuration covers both).
"""

from __future__ import annotations

import pytest
from rdkit import Chem
from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

import chairdraw
from chairdraw.faces import mirror


def _rdkit_relative_count(smiles: str) -> int:
    mol = Chem.MolFromSmiles(smiles)
    keys = set()
    for iso in EnumerateStereoisomers(mol, options=StereoEnumerationOptions(unique=True)):
        keys.add(min(Chem.MolToInchi(iso), Chem.MolToInchi(mirror(iso))))
    return len(keys)


CASES = [
    ("CC1CCC(O)CC1", "4-methylcyclohexanol: cis and trans"),
    ("CC1CCCC(C)C1", "1,3-dimethylcyclohexane: cis (meso) and trans (a pair)"),
    ("CC1CC(C)CC(C)C1", "1,3,5-trimethylcyclohexane: all-cis and cis,cis,trans"),
    ("OC1C(O)C(O)C(O)C(O)C1O", "inositol: 9 stereoisomers, one enantiomeric pair (chiro)"),
    ("OCC1OC(O)C(O)C(O)C1O", "aldohexopyranose: 32 stereoisomers, 16 relative configurations"),
    ("CC1CCCCC1C", "1,2-dimethylcyclohexane"),
    ("CC1(O)CCC(C)CC1", "1,4-dimethylcyclohexan-1-ol: geminal centre"),
]


@pytest.mark.parametrize("smiles, why", CASES, ids=[w for _, w in CASES])
def test_one_result_per_relative_configuration(smiles, why):
    result = chairdraw.analyze(smiles)
    assert len(result.rings) == _rdkit_relative_count(smiles), why
    identities = set()
    for ring in result.rings:
        assert ring.configuration is not None
        mol = Chem.MolFromSmiles(ring.configuration.smiles)
        identities.add(min(Chem.MolToInchi(mol), Chem.MolToInchi(mirror(mol))))
        assert any("assumed" in c.status for c in ring.stereo)
        assert any("analysed separately" in n for n in ring.notes)
    assert len(identities) == len(result.rings)  # no configuration twice


def test_configuration_faces_match_its_own_smiles():
    # re-analysing the labelled SMILES must give the same chairs (it is fully specified)
    for ring in chairdraw.analyze("CC1CCC(O)CC1").rings:
        again = chairdraw.analyze(ring.configuration.smiles).rings[0]
        assert again.configuration is None
        assert again.delta_g_kcal_mol == pytest.approx(ring.delta_g_kcal_mol)


def test_labels_say_cis_and_trans():
    labels = sorted(r.configuration.label for r in chairdraw.analyze("CC1CCC(O)CC1").rings)
    assert labels == ["r-1,c-4 (cis)", "r-1,t-4 (trans)"]
    # trans-4-methylcyclohexanol is diequatorial in its favoured chair (fact of the trade)
    trans = next(r for r in chairdraw.analyze("CC1CCC(O)CC1").rings if "trans" in r.configuration.label)
    assert all(p.orientation == "equatorial" for p in trans.favored.positions if p.label != "H")


def test_single_open_centre_is_analysed_once_with_a_note():
    result = chairdraw.analyze("CC1CCCC(=O)C1")  # 3-methylcyclohexanone, one stereocentre
    assert len(result.rings) == 1
    ring = result.rings[0]
    assert any("both enantiomers" in n for n in ring.notes)
    assert ring.stereo[0].status.startswith("unspecified")


def test_specified_centres_are_reported_specified():
    ring = chairdraw.analyze("C[C@H]1CC[C@@H](O)CC1").rings[0]
    assert [c.status for c in ring.stereo] == ["specified", "specified"]
    assert ring.configuration is None


def test_wavy_bond_centre_is_unknown(tmp_path):
    # a wavy (V2000 stereo 4) bond on one of two ring centres: RDKit marks it Unknown
    mol = Chem.MolFromSmiles("C[C@H]1CC[C@@H](O)CC1")
    from rdkit.Chem import rdDepictor

    rdDepictor.Compute2DCoords(mol)
    Chem.WedgeMolBonds(mol, mol.GetConformer())
    block = Chem.MolToMolBlock(mol)
    lines = block.splitlines()
    counts = lines[3]
    n_atoms = int(counts[0:3])
    for k in range(4 + n_atoms, 4 + n_atoms + int(counts[3:6])):
        if lines[k][9:12].strip() in ("1", "6"):
            lines[k] = lines[k][:9] + "  4" + lines[k][12:]
            break
    result = chairdraw.analyze("\n".join(lines) + "\n")
    statuses = {c.status.split(",")[0] for r in result.rings for c in r.stereo}
    assert "unknown" in statuses


def _relative_inchi(inchi: str) -> str:
    """InChI up to its /m layer: the relative configuration, whichever enantiomer."""
    return inchi.split("/m")[0]


TRANS_12 = "C[C@H]1CCCC[C@@H]1C"  # trans-1,2-dimethylcyclohexane
CIS_12 = "C[C@H]1CCCC[C@H]1C"


@pytest.mark.parametrize(
    "extension, configurations",
    [
        ("|o1:1,o2:6|", 2),  # two OR groups: each centre is one of two, independently
        ("|&1:1,&2:6|", 2),  # two racemic groups: no relation between them
        ("|a:1,&1:6|", 2),  # an absolute centre and a racemic one
        ("|&1:1,6|", 1),  # one group: the drawn relative configuration holds, in either enantiomer
        ("|o1:1,6|", 1),
    ],
)
def test_centres_in_separate_stereo_groups_are_not_related(extension, configurations):
    # CXSMILES enhanced stereo (the Daylight/ChemAxon extension as RDKit reads it): a group fixes the
    # relative configuration of its own centres only. Expected configurations come from RDKit's
    # InChI of the two hand-written diastereomers, not from chairdraw
    analysis = chairdraw.analyze(f"{TRANS_12} {extension}")
    assert len(analysis.rings) == configurations
    for ring in analysis.rings:  # each configuration's SMILES names the same isomer as its InChI
        if ring.configuration:
            c = ring.configuration
            assert Chem.MolToInchi(Chem.MolFromSmiles(c.smiles)) == c.inchi
    found = {_relative_inchi(r.configuration.inchi if r.configuration else analysis.inchi) for r in analysis.rings}
    wanted = {_relative_inchi(Chem.MolToInchi(Chem.MolFromSmiles(s))) for s in (TRANS_12, CIS_12)}
    if configurations == 2:
        assert found == wanted
        assert all("separate stereo groups" in r.notes[0] for r in analysis.rings)
        assert all("stereo group" in c.status for r in analysis.rings for c in r.stereo)
    else:
        assert found == {_relative_inchi(Chem.MolToInchi(Chem.MolFromSmiles(TRANS_12)))}


def test_a_group_of_two_centres_keeps_their_relation_against_a_third():
    # 1,3,5-trimethylcyclohexane with C1/C3 in one racemic group and C5 in another: C1/C3 stay cis,
    # C5 is either way; RDKit's InChIs of the two hand-written isomers are the reference
    smiles = "C[C@H]1C[C@@H](C)C[C@H](C)C1"
    analysis = chairdraw.analyze(f"{smiles} |&1:1,3,&2:6|")
    assert len(analysis.rings) == 2
    other = "C[C@H]1C[C@@H](C)C[C@@H](C)C1"
    wanted = {_relative_inchi(Chem.MolToInchi(Chem.MolFromSmiles(s))) for s in (smiles, other)}
    assert {_relative_inchi(r.configuration.inchi) for r in analysis.rings} == wanted


def test_configuration_smiles_follow_the_new_tags_in_a_1_4_ring():
    # the tags written for a configuration must not keep the perception of the input's tags: the
    # trans configuration of a cis input must be written trans (RDKit's InChI of the text decides)
    analysis = chairdraw.analyze("C[C@H]1CC[C@@H](C)CC1 |&1:1,&2:4|")
    assert len(analysis.rings) == 2
    for ring in analysis.rings:
        c = ring.configuration
        assert c is not None
        assert Chem.MolToInchi(Chem.MolFromSmiles(c.smiles)) == c.inchi
    assert len({r.configuration.smiles for r in analysis.rings}) == 2


@pytest.mark.parametrize("smiles, why", CASES + [("C[C@H]1CC[C@@H](C)CC1 |&1:1,&2:4|", "1,4-pair in two groups")])
def test_every_configuration_smiles_reads_back_as_its_inchi(smiles, why):
    # RDKit's SMILES writer keeps stereo it perceived earlier: a configuration's SMILES must name
    # the isomer its own tags make (RDKit's InChI of both is the judge)
    for ring in chairdraw.analyze(smiles).rings:
        c = ring.configuration
        assert c is not None
        assert Chem.MolToInchi(Chem.MolFromSmiles(c.smiles)) == c.inchi, (why, c.label, c.smiles)
