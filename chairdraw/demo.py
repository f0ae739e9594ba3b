"""The built-in demo set (an invented process group's intermediates, see data/demo.smi)."""

from __future__ import annotations

from importlib import resources


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
