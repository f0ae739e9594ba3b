"""Groups too large or too irregular for a condensed label, drawn as skeletal fragments.

RDKit lays the rest of the molecule out around the fixed chair (``Compute2DCoords`` keeps the
atoms given in ``coordMap`` exactly, with RDKit's own 2D layout left at its default); here the
chair's ring atoms and the first atom of each such group are pinned where the chair drawing puts
them, and the group's atoms and bonds are drawn from the result: carbon unlabelled, heteroatoms
with their hydrogens, multiple bonds as parallel lines.
"""

from __future__ import annotations

import math

from rdkit import Chem
from rdkit.Chem import rdDepictor
from rdkit.Geometry import Point2D

from ._rdkit import layout_around, without_hs
from .labels import NORMAL, SUB, SUP
from .layout import Point, Polygon, Stroke, Text, TextRun, anchored_label, bond_lines, symbol_box, trimmed
from .render import text as fonttext
from .render.style import Style

MAX_ATOMS = 40  # a larger group keeps its formula label: a whole second molecule is not a substituent
RDKIT_BOND = 1.5  # RDKit's depiction bond length


def group_atoms(mol: Chem.Mol, ring_atom: int, first: int) -> list[int]:
    """Atoms reached from ``first`` without passing through ``ring_atom``: heavy atoms and
    isotopic hydrogens (D, T are drawn; plain H atoms are not)."""
    seen = {ring_atom, first}
    out = [first]
    for idx in out:
        for nbr in mol.GetAtomWithIdx(idx).GetNeighbors():
            j = nbr.GetIdx()
            if j not in seen and (nbr.GetAtomicNum() > 1 or nbr.GetIsotope()):
                seen.add(j)
                out.append(j)
    return out


def hidden_by_a_label(mol: Chem.Mol, ring_atom: int, first: int) -> bool:
    """Whether a group carries something a condensed label cannot show: a stereocentre, a
    stereo double bond, an isotope or an unpaired electron (it is then drawn, not written)."""
    atoms = set(group_atoms(mol, ring_atom, first))
    for i in atoms:
        atom = mol.GetAtomWithIdx(i)
        if atom.GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED or atom.GetIsotope() or atom.GetNumRadicalElectrons():
            return True
        if any(n.GetAtomicNum() == 1 and n.GetIsotope() for n in atom.GetNeighbors()):
            return True
    return any(
        b.GetStereo() != Chem.BondStereo.STEREONONE
        for b in mol.GetBonds()
        if b.GetBeginAtomIdx() in atoms | {ring_atom} and b.GetEndAtomIdx() in atoms | {ring_atom}
    )


def draw_groups(
    mol: Chem.Mol,
    ring_points: dict[int, Point],
    groups: list[tuple[int, int, Point]],
    bond_pt: float,
    style: Style,
    ring_boxes: dict[int, tuple[float, float, float, float]],
) -> tuple[list[Stroke], list[Text], list[Polygon]]:
    """Strokes, texts and wedges of each group (ring atom, first atom, where the first atom
    goes), laid out around the pinned chair; ``bond_pt`` is the drawn length of a bond in points."""
    k = RDKIT_BOND / bond_pt
    heavy, new = without_hs(mol)  # the caller's atom numbers are the input's: translated here
    ring_points = {new[a]: p for a, p in ring_points.items()}
    groups = [(new[r], new[f], p) for r, f, p in groups]
    ring_boxes = {new[a]: b for a, b in ring_boxes.items()}
    pinned = {a: Point2D(x * k, -y * k) for a, (x, y) in ring_points.items()}
    for _, first, (x, y) in groups:
        pinned[first] = Point2D(x * k, -y * k)
    try:
        Chem.Kekulize(heavy, clearAromaticFlags=True)
    except Chem.KekulizeException:
        pass  # drawn with the bond orders as they are
    layout_around(heavy, pinned)
    conf = heavy.GetConformer()
    # stereocentres inside a group keep their configuration on the page as wedges and hashes; the
    # chair's own atoms get none (the chair drawing itself shows their configuration)
    for a in ring_points:
        heavy.GetAtomWithIdx(a).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    Chem.WedgeMolBonds(heavy, conf)

    def at(i: int) -> Point:
        if i in ring_points:
            return ring_points[i]
        p = conf.GetAtomPosition(i)
        return p.x / k, -p.y / k

    strokes: list[Stroke] = []
    texts: list[Text] = []
    wedges: list[Polygon] = []
    for ring_atom, first, _ in groups:
        atoms = group_atoms(heavy, ring_atom, first)
        drawn = _draw(heavy, at, atoms, {ring_atom}, dict(ring_boxes), bond_pt, style)
        strokes += drawn[0]
        texts += drawn[1]
        wedges += drawn[2]
    return strokes, texts, wedges


def draw_flat(mol: Chem.Mol, bond_pt: float, style: Style) -> tuple[list[Stroke], list[Text], list[Polygon]]:
    """The flat input as chemists draw it: rings as regular polygons, wedges and hashes. A molfile's
    own coordinates and wedges are kept; otherwise RDKit lays it out and picks the wedges."""
    flat = mol.GetNumConformers() and not mol.GetConformer().Is3D()
    if flat and any(b.HasProp("_MolFileBondStereo") or b.HasProp("_MolFileBondCfg") for b in mol.GetBonds()):
        # a drawing: its own coordinates and wedges, explicit H atoms included (they may carry
        # the wedges), exactly as the author drew them
        heavy = Chem.Mol(mol)
        Chem.ReapplyMolBlockWedging(heavy)
    else:
        heavy = without_hs(mol)[0]
        if not flat:
            rdDepictor.Compute2DCoords(heavy)
        Chem.WedgeMolBonds(heavy, heavy.GetConformer())
    wedging = {b.GetIdx(): b.GetBondDir() for b in heavy.GetBonds()}
    try:
        Chem.Kekulize(heavy, clearAromaticFlags=True)
    except Chem.KekulizeException:
        pass
    for b in heavy.GetBonds():  # kekulizing can clear directions; the drawn wedges are the ones chosen above
        b.SetBondDir(wedging[b.GetIdx()])
    conf = heavy.GetConformer()
    lengths = [
        (conf.GetAtomPosition(b.GetBeginAtomIdx()) - conf.GetAtomPosition(b.GetEndAtomIdx())).Length()
        for b in heavy.GetBonds()
    ]
    k = (sum(lengths) / len(lengths) if lengths else 1.0) / bond_pt

    def at(i: int) -> Point:
        p = conf.GetAtomPosition(i)
        return p.x / k, -p.y / k

    return _draw(heavy, at, list(range(heavy.GetNumAtoms())), set(), {}, bond_pt, style)


def _draw(heavy: Chem.Mol, at, atoms: list[int], anchors: set[int], boxes: dict, bond_pt: float, style: Style):
    """Atoms ``atoms`` of ``heavy`` at ``at(i)``, with their bonds among themselves and to the
    already drawn ``anchors`` (whose label boxes are in ``boxes``, keyed by atom)."""
    strokes: list[Stroke] = []
    texts: list[Text] = []
    wedges: list[Polygon] = []
    inside = set(atoms)
    for i in atoms:
        atom = heavy.GetAtomWithIdx(i)
        special = atom.GetFormalCharge() or atom.GetIsotope() or atom.GetNumRadicalElectrons()
        if atom.GetSymbol() == "C" and not special and atom.GetDegree() > 0:
            continue
        here = at(i)
        # an atom's H goes on the side its bonds do not leave from (HN when the bonds go right)
        xs = [at(n.GetIdx())[0] for n in atom.GetNeighbors()]
        right = sum(1 for x in xs if x > here[0] + 0.3 * bond_pt)
        left = sum(1 for x in xs if x < here[0] - 0.3 * bond_pt)
        if left and right and atom.GetTotalNumHs():
            # bonds on both sides: the H goes above or below, where no bond leaves
            ys = [at(n.GetIdx())[1] for n in atom.GetNeighbors()]
            below = sum(1 for y in ys if y > here[1]) <= sum(1 for y in ys if y < here[1])
            texts.append(_hydrogens_off_axis(atom, here, below, style))
            runs, span = _atom_runs(atom, h_first=False, hydrogens=False)
        else:
            runs, span = _atom_runs(atom, h_first=right > left)
        text = anchored_label(runs, span, here, style.font_size, font=style.font)
        texts.append(text)
        x0, y0, x1, y1 = symbol_box(text, span, style.label_gap)
        if atom.GetFormalCharge():  # the charge sits up and right of the symbol: bonds stop short of it too
            x1 = max(x1, text.extent()[2] + style.label_gap)
            y0 = min(y0, text.extent()[1] - style.label_gap)
        boxes[i] = (x0, y0, x1, y1)
    for bond in heavy.GetBonds():
        a, b = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if not ((a in inside or a in anchors) and (b in inside or b in anchors)) or (a in anchors and b in anchors):
            continue
        order = {Chem.BondType.DOUBLE: 2, Chem.BondType.TRIPLE: 3}.get(bond.GetBondType(), 1)
        pa, pb = at(a), at(b)
        direction = bond.GetBondDir()
        if direction in (Chem.BondDir.BEGINWEDGE, Chem.BondDir.BEGINDASH):
            lines, polygon = _wedge(pa, pb, direction == Chem.BondDir.BEGINWEDGE, boxes.get(a), boxes.get(b), style)
            strokes += lines
            wedges += polygon
        elif direction == Chem.BondDir.UNKNOWN:
            strokes += _wavy(pa, pb, boxes.get(a), boxes.get(b), style)
        else:
            centre = _ring_centre(heavy, bond, at) if order == 2 and bond.IsInRing() else None
            strokes += bond_lines(pa, pb, order, boxes.get(a), boxes.get(b), bond_pt, style.line_width, centre)
    return strokes, texts, wedges


def _ring_centre(heavy: Chem.Mol, bond: Chem.Bond, at) -> Point | None:
    """Centre of the smallest ring holding ``bond``, as drawn."""
    rings = [r for r in heavy.GetRingInfo().BondRings() if bond.GetIdx() in r]
    if not rings:
        return None
    atoms = {
        i
        for b in min(rings, key=len)
        for i in (heavy.GetBondWithIdx(b).GetBeginAtomIdx(), heavy.GetBondWithIdx(b).GetEndAtomIdx())
    }
    points = [at(i) for i in atoms]
    return sum(p[0] for p in points) / len(points), sum(p[1] for p in points) / len(points)


def _wavy(a: Point, b: Point, box_a, box_b, style: Style) -> list[Stroke]:
    """A wavy bond (unknown configuration) as a small zigzag."""
    start, end = trimmed(a, b, box_a, box_b)
    length = math.dist(start, end) or 1.0
    nx, ny = -(end[1] - start[1]) / length * 1.2, (end[0] - start[0]) / length * 1.2
    steps = max(4, int(length / 2.0))
    points = []
    for n in range(steps + 1):
        t = n / steps
        side = 0 if n in (0, steps) else (1 if n % 2 else -1)
        points.append((start[0] + (end[0] - start[0]) * t + nx * side, start[1] + (end[1] - start[1]) * t + ny * side))
    return [Stroke(p, q, style.line_width, "wavy") for p, q in zip(points, points[1:])]


WEDGE_WIDTH = 2.4  # pt at the wide end (about a sixth of the bond length, common practice)
HASH_LINES = 6


def _wedge(a: Point, b: Point, solid: bool, box_a, box_b, style: Style) -> tuple[list[Stroke], list[Polygon]]:
    """A wedge (solid) or hash from a (narrow end, the stereocentre) to b."""
    start, end = trimmed(a, b, box_a, box_b)
    length = math.dist(start, end) or 1.0
    nx, ny = -(end[1] - start[1]) / length * WEDGE_WIDTH / 2, (end[0] - start[0]) / length * WEDGE_WIDTH / 2
    if solid:
        return [], [Polygon((start, (end[0] + nx, end[1] + ny), (end[0] - nx, end[1] - ny)), "wedge")]
    lines = []
    for n in range(1, HASH_LINES + 1):
        t = n / HASH_LINES
        c = (start[0] + (end[0] - start[0]) * t, start[1] + (end[1] - start[1]) * t)
        lines.append(Stroke((c[0] + nx * t, c[1] + ny * t), (c[0] - nx * t, c[1] - ny * t), style.line_width, "hash"))
    return lines, []


def _hydrogens_off_axis(atom: Chem.Atom, here: Point, below: bool, style: Style) -> Text:
    h = atom.GetTotalNumHs()
    runs = (TextRun("H", NORMAL),) + ((TextRun(str(h), SUB),) if h > 1 else ())
    step = fonttext.metrics("regular", style.font).cap_height * style.font_size + 2 * style.label_gap
    centre = (here[0], here[1] + (step if below else -step))
    return anchored_label(runs, (0, 1), centre, style.font_size, font=style.font)


def _atom_runs(
    atom: Chem.Atom, h_first: bool = False, hydrogens: bool = True
) -> tuple[tuple[TextRun, ...], tuple[int, int]]:
    """Runs of a heteroatom's label with its H count, and the span of the element symbol (an
    isotope: D, T, or its mass number as a superscript, 13C)."""
    symbol = atom.GetSymbol()
    if atom.GetAtomicNum() == 1 and atom.GetIsotope() in (2, 3):
        symbol = "D" if atom.GetIsotope() == 2 else "T"
    elif atom.GetIsotope():
        mass = str(atom.GetIsotope())
        runs0 = (TextRun(mass, SUP), TextRun(symbol, NORMAL))
        h = atom.GetTotalNumHs() if hydrogens else 0
        tail = ((TextRun("H", NORMAL),) + ((TextRun(str(h), SUB),) if h > 1 else ())) if h else ()
        return runs0 + tail, (len(mass), len(mass) + len(symbol))
    h = atom.GetTotalNumHs() if hydrogens else 0
    h_runs = [TextRun("H", NORMAL)] + ([TextRun(str(h), SUB)] if h > 1 else []) if h else []
    runs: list[TextRun]
    if h_first and h_runs:
        runs = h_runs + [TextRun(symbol, NORMAL)]
        start = 1 + (len(str(h)) if h > 1 else 0)
    else:
        runs = [TextRun(symbol, NORMAL)] + h_runs
        start = 0
    charge = atom.GetFormalCharge()
    if charge:
        sign = "+" if charge > 0 else "\u2212"
        runs.append(TextRun((str(abs(charge)) if abs(charge) > 1 else "") + sign, SUP))
    if atom.GetNumRadicalElectrons():
        runs.append(TextRun("\u2022" * atom.GetNumRadicalElectrons(), SUP))  # a radical: the dot
    merged: list[TextRun] = []
    for r in runs:
        if merged and merged[-1].kind == r.kind:
            merged[-1] = TextRun(merged[-1].text + r.text, r.kind)
        else:
            merged.append(r)
    return tuple(merged), (start, start + len(symbol))
