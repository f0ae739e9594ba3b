"""Substituent recognition: the fast tree codes against RDKit's own canonical SMILES.

``fragments`` writes acyclic substituents from a rooted-tree code and cuts the rest off with
RDKit; ``_cut_fragments`` cuts every substituent off with RDKit (FragmentOnBonds and canonical
SMILES), so it is the reference here. The molecules are RDKit's shipped NCI sample (open data in
the wheel), plus molfile-style inputs with hydrogens drawn as atoms.
"""

from __future__ import annotations

import os

import pytest
from rdkit import Chem, RDConfig

from chairdraw.molgraph import MolGraph
from chairdraw.rings import find_rings
from chairdraw.substituents import _cut_fragments, fragments, recognise

NCI = os.path.join(RDConfig.RDDataDir, "NCI", "first_5K.smi")


def ring_bonds(mol: Chem.Mol) -> list[list[tuple[int, int]]]:
    """(ring atom, substituent atom) of every substituent, one list per chair ring."""
    out = []
    for ring in find_rings(mol)[0]:
        members = set(ring.atoms)
        bonds = []
        for r in ring.atoms:
            for n in mol.GetAtomWithIdx(r).GetNeighbors():
                if n.GetIdx() not in members and n.GetAtomicNum() > 1:
                    bonds.append((r, n.GetIdx()))
        if bonds:
            out.append(bonds)
    return out


def nci_molecules(limit: int) -> list[Chem.Mol]:
    if not os.path.exists(NCI):
        pytest.skip("RDKit's NCI sample is not in this wheel")
    out = []
    with open(NCI, encoding="utf-8") as handle:
        for line in handle:
            mol = Chem.MolFromSmiles(line.split()[0]) if line.split() else None
            if mol is not None and ring_bonds(mol):
                out.append(mol)
            if len(out) >= limit:
                break
    return out


def test_tree_codes_equal_rdkit_fragments_on_nci():
    checked = 0
    for mol in nci_molecules(400):
        for bonds in ring_bonds(mol):
            assert fragments(mol, bonds, MolGraph(mol)) == _cut_fragments(mol, bonds), Chem.MolToSmiles(mol)
            checked += len(bonds)
    assert checked > 500  # the sample has plenty of ring substituents


@pytest.mark.parametrize(
    "smiles, expected",
    [
        ("OC1CCCCC1", "OH"),
        ("CC(=O)OC1CCCCC1", "OAc"),
        ("CC(C)(C)[Si](C)(C)OC1CCCCC1", "OTBS"),
        ("OCC1CCCCC1", "CH2OH"),
        ("[O-][N+](=O)C1CCCCC1", "NO2"),
        ("N#CC1CCCCC1", "CN"),
        ("c1ccccc1C1CCCCC1", "Ph"),
        ("FC(F)(F)C1CCCCC1", "CF3"),
    ],
)
def test_groups_recognised_from_the_table(smiles: str, expected: str):
    # with hydrogens drawn as atoms (as molfiles have them) the group must be the same
    for mol in (Chem.MolFromSmiles(smiles), Chem.AddHs(Chem.MolFromSmiles(smiles))):
        (bonds,) = ring_bonds(mol)
        assert len(bonds) == 1
        fragment = fragments(mol, bonds)[bonds[0]]
        assert recognise(fragment).label == expected, fragment
        assert fragment == _cut_fragments(mol, bonds)[bonds[0]]


def test_isotopes_inside_a_group_are_ignored():
    # the A-value table ignores isotopes and stereo inside a group (avalues.txt header): OCD3 is OMe
    mol = Chem.MolFromSmiles("[2H]C([2H])([2H])OC1CCCCC1")
    (bonds,) = ring_bonds(mol)
    assert recognise(fragments(mol, bonds)[bonds[0]]).label == "OMe"


def test_large_groups_classified_in_place_as_when_cut_off():
    # a substituent larger than every table group is classified on the molecule itself; the class,
    # the pair class and the formula label must equal those of the same group cut off with RDKit
    from chairdraw.substituents import _largest_table_group, substituent_groups

    checked = 0
    for mol in nci_molecules(400):
        graph = MolGraph(mol)
        for bonds in ring_bonds(mol):
            ours = substituent_groups(mol, graph, bonds)
            cut = _cut_fragments(mol, bonds)
            for bond in bonds:
                reference = recognise(cut[bond])
                group = ours[bond]
                assert (group.estimated_as, group.pair_class, group.label, group.size) == (
                    reference.estimated_as,
                    reference.pair_class,
                    reference.label,
                    reference.size,
                ), (Chem.MolToSmiles(mol), bond)
                checked += group.size > _largest_table_group()
    assert checked > 20  # the sample has many large substituents
