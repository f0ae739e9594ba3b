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
    size: int = 1  # heavy atoms (ranks the groups of one ring atom in r/c/t labels)

    def avalue(self, solvent: str, context: str | None) -> tuple[float, tables.AValue, bool]:
        """(value, row, context_matched). Falls back to the cyclohexane row."""
        if context is not None:
            for row in self.rows:
                if row.context == context and row.covers(solvent):
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
    """The general rows of a class's representative: its ring-position rows were measured or
    built for that group itself, not for the groups estimated by it."""
    return tuple(r for r in tables.avalues() if r.label == label and r.context is None)


@cache
def recognise(fragment: str) -> Group:
    """The group for a canonical fragment SMILES (with one '*')."""
    table = _table()
    rows = table.get(fragment)
    mol = Chem.MolFromSmiles(fragment)
    if mol is None:  # RDKit wrote it but cannot read it back: nothing to match, say so
        return Group(fragment.lstrip("*") or "?", fragment, "?", (_placeholder(fragment),), "unclassified")
    attached = _attached_element(mol)
    pair_class = "X" if attached in HALOGENS else attached
    size = sum(1 for a in mol.GetAtoms() if a.GetAtomicNum() > 1)
    if rows:
        return Group(rows[0].label, fragment, pair_class, tuple(rows), size=size)
    # a group without an A-value row is named by its usual label (labels.txt: NHAc, OBn) or its formula
    name = _drawing_labels().get(fragment) or _formula_label(mol)
    for cls, patt in _compiled_classes():
        if mol.HasSubstructMatch(patt):
            rows_ = _rows_by_label(cls.representative)
            return Group(name, fragment, cls.pair_class, rows_, cls.name, size=size)
    return Group(name, fragment, pair_class, (_placeholder(fragment),), "unclassified", size=size)


def _placeholder(fragment: str) -> tables.AValue:
    return tables.AValue("?", fragment, 1.0, None, None, ("placeholder",), "no class matched")


@cache
def _largest_table_group() -> int:
    """Heavy atoms of the largest group in the A-value table or labels.txt: a larger substituent
    cannot be named by either (and is matched to its class in place, which is cheaper)."""
    keys = list(_table()) + list(_drawing_labels())
    return max(sum(1 for a in Chem.MolFromSmiles(key).GetAtoms() if a.GetAtomicNum() > 1) for key in keys)


@cache
def _anchored_classes() -> tuple[tuple[tables.SubstituentClass, Chem.Mol], ...]:
    # the classes' SMARTS as written: the leading '*' (any atom) matches the ring atom itself
    return tuple((c, Chem.MolFromSmarts(c.smarts)) for c, _ in _compiled_classes())


def _large_group(mol: Chem.Mol, graph: MolGraph, ring_atom: int, first: int, atoms: list[int]) -> Group:
    """A substituent larger than any table group: its class is matched in place, on the molecule,
    with the pattern's first atom held on the ring atom (cutting it off costs more than this)."""
    attached = graph.symbol(first)
    pair_class = "X" if attached in HALOGENS else attached
    label = _hill(graph, atoms)
    fragment = f"*{label}"  # not a SMILES: a name for a group that is only estimated
    for cls, patt in _anchored_classes():
        for match in mol.GetSubstructMatches(patt, uniquify=False, maxMatches=100000):
            if match[0] == ring_atom and match[1] == first:
                rows = _rows_by_label(cls.representative)
                return Group(label, fragment, cls.pair_class, rows, cls.name, size=len(atoms))
    return Group(label, fragment, pair_class, (_placeholder(fragment),), "unclassified", size=len(atoms))


def _hill(graph: MolGraph, atoms: list[int]) -> str:
    counts: dict[str, int] = {}
    for a in atoms:
        counts[graph.symbol(a)] = counts.get(graph.symbol(a), 0) + 1
        counts["H"] = counts.get("H", 0) + graph.hydrogens(a)
    return _hill_text(counts)


def _hill_text(counts: dict[str, int]) -> str:
    counts = {k: v for k, v in counts.items() if v}
    order = (["C", "H"] if "C" in counts else []) + sorted(
        k for k in counts if k not in ("C", "H") or "C" not in counts
    )
    return "".join(f"{el}{counts[el] if counts[el] > 1 else ''}" for el in order if el in counts)


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
    return _hill_text(counts)


def substituent_groups(mol: Chem.Mol, graph: MolGraph, bonds: list[tuple[int, int]]) -> dict[tuple[int, int], Group]:
    """The Group of each (ring atom, attached atom) substituent."""
    out: dict[tuple[int, int], Group] = {}
    small = []
    for r, s in bonds:
        atoms = _substituent_atoms(graph, r, s)
        if len(atoms) > _largest_table_group():
            out[(r, s)] = _large_group(mol, graph, r, s, atoms)
        else:
            small.append((r, s))
    for bond, fragment in fragments(mol, small, graph).items():
        out[bond] = recognise(fragment)
    return out


def _substituent_atoms(graph: MolGraph, ring_atom: int, first: int) -> list[int]:
    """Heavy atoms of the substituent, breadth first."""
    seen = {ring_atom, first}
    out = [first]
    for idx in out:  # the list grows while it is walked
        for j in graph.neighbours[idx]:
            if j not in seen and graph.z[j] > 1:
                seen.add(j)
                out.append(j)
    return out


def fragments(mol: Chem.Mol, bonds: list[tuple[int, int]], graph: MolGraph | None = None) -> dict[tuple[int, int], str]:
    """Canonical fragment SMILES for each (ring atom, attached atom) bond.

    The substituent is written as SMILES from the graph (``_fragment_text``) and that text is
    made canonical by RDKit once per distinct text. Substituents with unusual bonds are cut off
    with RDKit."""
    graph = graph or MolGraph(mol)
    out: dict[tuple[int, int], str] = {}
    rest = []
    for r, s in bonds:
        text = _fragment_text(graph, r, s)
        piece = None if text is None else _canonical_piece(text)
        if piece is None:
            rest.append((r, s))
        else:
            out[(r, s)] = piece
    if rest:
        out.update(_cut_fragments(mol, rest))
    return out


_BOND_SYMBOL = {1.0: "-", 1.5: ":", 2.0: "=", 3.0: "#"}


def _atom_text(graph: MolGraph, idx: int) -> str:
    """A bracket atom with every hydrogen counted (also hydrogens drawn as atoms, and isotopes of
    H: isotopes and stereo inside a group are ignored, as in the A-value table)."""
    hydrogens = graph.hydrogens(idx) + sum(1 for j in graph.neighbours[idx] if graph.z[j] == 1)
    charge = graph.charge(idx)
    sign = "" if charge == 0 else (f"+{charge}" if charge > 0 else f"-{-charge}")
    symbol = graph.symbol(idx)
    if idx in graph.ring_atoms and any(graph.order[(idx, j)] == 1.5 for j in graph.neighbours[idx]):
        symbol = symbol.lower()
    return f"[{symbol}H{hydrogens}{sign}]"


def _fragment_text(graph: MolGraph, root: int, first: int) -> str | None:
    """'*' + SMILES of the substituent, written depth first with explicit bonds and ring-closure
    digits; None for a bond RDKit's SMILES could not carry (dative, zero-order). In an acyclic
    group the branches are sorted by their own text, so that the text is the same for two groups
    exactly when they are the same group (fewer texts for RDKit to make canonical)."""
    if graph.z[first] <= 1 or graph.order[(root, first)] not in _BOND_SYMBOL:
        return None
    if all(j == root or graph.z[j] <= 1 for j in graph.neighbours[first]):  # one heavy atom: OH, Me, F
        return "*" + _BOND_SYMBOL[graph.order[(root, first)]] + _atom_text(graph, first)
    children: dict[int, list[int]] = {}
    closures: set[frozenset[int]] = set()

    def visit(idx: int, parent: int) -> None:
        children[idx] = []
        for j in graph.neighbours[idx]:
            if j in (parent, root) or graph.z[j] <= 1:
                continue
            if j in children:
                closures.add(frozenset((idx, j)))  # in an undirected depth-first walk: a ring bond
            else:
                children[idx].append(j)
                visit(j, idx)

    visit(first, root)
    open_digits: dict[frozenset[int], int] = {}
    free = list(range(1, 100))

    def write(idx: int, parent: int) -> str | None:
        bond = _BOND_SYMBOL.get(graph.order[(parent, idx)])
        if bond is None:
            return None
        text = bond + _atom_text(graph, idx)
        for j in graph.neighbours[idx]:
            pair = frozenset((idx, j))
            if pair not in closures:
                continue
            if pair in open_digits:
                number = open_digits.pop(pair)
                text += _digit(number)
                free.append(number)
            else:
                closing = _BOND_SYMBOL.get(graph.order[(idx, j)])
                if closing is None:
                    return None
                number = free.pop(0)
                open_digits[pair] = number
                text += closing + _digit(number)
        branches = [write(child, idx) for child in children[idx]]
        if None in branches:
            return None
        if not closures:
            branches.sort()
        return text + "".join(f"({b})" for b in branches)

    body = write(first, root)
    return None if body is None else "*" + body


def _digit(number: int) -> str:
    return str(number) if number < 10 else f"%{number}"


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
    return {(r, s): _canonical_piece(text_of[owner[s]]) or text_of[owner[s]] for r, s in bonds}


@cache
def _canonical_piece(smiles: str) -> str | None:
    """Canonical form of a written fragment; None where RDKit cannot read it back (a dative
    bond written as a plain one), so that the group is cut off by RDKit instead."""
    try:
        return canonical_fragment(smiles)  # also drops hydrogens drawn as atoms (molfiles, AddHs)
    except ValueError:
        return None


@cache
def _drawing_labels() -> dict[str, str]:
    out = {}
    for label, group in tables.drawing_labels():
        out[_table_key(group)] = label
    return out


def drawing_label(fragment: str) -> str | None:
    """The condensed label of a group: its A-value table label, else its labels.txt name
    (NHAc, OBn, OBz ...), else None."""
    group = recognise(fragment)
    if group.estimated_as is None and group.label not in ("?",):
        return group.label
    return _drawing_labels().get(fragment)


@cache
def condensed_label(fragment: str, links: int = 2) -> str | None:
    """A condensed label for a group the A-value table has no row for: its labels.txt name
    (NHAc, OBn), or a named group behind one or two CH2 links (CH2OTBS, CH2OAc, CH2CH2OH,
    CH2OBn). None when there is none."""
    named = _drawing_labels().get(fragment)
    if named is not None:
        return named
    mol = Chem.MolFromSmiles(fragment)
    if mol is None:
        return None
    prefix = ""
    for _ in range(links):
        dummy = next((a for a in mol.GetAtoms() if a.GetAtomicNum() == 0), None)
        if dummy is None or dummy.GetDegree() != 1:
            return None
        link = dummy.GetNeighbors()[0]
        if not (
            link.GetSymbol() == "C"
            and link.GetDegree() == 2
            and link.GetTotalNumHs() == 2
            and not link.GetFormalCharge()
        ):
            return None
        rest = Chem.RWMol(mol)
        rest.GetAtomWithIdx(link.GetIdx()).SetAtomicNum(0)  # the CH2 becomes the new attachment point
        rest.GetAtomWithIdx(link.GetIdx()).SetNoImplicit(True)
        rest.RemoveAtom(dummy.GetIdx())
        try:
            Chem.SanitizeMol(rest)
        except (ValueError, RuntimeError):
            return None
        mol = rest.GetMol()
        prefix += "CH2"
        label = drawing_label(Chem.MolToSmiles(mol))
        # an alkyl or benzyl behind CH2 (CH2Et, CH2Bn) reads worse than the skeletal chain, and
        # CH2Bz is written CH2COPh: not offered
        if label is not None and label not in ("H", "D", "T", "Me", "Et", "iPr", "tBu", "Bn", "Bz", "Ph"):
            return prefix + label
    return None
