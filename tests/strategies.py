"""Hypothesis strategies shared by the test modules."""

from __future__ import annotations

from hypothesis import strategies as st
from rdkit import Chem

# substituents of the random rings: labelled, skeletal and named groups
GROUPS = [
    "C",
    "O",
    "Cl",
    "F",
    "OC",
    "C(=O)OC",
    "CC",
    "N",
    "C(C)(C)C",
    "C(F)(F)F",
    "CCC",  # skeletal (no label of its own)
    "COC(C)=O",  # CH2OAc (condensed)
    "NC(C)=O",  # NHAc (labels.txt)
    "OCc1ccccc1",  # OBn (labels.txt)
]


@st.composite
def substituted_rings(draw):
    ring_o = draw(st.booleans())
    atoms = ["C"] * 6
    if ring_o:
        atoms[0] = "O"
    smiles_atoms = []
    for k in range(6):
        if atoms[k] == "O":
            smiles_atoms.append("O")
            continue
        group = draw(st.sampled_from([None, None] + GROUPS))
        if group is None:
            smiles_atoms.append("C")
        else:
            tag = draw(st.sampled_from(["@", "@@"]))
            smiles_atoms.append(f"[C{tag}H]({group})")
    text = smiles_atoms[0] + "1" + "".join(smiles_atoms[1:5]) + smiles_atoms[5] + "1"
    mol = Chem.MolFromSmiles(text)
    if mol is None:
        return None
    return Chem.MolToSmiles(mol)
