"""What each ring substituent is: a named group of the A-value table or an estimate by class.

A substituent is cut off at its bond to the ring (the ring atom becomes '*') and its canonical
SMILES is looked up in the table; an exact match is a recognised group. Otherwise the classes in
``classes.txt`` are tried in order as SMARTS from '*', and the representative group's value is
used, flagged as estimated. Look-ups are cached by fragment SMILES, so a data set with the same
groups over and over costs one look-up per distinct group.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache

from rdkit import Chem

from .energy import tables
from .molgraph import MolGraph

HALOGENS = {"F", "Cl", "Br", "I"}


@dataclass(frozen=True)
class Group:
    """A recognised or estimated substituent."""

    label: str
    fragment: str  # canonical SMILES with '*'
    pair_class: str  # C, O, N, S, X, P, H ...
    rows: tuple[tables.AValue, ...]  # table rows for this group (several contexts)
    estimated_as: str | None = None  # class name when the value is borrowed

    def avalue(self, solvent: str, context: str | None) -> tuple[float, tables.AValue, bool]:
        """(value, row, context_matched). Falls back to the cyclohexane row."""
        if context is not None:
            for row in self.rows:
                if row.context == context:
                    return row.value(solvent), row, True
        for row in self.rows:
            if row.context is None:
                return row.value(solvent), row, context is None
        row = self.rows[0]
        return row.value(solvent), row, False


def canonical_fragment(smiles: str) -> str:
    """Canonical fragment SMILES without plain hydrogen atoms (deuterium and tritium stay)."""
    mol = Chem.MolFromSmiles(smiles)
    if mol is None:
        raise ValueError(smiles)
    return Chem.MolToSmiles(mol, isomericSmiles=False)


@cache
def _table() -> dict[str, list[tables.AValue]]:
    by_fragment: dict[str, list[tables.AValue]] = {}
    for row in tables.avalues():
        key = _table_key(row.group)
        by_fragment.setdefault(key, []).append(row)
    return by_fragment


def _table_key(group: str) -> str:
    mol = Chem.MolFromSmiles(group, sanitize=True)
    if mol is None:
        raise tables.DataFileError(f"avalues.txt: cannot read group {group!r}")
    # isotopes matter only for hydrogen (D, T), whose A-values differ from H's
    isotopic = any(a.GetIsotope() for a in mol.GetAtoms())
    return Chem.MolToSmiles(mol, isomericSmiles=isotopic)


def hydrogen_isotope_fragment(symbol: str) -> str:
    """Fragment key of a D or T substituent."""
    return _table_key("*[2H]" if symbol == "D" else "*[3H]")


@cache
def _compiled_classes() -> tuple[tuple[tables.SubstituentClass, Chem.Mol], ...]:
    out = []
    for c in tables.classes():
        # '*' in SMARTS is any atom; the leading one must be the cut point itself
        patt = Chem.MolFromSmarts("[#0]" + c.smarts[1:] if c.smarts.startswith("*") else c.smarts)
        if patt is None:
            raise tables.DataFileError(f"classes.txt: bad SMARTS {c.smarts!r} for {c.name!r}")
        out.append((c, patt))
    return tuple(out)


def _rows_by_label(label: str) -> tuple[tables.AValue, ...]:
    return tuple(r for r in tables.avalues() if r.label == label)


@cache
def recognise(fragment: str) -> Group:
    """The group for a canonical fragment SMILES (with one '*')."""
    table = _table()
    rows = table.get(fragment)
    mol = Chem.MolFromSmiles(fragment)
    attached = _attached_element(mol)
    pair_class = "X" if attached in HALOGENS else attached
    if rows:
        return Group(rows[0].label, fragment, pair_class, tuple(rows))
    for cls, patt in _compiled_classes():
        if mol.HasSubstructMatch(patt):
            return Group(_formula_label(mol), fragment, cls.pair_class, _rows_by_label(cls.representative), cls.name)
    placeholder = tables.AValue("?", fragment, 1.0, None, None, ("placeholder",), "no class matched")
    return Group(_formula_label(mol), fragment, pair_class, (placeholder,), "unclassified")


def _attached_element(mol: Chem.Mol) -> str:
    for atom in mol.GetAtoms():
        if atom.GetAtomicNum() == 0:
            return atom.GetNeighbors()[0].GetSymbol()
    return "?"


def _formula_label(mol: Chem.Mol) -> str:
    """A readable name for an unknown group: its Hill formula as a radical, e.g. C5H11."""
    counts: dict[str, int] = {}
    for atom in mol.GetAtoms():
        if atom.GetAtomicNum() == 0:
            continue
        counts[atom.GetSymbol()] = counts.get(atom.GetSymbol(), 0) + 1
        if atom.GetTotalNumHs():
            counts["H"] = counts.get("H", 0) + atom.GetTotalNumHs()
    order = (["C", "H"] if "C" in counts else []) + sorted(
        k for k in counts if k not in ("C", "H") or "C" not in counts
    )
    return "".join(f"{el}{counts[el] if counts[el] > 1 else ''}" for el in order)


def fragments(
    mol: Chem.Mol, bonds: list[tuple[int, int]], graph: MolGraph | None = None
) -> dict[tuple[int, int], str]:
    """Canonical fragment SMILES for each (ring atom, attached atom) bond.

    Most substituents are small trees (OH, OAc, CH2OH, iPr): for those a rooted-tree code, which
    is the same for two trees exactly when they are the same group, is written as SMILES and made
    canonical once per distinct code. Substituents with a ring of their own are cut off with RDKit."""
    graph = graph or MolGraph(mol)
    out: dict[tuple[int, int], str] = {}
    rest = []
    for r, s in bonds:
        code = _tree_code(graph, r, s)
        if code is None:
            rest.append((r, s))
        else:
            out[(r, s)] = _canonical_piece(code)
    if rest:
        out.update(_cut_fragments(mol, rest))
    return out


_BOND_SYMBOL = {1.0: "", 2.0: "=", 3.0: "#"}
_TREE_LIMIT = 40  # atoms; a larger substituent is cut off with RDKit instead


def _tree_code(graph: MolGraph, root: int, first: int) -> str | None:
    """'*' + SMILES of the substituent whose branches are sorted by their own code; None when the
    substituent has a ring, an unusual bond, or more than _TREE_LIMIT atoms. Hydrogens (also
    drawn ones, and isotopes of H) become H counts; isotopes and stereo inside the group are
    ignored, as in the A-value table."""
    budget = [_TREE_LIMIT]

    def code(idx: int, parent: int) -> str | None:
        budget[0] -= 1
        if budget[0] < 0 or idx in graph.ring_atoms:
            return None
        hydrogens = graph.hydrogens(idx)
        branches = []
        for other in graph.neighbours[idx]:
            if other == parent:
                continue
            if graph.z[other] == 1:
                hydrogens += 1
                continue
            symbol = _BOND_SYMBOL.get(graph.order[(idx, other)])
            below = None if symbol is None else code(other, idx)
            if symbol is None or below is None:
                return None
            branches.append(symbol + below)
        charge = graph.charge(idx)
        sign = "" if charge == 0 else (f"+{charge}" if charge > 0 else f"-{-charge}")
        head = f"[{graph.symbol(idx)}H{hydrogens}{sign}]"
        return head + "".join(f"({b})" for b in sorted(branches))

    symbol = _BOND_SYMBOL.get(graph.order[(root, first)])
    if symbol is None or graph.z[first] <= 1:
        return None
    body = code(first, root)
    return None if body is None else "*" + symbol + body


def _cut_fragments(mol: Chem.Mol, bonds: list[tuple[int, int]]) -> dict[tuple[int, int], str]:
    """Cut all the bonds at once; one SMILES of the whole cut molecule costs about as much as one
    fragment SMILES written from it, so the whole is written once and split at the dots."""
    indices = [mol.GetBondBetweenAtoms(r, s).GetIdx() for r, s in bonds]
    cut = Chem.FragmentOnBonds(mol, indices, addDummies=True, dummyLabels=[(0, 0)] * len(indices))
    owner: dict[int, int] = {}
    for k, piece in enumerate(Chem.GetMolFrags(cut, asMols=False, sanitizeFrags=False)):
        for atom in piece:
            owner[atom] = k
    text = Chem.MolToSmiles(cut, isomericSmiles=False, canonical=True)
    order = cut.GetProp("_smilesAtomOutputOrder").strip("[]").split(",")
    # pieces come out whole and one after the other: the k-th piece of the text is the k-th
    # fragment met in the output order
    seen: list[int] = []
    for a in order:
        if a and owner[int(a)] not in seen:
            seen.append(owner[int(a)])
    text_of = dict(zip(seen, text.split(".")))
    return {(r, s): _canonical_piece(text_of[owner[s]]) for r, s in bonds}


@cache
def _canonical_piece(smiles: str) -> str:
    try:
        return canonical_fragment(smiles)  # also drops hydrogens drawn as atoms (molfiles, AddHs)
    except ValueError:
        return smiles
