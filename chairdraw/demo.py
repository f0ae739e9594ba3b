"""The built-in demo set (an invented process group's intermediates, see data/demo.smi) and its
chair drawings (data/demo_drawings.sdf, made by tools/make_demo_drawings.py)."""

from __future__ import annotations

from importlib import resources

from .read import read_molblock, split_sdf


def demo_records() -> list[tuple[str, str]]:
    """(SMILES, 'id description') for every demo record."""
    text = resources.files("chairdraw").joinpath("data", "demo.smi").read_text(encoding="utf-8")
    out = []
    for line in text.splitlines():
        if not line.strip() or line.startswith("#"):
            continue
        smiles, _, rest = line.partition(" ")
        out.append((smiles, rest.strip()))
    return out


def demo_drawings() -> list[tuple[str, str, str]]:
    """(id, molfile of the chair drawing, what was drawn) for every demo drawing."""
    text = resources.files("chairdraw").joinpath("data", "demo_drawings.sdf").read_text(encoding="utf-8")
    out = []
    for block in split_sdf(text):
        structure = read_molblock(block)
        drawn = block.split(">  <drawn>\n", 1)[1].split("\n", 1)[0] if ">  <drawn>" in block else ""
        out.append((structure.record or "", block, drawn))
    return out


def demo_registry() -> dict[str, str]:
    """id -> registered SMILES."""
    return {rest.split()[0]: smiles for smiles, rest in demo_records()}
