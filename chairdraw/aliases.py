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

AMBIGUOUS = {"NC": "a nitrile written backwards (N≡C-) or an isocyanide (-N≡C)"}


@cache
def _groups() -> dict[str, str]:
    """label -> group SMILES with '*' for the attachment point."""
    out = {row.label: row.group for row in tables.avalues() if row.context is None}
    for label, group in (*tables.drawing_labels(), *tables.alias_spellings()):
        out.setdefault(label, group)
    for label in AMBIGUOUS:
        out.pop(label, None)
    return out


def group_smiles(label: str) -> str | None:
    """The group an alias stands for, read forwards or backwards, also behind CH2 links (CH2OAc,
    HOCH2); None when it is not known or could mean two groups."""
    text = label.strip()
    if text in AMBIGUOUS:
        return None
    for candidate in _spellings(text):
        found = _groups().get(candidate)
        if found is None and candidate.startswith("CH2") and len(candidate) > 3:
            inner = group_smiles(candidate[3:])  # CH2OAc: a CH2 link, then a known group
            found = "*C" + inner[1:] if inner is not None and inner.startswith("*") else None
        if found is not None:
            return found
    return None


def _spellings(text: str) -> list[str]:
    """The label as written and read backwards (MeO2C -> CO2Me, HOCH2 -> CH2OH)."""
    out = [text]
    try:
        parsed = parse_label(text)
    except LabelError:
        return out
    # backwards by the label's units (HOH2C -> CH2OH, MeO2C -> CO2Me), and by atoms with their H
    # (CH3O -> OCH3, HOCH2 -> CH2OH, AcOCH2 -> CH2OAc): both spellings are in use
    chunks: list[list] = []
    for unit in parsed.units:
        if unit.head == "H" and chunks and isinstance(chunks[-1][-1].head, str) and chunks[-1][-1].head != "H":
            chunks[-1].append(unit)
        else:
            chunks.append([unit])
    for backwards in (
        "".join(u.text() for g in reversed(parsed.groups()) for u in g) + parsed.charge,
        "".join(u.text() for chunk in reversed(chunks) for u in chunk) + parsed.charge,
    ):
        if backwards not in out:
            out.append(backwards)
    return out


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
            why = (
                f"it could be {AMBIGUOUS[label.strip()]}"
                if label.strip() in AMBIGUOUS
                else "not a group chairdraw knows"
            )
            raise InputError(
                f"atom {idx + 1}: the alias {label!r}: {why}; draw the group's atoms instead", record=record
            )
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
