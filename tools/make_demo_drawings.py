"""Write chairdraw/data/demo_drawings.sdf: the demo's chair drawings (invented scenario).

    python tools/make_demo_drawings.py

The Halden Bay process group (invented) drafts chair figures for its WILLOW compounds; the
registry is chairdraw/data/demo.smi. Each drawing is a chair molfile made by chairdraw's own
renderer and then changed the way a draft goes wrong or varies: the other chair, a mirror image,
two groups swapped on one carbon, the ester drawn as an alias, the page turned. The SDF field
`drawn` says what was done, so that the demo's verdicts can be checked against it.
"""

from __future__ import annotations

import math
from pathlib import Path

from rdkit import Chem

import chairdraw
from chairdraw.chairmol import chair_molblock
from chairdraw.demo import demo_records

OUT = Path(__file__).resolve().parent.parent / "chairdraw" / "data" / "demo_drawings.sdf"


def _plain(mol: Chem.Mol) -> str:
    out = Chem.Mol(mol)
    for atom in out.GetAtoms():
        atom.SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    return Chem.MolToMolBlock(out, includeStereo=False)


def _moved(block: str, change) -> Chem.Mol:
    mol = Chem.MolFromMolBlock(block, removeHs=False)
    conf = mol.GetConformer()
    for i in range(mol.GetNumAtoms()):
        p = conf.GetAtomPosition(i)
        conf.SetAtomPosition(i, (*change(p.x, p.y), 0.0))
    return mol


def _swapped(block: str, ring_atom: int) -> Chem.Mol:
    mol = Chem.MolFromMolBlock(block, removeHs=False)
    ring = next(r for r in mol.GetRingInfo().AtomRings() if ring_atom in r)
    a, b = [n.GetIdx() for n in mol.GetAtomWithIdx(ring_atom).GetNeighbors() if n.GetIdx() not in ring]
    conf = mol.GetConformer()
    pa, pb = conf.GetAtomPosition(a), conf.GetAtomPosition(b)
    conf.SetAtomPosition(a, pb)
    conf.SetAtomPosition(b, pa)
    return mol


def _ester_as_alias(block: str) -> Chem.Mol:
    mol = Chem.RWMol(Chem.MolFromMolBlock(block, removeHs=False))
    carbonyl = next(
        a.GetIdx()
        for a in mol.GetAtoms()
        if a.GetSymbol() == "C" and sorted(n.GetSymbol() for n in a.GetNeighbors()) == ["C", "O", "O"]
    )
    doomed = [n.GetIdx() for n in mol.GetAtomWithIdx(carbonyl).GetNeighbors() if n.GetSymbol() == "O"]
    methyl = [
        m.GetIdx()
        for o in doomed
        for m in mol.GetAtomWithIdx(o).GetNeighbors()
        if m.GetSymbol() == "C" and m.GetIdx() != carbonyl
    ]
    mol.GetAtomWithIdx(carbonyl).SetProp("molFileAlias", "CO2Me")
    for idx in sorted(doomed + methyl, reverse=True):
        mol.RemoveAtom(idx)
    return mol.GetMol()


def main() -> None:
    registry = {rest.split()[0]: smiles for smiles, rest in demo_records()}
    turn = math.radians(20)
    plans = [
        ("WLW-0101", "favored", "as registered, favoured chair", lambda b: _moved(b, lambda x, y: (x, y))),
        ("WLW-0120", "flip", "as registered, the minor chair", lambda b: _moved(b, lambda x, y: (x, y))),
        ("WLW-0134", "favored", "as registered, 4C1", lambda b: _moved(b, lambda x, y: (x, y))),
        ("WLW-0133", "favored", "groups on C4 swapped (a galacto drawing)", None),
        ("WLW-0161", "favored", "mirror image", lambda b: _moved(b, lambda x, y: (-x, y))),
        ("WLW-0140", "favored", "ester drawn as the alias CO2Me", _ester_as_alias),
        (
            "WLW-0152",
            "favored",
            "page turned 20 degrees",
            lambda b: _moved(
                b, lambda x, y: (x * math.cos(turn) - y * math.sin(turn), x * math.sin(turn) + y * math.cos(turn))
            ),
        ),
    ]
    records = []
    for record, chair, drawn, change in plans:
        analysis = chairdraw.analyze(chairdraw.read(registry[record], record=record))
        block = chair_molblock(analysis, chair=chair)
        if change is None:  # C4 of the pyranose: the ring atom with locant 4
            ring = analysis.rings[0]
            c4 = ring.atoms[ring.locants.index("C4")]
            mol = _swapped(block, c4)
        else:
            mol = change(block)
        mol.SetProp("_Name", record)
        text = _plain(mol)
        records.append(f"{text}>  <drawn>\n{drawn}\n\n$$$$\n")
    OUT.write_text("".join(records), encoding="utf-8")
    print(f"wrote {OUT} ({len(records)} drawings)")


if __name__ == "__main__":
    main()
