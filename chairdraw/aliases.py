"""Abbreviation aliases in a drawing (an atom shown as 'OTBS', 'CO2Me', 'MeO') -> real atoms.

RDKit reads a molfile alias as a dummy atom carrying ``molFileAlias`` and does not expand it.
The groups come from the same tables the figures and reports use: the A-value table
(avalues.txt) and the drawing names (labels.txt). A label written backwards, as it is on the
left of a drawing (MeO2C, AcO, HOH2C), is read by reversing its units with the label grammar.

The alias atom keeps its index and becomes the group's first atom; the rest of the group is
appended, so atom numbers in messages still point at the atoms the chemist drew.
"""

from __future__ import annotations

from functools import cache

from rdkit import Chem
from rdkit.Geometry import Point3D

from .energy import tables
from .errors import InputError, LabelError
from .labels import parse_label


@cache
def _groups() -> dict[str, str]:
    """label -> group SMILES with '*' for the attachment point."""
    out = {row.label: row.group for row in tables.avalues() if row.context is None}
    for label, group in tables.drawing_labels():
        out.setdefault(label, group)
    return out


def group_smiles(label: str) -> str | None:
    """The group an alias stands for, read forwards or backwards; None when it is not known."""
    text = label.strip()
    found = _groups().get(text)
    if found is not None:
        return found
    try:
        parsed = parse_label(text)
    except LabelError:
        return None
    backwards = "".join(u.text() for g in reversed(parsed.groups()) for u in g) + parsed.charge
    return _groups().get(backwards)


def expand_aliases(mol: Chem.Mol, record: str | None = None) -> Chem.Mol:
    """A copy of ``mol`` with every aliased atom replaced by its group."""
    aliased = [a.GetIdx() for a in mol.GetAtoms() if a.HasProp("molFileAlias")]
    if not aliased:
        return mol
    out = Chem.RWMol(mol)
    conf = out.GetConformer() if out.GetNumConformers() else None
    for idx in aliased:
        atom = out.GetAtomWithIdx(idx)
        label = atom.GetProp("molFileAlias")
        smiles = group_smiles(label)
        if smiles is None:
            raise InputError(f"atom {idx + 1}: the alias {label!r} is not a group chairdraw knows", record=record)
        if atom.GetDegree() != 1:
            raise InputError(
                f"atom {idx + 1}: the alias {label!r} has {atom.GetDegree()} bonds; expected one", record=record
            )
        group = Chem.MolFromSmiles(smiles)
        star = next(a for a in group.GetAtoms() if a.GetAtomicNum() == 0)
        first = star.GetNeighbors()[0]
        new = {first.GetIdx(): idx}
        atom.SetAtomicNum(first.GetAtomicNum())
        atom.SetFormalCharge(first.GetFormalCharge())
        atom.SetIsotope(first.GetIsotope())
        atom.SetNoImplicit(False)
        atom.SetNumExplicitHs(0)
        atom.ClearProp("molFileAlias")
        anchor = conf.GetAtomPosition(idx) if conf is not None else None
        for a in group.GetAtoms():
            if a.GetIdx() in (star.GetIdx(), first.GetIdx()):
                continue
            copy = Chem.Atom(a.GetAtomicNum())
            copy.SetFormalCharge(a.GetFormalCharge())
            copy.SetIsotope(a.GetIsotope())
            copy.SetIsAromatic(a.GetIsAromatic())
            new[a.GetIdx()] = out.AddAtom(copy)
            if conf is not None and anchor is not None:  # the group's own layout does not matter
                conf.SetAtomPosition(new[a.GetIdx()], Point3D(anchor.x, anchor.y, anchor.z))
        for b in group.GetBonds():
            i, j = b.GetBeginAtomIdx(), b.GetEndAtomIdx()
            if star.GetIdx() in (i, j):
                continue
            out.AddBond(new[i], new[j], b.GetBondType())
    result = out.GetMol()
    try:
        Chem.SanitizeMol(result)
    except (ValueError, RuntimeError) as exc:
        raise InputError(
            f"the drawing with its aliases expanded is not a valid structure: {exc}", record=record
        ) from None
    return result
