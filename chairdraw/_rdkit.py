"""The one place that knows RDKit's quirks.

* The stereo perception mode is fixed once, at import, because the legacy and the new mode give
  different canonical SMILES for the same molecule (and the new one keeps dependent ring centres).
* Iterating one of RDKit's wrapped C++ vectors or atom sequences with ``for`` ends in a
  translated C++ exception (StopIteration) that costs 5-10 us, as much as reading 20 atoms; the hot
  path indexes them instead (``items``, ``atomic_numbers``).
* RDKit writes its messages (and C++ stack traces) straight to file descriptor 2. We keep it quiet
  and, only when a parser has failed, parse again with the descriptor redirected, so that the
  message can be turned into one of ours.
"""

from __future__ import annotations

import os
import re
import tempfile
from collections.abc import Callable
from typing import TypeVar

from rdkit import Chem, RDLogger, rdBase

T = TypeVar("T")

Chem.SetUseLegacyStereoPerception(False)
RDLogger.DisableLog("rdApp.*")  # type: ignore[attr-defined]

RDKIT_VERSION = rdBase.rdkitVersion

_STAMP = re.compile(r"^\[\d\d:\d\d:\d\d\]\s?")


def captured(call: Callable[[], T]) -> tuple[T | None, list[str]]:
    """Run ``call`` with RDKit's log switched on and fd 2 captured; return (result, messages).

    Exceptions raised by RDKit are caught and their text joins the messages, the result then
    being None. Used only on the slow path after a parser has failed.
    """
    RDLogger.EnableLog("rdApp.error")  # type: ignore[attr-defined]
    RDLogger.EnableLog("rdApp.warning")  # type: ignore[attr-defined]
    result: T | None = None
    messages: list[str] = []
    with tempfile.TemporaryFile(mode="w+b") as sink:
        saved = os.dup(2)
        try:
            os.dup2(sink.fileno(), 2)
            try:
                result = call()
            except Exception as exc:  # RDKit raises assorted C++-wrapped types
                messages.append(str(exc))
        finally:
            os.dup2(saved, 2)
            os.close(saved)
            RDLogger.DisableLog("rdApp.*")  # type: ignore[attr-defined]
        sink.seek(0)
        text = sink.read().decode("utf-8", "replace").replace("\x00", "")
    messages = [*_useful_lines(text), *messages]
    return result, messages


def _useful_lines(text: str) -> list[str]:
    """Keep RDKit's own sentences; drop stack traces, banners and time stamps."""
    lines = []
    in_trace = False
    for raw in text.splitlines():
        line = _STAMP.sub("", raw).rstrip()
        if line.startswith("Stacktrace:"):
            in_trace = True
            continue
        if in_trace:
            if line.startswith("----------"):
                in_trace = False
            continue
        if not line.strip() or line.strip("*-") == "" or line.startswith(("Violation occurred", "Failed Expression")):
            continue
        if line in ("Post-condition Violation", "Pre-condition Violation", "Invariant Violation"):
            continue
        lines.append(line)
    # the same sentence often comes twice (once in the banner, once after it)
    seen: list[str] = []
    for line in lines:
        if line not in seen:
            seen.append(line)
    return seen


def standard_inchi(mol: Chem.Mol) -> str:
    """Standard InChI, the identity we compare structures by ('' when InChI refuses the molecule)."""
    try:
        return Chem.MolToInchi(mol) or ""
    except Exception:
        return ""


def items(sequence) -> list:
    """The elements of an RDKit vector (stereo groups, stereo info, ranks) without iterating it."""
    return [sequence[i] for i in range(len(sequence))]


def atomic_numbers(mol: Chem.Mol) -> list[int]:
    """Atomic number of every atom, by index (twice as fast as walking ``mol.GetAtoms()``)."""
    atom = mol.GetAtomWithIdx
    return [atom(i).GetAtomicNum() for i in range(mol.GetNumAtoms())]


def without_hs(mol: Chem.Mol) -> tuple[Chem.Mol, dict[int, int]]:
    """The molecule without its explicit H atoms, and where each kept atom went: RemoveHs
    renumbers the atoms after a removed H, and callers hold the input's numbers."""
    if not any(a.GetAtomicNum() == 1 for a in mol.GetAtoms()):
        return Chem.Mol(mol), {i: i for i in range(mol.GetNumAtoms())}
    tagged = Chem.Mol(mol)
    for atom in tagged.GetAtoms():
        atom.SetIntProp("_chairdraw_index", atom.GetIdx())
    heavy = Chem.RemoveHs(tagged, sanitize=False)
    heavy.UpdatePropertyCache(strict=False)  # without it an O that lost its H atom counts none
    return heavy, {a.GetIntProp("_chairdraw_index"): a.GetIdx() for a in heavy.GetAtoms()}


def layout_around(mol: Chem.Mol, pinned: dict) -> None:
    """RDKit's 2D layout of ``mol`` with the atoms in ``pinned`` ({index: Point2D}) kept where they
    are, and every stereo double bond then drawn the way it is: measured here, a layout with a
    coordMap put the O of an exocyclic oxime (CCN(CC)[C@@H]1CCCC/C1=N/O) on the wrong side. A
    wrong bond gets its free side reflected across the double bond's line."""
    from rdkit.Chem import rdDepictor

    rdDepictor.Compute2DCoords(mol, coordMap=pinned)
    stereo = [
        b.GetIdx()
        for b in mol.GetBonds()
        if b.GetBondType() == Chem.BondType.DOUBLE and b.GetStereo() != Chem.BondStereo.STEREONONE
    ]
    if not stereo:
        return
    wanted = _double_bond_labels(mol)
    drawn = _double_bond_labels(_stereo_from_2d(mol))
    conf = mol.GetConformer()
    moved: set[int] = set()
    for idx in stereo:
        if wanted.get(idx) is None or drawn.get(idx) in (None, wanted[idx]):
            continue
        bond = mol.GetBondWithIdx(idx)
        a, b = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        for near, far in ((a, b), (b, a)):
            side = _side(mol, far, near)
            if side is not None and not side & pinned.keys():
                _reflect(conf, side, conf.GetAtomPosition(near), conf.GetAtomPosition(far))
                moved |= side | {near, far}
                break
    if moved:  # lay the rest out again around the mended bonds, so that nothing lands on them
        from rdkit.Geometry import Point2D

        again = dict(pinned)
        for i in moved:
            p = conf.GetAtomPosition(i)
            again[i] = Point2D(p.x, p.y)
        rdDepictor.Compute2DCoords(mol, coordMap=again)


def _double_bond_labels(mol: Chem.Mol) -> dict[int, str]:
    from rdkit.Chem import rdCIPLabeler

    labelled = Chem.Mol(mol)
    try:
        rdCIPLabeler.AssignCIPLabels(labelled)
    except (RuntimeError, ValueError):
        return {}
    return {b.GetIdx(): b.GetProp("_CIPCode") for b in labelled.GetBonds() if b.HasProp("_CIPCode")}


def _stereo_from_2d(mol: Chem.Mol) -> Chem.Mol:
    out = Chem.Mol(mol)
    for b in out.GetBonds():
        if b.GetBondType() == Chem.BondType.DOUBLE:
            b.SetStereo(Chem.BondStereo.STEREONONE)
    Chem.DetectBondStereochemistry(out, out.GetConformer().GetId())
    Chem.AssignStereochemistry(out, cleanIt=True, force=True)
    return out


def _side(mol: Chem.Mol, start: int, blocked: int) -> set[int] | None:
    """Atoms reached from ``start`` without passing ``blocked``; None when the two are in one ring."""
    seen = {start}
    todo = [start]
    while todo:
        atom = mol.GetAtomWithIdx(todo.pop())
        for n in atom.GetNeighbors():
            j = n.GetIdx()
            if j == blocked and atom.GetIdx() != start:
                return None
            if j != blocked and j not in seen:
                seen.add(j)
                todo.append(j)
    return seen - {start} or set()


def _reflect(conf, atoms: set[int], p, q) -> None:
    """Mirror ``atoms`` across the line through p and q."""
    dx, dy = q.x - p.x, q.y - p.y
    norm = (dx * dx + dy * dy) or 1.0
    for i in atoms:
        r = conf.GetAtomPosition(i)
        t = ((r.x - p.x) * dx + (r.y - p.y) * dy) / norm
        fx, fy = p.x + t * dx, p.y + t * dy
        conf.SetAtomPosition(i, (2 * fx - r.x, 2 * fy - r.y, r.z))
