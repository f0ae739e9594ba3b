"""The atom and bond facts the pipeline reads, copied out of RDKit once per molecule.

Every RDKit accessor called from Python costs about half a microsecond, and walking ring
neighbourhoods and substituents atom by atom called thousands of them per molecule. The adjacency
matrix with bond orders comes out of RDKit in one call; what else is needed is read lazily, per
atom, and kept.
"""

from __future__ import annotations

from rdkit import Chem

from ._rdkit import atomic_numbers, items

_TABLE = Chem.GetPeriodicTable()
_SYMBOLS: dict[int, str] = {}


def element_symbol(z: int) -> str:
    if z not in _SYMBOLS:
        _SYMBOLS[z] = "*" if z == 0 else _TABLE.GetElementSymbol(z)
    return _SYMBOLS[z]


class MolGraph:
    """Neighbours, bond orders (1, 1.5, 2, 3) and atomic numbers of a molecule, as Python data."""

    __slots__ = ("mol", "z", "neighbours", "order", "rings", "ring_atoms", "_hydrogens", "_charges")

    def __init__(self, mol: Chem.Mol):
        self.mol = mol
        n = mol.GetNumAtoms()
        self.neighbours: list[list[int]] = [[] for _ in range(n)]
        self.order: dict[tuple[int, int], float] = {}
        adjacency = Chem.GetAdjacencyMatrix(mol, useBO=True)
        rows, cols = adjacency.nonzero()
        if len(rows) == 2 * mol.GetNumBonds():
            for i, j, v in zip(rows.tolist(), cols.tolist(), adjacency[rows, cols].tolist()):
                self.neighbours[i].append(j)
                self.order[(i, j)] = v
        else:  # a bond of order 0 (dative, ionic, zero-order) is missing from the matrix
            for bond in mol.GetBonds():
                i, j, v = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx(), bond.GetBondTypeAsDouble()
                self.neighbours[i].append(j)
                self.neighbours[j].append(i)
                self.order[(i, j)] = self.order[(j, i)] = v
        self.z = atomic_numbers(mol)
        self.rings = [tuple(r) for r in items(mol.GetRingInfo().AtomRings())]  # the smallest set of rings
        self.ring_atoms = {a for ring in self.rings for a in ring}
        self._hydrogens: dict[int, int] = {}
        self._charges: dict[int, int] = {}

    def symbol(self, i: int) -> str:
        return element_symbol(self.z[i])

    def hydrogens(self, i: int) -> int:
        """Hydrogens that are not atoms of the graph (implicit and explicit counts)."""
        if i not in self._hydrogens:
            self._hydrogens[i] = self.mol.GetAtomWithIdx(i).GetTotalNumHs()
        return self._hydrogens[i]

    def charge(self, i: int) -> int:
        if i not in self._charges:
            self._charges[i] = self.mol.GetAtomWithIdx(i).GetFormalCharge()
        return self._charges[i]
