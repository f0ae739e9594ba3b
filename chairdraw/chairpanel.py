"""One chair of one ring as geometry: the ring, its groups and their labels, in points (y down).

The chair picture comes from ``layout.ring_picture``. Each group is a bond with a condensed label,
or a skeletal fragment (``skeletal``) when it has no label of its own. A label that would touch
what is already drawn gets a shorter or longer bond (``LENGTHS``); if something still touches, the
figure draws every chair larger (``needed_scale``), so that all chairs of a figure share one size.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field

from rdkit import Chem

from .errors import FigureError
from .labels import DRAWN_AS, NORMAL, ON_NITROGEN, SUP, can_parse
from .layout import (
    Point,
    Polygon,
    Stroke,
    Text,
    TextRun,
    anchored_label,
    bond_lines,
    clashes,
    clip_to_box,
    label_runs,
    ring_picture,
    segment_hits_box,
    symbol_box,
    trimmed,
    unit_vector,
)
from .molgraph import MolGraph
from .render.style import CHAIRS, Style
from .results import Analysis, Chair, RingResult
from .skeletal import MAX_ATOMS as MAX_SKELETAL_ATOMS
from .skeletal import draw_groups, group_atoms, hidden_by_a_label
from .substituents import condensed_label, fragments, substituent_groups

# chairs are drawn larger, in these steps, until no label touches a bond or another label
CHAIR_SCALES = (1.0, 1.12, 1.25, 1.4, 1.6, 1.8, 2.0, 2.3, 2.6)
LENGTHS = (1.0, 0.85, 1.2, 0.7, 1.4, 1.65)  # of the bond length, tried in turn where a label touches
LABEL_CLEARANCE = 2.0  # pt kept free around a group's label when placing it (the final check allows 0)
H_CLEARANCE = 0.6  # pt around an H: it is small, and it is left out where it does not fit
MAX_LABEL = 8  # characters; a longer condensed label is drawn as a skeletal fragment
H_BOND = 0.8  # bonds to H are drawn shorter: less clutter beside the groups that matter


@dataclass
class Panel:
    strokes: list[Stroke] = field(default_factory=list)
    texts: list[Text] = field(default_factory=list)
    polygons: list[Polygon] = field(default_factory=list)
    # where the drawing puts each atom (ring atoms, and the first atom of each drawn group, keyed
    # (ring atom, group atom or None for H)): what a chair molfile or a 3D rebuild reads
    atoms: dict = field(default_factory=dict)
    # what each position is drawn as, keyed like ``atoms``: its label, or None for a skeletal group
    shown_as: dict = field(default_factory=dict)

    def box(self) -> tuple[float, float, float, float]:
        xs, ys = [], []
        for s in self.strokes:
            xs += [s.start[0], s.end[0]]
            ys += [s.start[1], s.end[1]]
        for t in self.texts:
            x0, y0, x1, y1 = t.extent()
            xs += [x0, x1]
            ys += [y0, y1]
        for p in self.polygons:
            xs += [q[0] for q in p.points]
            ys += [q[1] for q in p.points]
        return min(xs), min(ys), max(xs), max(ys)

    def moved(self, dx: float, dy: float) -> Panel:
        def mv(p: Point) -> Point:
            return p[0] + dx, p[1] + dy

        return Panel(
            [Stroke(mv(s.start), mv(s.end), s.width, s.role, s.depth) for s in self.strokes],
            [dataclasses.replace(t, x=t.x + dx, y=t.y + dy) for t in self.texts],
            [Polygon(tuple(mv(q) for q in p.points), p.role) for p in self.polygons],
            shown_as=dict(self.shown_as),
        )

    def add(self, other: Panel) -> None:
        self.strokes += other.strokes
        self.texts += other.texts
        self.polygons += other.polygons


def needed_scale(
    analysis: Analysis, chairs: list[tuple[RingResult, Chair]], style: Style, made: dict | None = None
) -> float:
    """One scale for all ``chairs`` (ring result, chair) of a figure: the smallest of
    CHAIR_SCALES at which nothing in any of them touches; where there is none, the one with the
    fewest clashes (the smaller on a tie). ``style.chair_scale``, when set, wins. Panels made on
    the way are kept in ``made`` (see ``chair_panel``)."""
    if style.chair_scale:
        return style.chair_scale
    best = (math.inf, CHAIR_SCALES[0])
    for scale in CHAIR_SCALES:
        count = 0
        for ring, chair in chairs:
            panel = chair_panel(analysis, ring, chair, style, scale, made)[0]
            count += len(clashes(panel.strokes, panel.texts))
        if count == 0:
            return scale
        best = min(best, (count, scale))
    return best[1]


def chair_panel(
    analysis: Analysis,
    ring: RingResult,
    chair: Chair,
    style: Style,
    scale: float | None = None,
    made: dict | None = None,
) -> tuple[Panel, Point]:
    """One chair with its substituents, and the centre of its ring (both in points, y down), at
    ``scale`` times the style's bond length (by default the scale ``needed_scale`` finds). With
    ``made`` (a dict that lives as long as one figure is being built), a panel is made once."""
    if scale is None:
        scale = needed_scale(analysis, [(ring, chair)], style, made)
    if made is None:
        return _chair_at(analysis, ring, chair, style, scale)
    key = (id(ring), id(chair), scale)
    if key not in made:
        made[key] = _chair_at(analysis, ring, chair, style, scale)
    return made[key]


def _chair_at(analysis: Analysis, ring: RingResult, chair: Chair, style: Style, scale: float) -> tuple[Panel, Point]:
    mol = analysis.mol
    first = next((k for k, loc in enumerate(ring.locants) if loc.lstrip("CONS") == "1"), 0)
    g = ring_picture(tuple(a in chair.up_atoms for a in ring.atoms), first)  # indexed by ring index
    mean_bond = sum(math.dist(g.points[k], g.points[(k + 1) % 6]) for k in range(6)) / 6
    s = style.bond_length * scale / mean_bond  # ring bonds as drawn average the style's bond length
    at = [(g.points[k][0] * s, -g.points[k][1] * s) for k in range(6)]
    depth = list(g.depth)
    panel = Panel()
    pad = style.label_gap
    ring_boxes: dict[int, tuple[float, float, float, float]] = {}
    for k, atom_idx in enumerate(ring.atoms):
        atom = mol.GetAtomWithIdx(atom_idx)
        if atom.GetSymbol() == "C":
            continue
        charge = atom.GetFormalCharge()
        runs = (TextRun(atom.GetSymbol(), NORMAL),) + (
            (TextRun("+" if charge > 0 else "\u2212", SUP),) if charge else ()
        )
        text = anchored_label(runs, (0, len(atom.GetSymbol())), at[k], style.font_size, "atom", style.font)
        panel.texts.append(text)
        x0, y0, x1, y1 = text.extent()  # the charge too: ring bonds stop short of all of it
        ring_boxes[k] = (x0 - pad, y0 - pad, x1 + pad, y1 + pad)
    for k in range(6):
        a, b = at[k], at[(k + 1) % 6]
        start, end = trimmed(a, b, ring_boxes.get(k), ring_boxes.get((k + 1) % 6))
        panel.strokes.append(Stroke(start, end, style.line_width, "ring", (depth[k] + depth[(k + 1) % 6]) / 2))
    stereo_atoms = {c.atom for c in ring.stereo}
    skeletal: list[tuple[int, int, Point]] = []
    labelled: list[tuple] = []  # arguments of _bond_with_label, drawn after the skeletal groups
    hetero_atoms = {a for a in ring.atoms if mol.GetAtomWithIdx(a).GetSymbol() != "C"}
    for p in chair.positions:
        k = ring.atoms.index(p.ring_atom)
        if p.label == "lone pair":
            continue
        axial = p.orientation == "axial"
        if axial and (p.face == "top") != g.up[k]:
            raise FigureError(
                f"position at ring atom {p.ring_atom} is axial on the {p.face} face of an atom pointing the other way"
            )
        d = g.axial[k] if axial else g.equatorial[k]
        direction = (d[0], -d[1])
        length = style.bond_length * scale * (H_BOND if p.label == "H" else 1.0)
        # recorded for every position, drawn or not (the chair molfile puts H on stereocentres)
        panel.atoms[(p.ring_atom, p.atom)] = (at[k][0] + direction[0] * length, at[k][1] + direction[1] * length)
        if not _shown(p.label, ring.atoms[k] in hetero_atoms, p.ring_atom in stereo_atoms, style):
            continue
        eq_depth = depth[k] + (0.5 if not axial else 0)
        label, formula = p.label, p.estimated
        if p.atom is not None and _skeletal(p, mol):
            condensed = _condensed(mol, p.ring_atom, p.atom)
            if condensed is None:
                skeletal.append((p.ring_atom, p.atom, panel.atoms[(p.ring_atom, p.atom)]))
                panel.shown_as[(p.ring_atom, p.atom)] = None
                continue
            label, formula = condensed, False
        panel.shown_as[(p.ring_atom, p.atom)] = DRAWN_AS.get(label, label)
        labelled.append((at[k], direction, length, label, ring_boxes.get(k), eq_depth, False, formula))
    drawn = {(p.ring_atom, p.atom) for p in chair.positions}
    for atom_idx in ring.trigonal_atoms:
        # a C=O, C=CH2 or the group on a planar N: in the ring's plane, along the outer bisector
        k = ring.atoms.index(atom_idx)
        u1 = unit_vector((at[(k - 1) % 6][0] - at[k][0], at[(k - 1) % 6][1] - at[k][1]))
        u2 = unit_vector((at[(k + 1) % 6][0] - at[k][0], at[(k + 1) % 6][1] - at[k][1]))
        out = unit_vector((-(u1[0] + u2[0]), -(u1[1] + u2[1])))
        for label, double, other, estimated in _flat_groups(mol, atom_idx, set(ring.atoms), drawn):
            reach = style.bond_length * scale
            end = (at[k][0] + out[0] * reach, at[k][1] + out[1] * reach)
            panel.atoms[(atom_idx, other)] = end
            if estimated or not _has_a_label(label):
                condensed = None if double else _condensed(mol, atom_idx, other)
                if condensed is not None:
                    label, estimated = condensed, False
                elif len(group_atoms(mol, atom_idx, other)) <= MAX_SKELETAL_ATOMS:
                    skeletal.append((atom_idx, other, end))
                    continue
            if ring.atoms[k] in hetero_atoms and mol.GetAtomWithIdx(atom_idx).GetSymbol() == "N":
                label = ON_NITROGEN.get(label, label)
            labelled.append((at[k], out, reach, label, ring_boxes.get(k), depth[k], double, estimated))
    # skeletal groups first (RDKit places their atoms), then labels around them, H last: an H
    # label gives way (a shorter or longer bond, or none) to the groups around it
    if skeletal:
        strokes, texts, wedges = draw_groups(
            mol,
            {a: at[k] for k, a in enumerate(ring.atoms)},
            skeletal,
            style.bond_length * scale,
            style,
            {ring.atoms[k]: box for k, box in ring_boxes.items()},
        )
        panel.strokes += strokes
        panel.texts += texts
        panel.polygons += wedges
    for start, direction, length, label, box, bond_depth, double, formula in sorted(
        labelled, key=lambda a: a[3] == "H"
    ):
        _bond_with_label(panel, start, direction, length, label, box, bond_depth, style, double, formula)
    if style.numbering:
        _number(panel, ring, at, style.bond_length * scale, style)
    for k, atom_idx in enumerate(ring.atoms):
        panel.atoms[(atom_idx, atom_idx)] = at[k]
    centre = (sum(x for x, _ in at) / 6, sum(y for _, y in at) / 6)
    return panel, centre


def _number(panel: Panel, ring: RingResult, at: list[Point], bond: float, style: Style) -> None:
    """Ring locants inside the V of their atoms (between its two ring bonds), or the nearest free
    spot around it; a sugar's ring O, written as O already, gets none."""
    size = style.caption_size * 0.75
    for k, locant in enumerate(ring.locants):
        if not locant[0].isdigit() and not locant.startswith("C"):
            continue
        number = locant.lstrip("C")
        runs = (TextRun(number, NORMAL),)
        u1 = unit_vector((at[k - 1][0] - at[k][0], at[k - 1][1] - at[k][1]))
        u2 = unit_vector((at[(k + 1) % 6][0] - at[k][0], at[(k + 1) % 6][1] - at[k][1]))
        inside = math.degrees(math.atan2(u1[1] + u2[1], u1[0] + u2[0]))
        best: tuple[int, Text] | None = None
        for turn in (0, 25, -25, 50, -50, 80, -80, 180):
            for reach in (0.3, 0.42):
                angle = math.radians(inside + turn)
                c = (at[k][0] + math.cos(angle) * reach * bond, at[k][1] + math.sin(angle) * reach * bond)
                text = anchored_label(runs, (0, len(number)), c, size, "locant", style.font)
                touching = len(clashes(panel.strokes, [text], tolerance=-0.5, others=panel.texts))
                if best is None or touching < best[0]:
                    best = (touching, text)
                if not touching:
                    break
            if best is not None and best[0] == 0:
                break
        assert best is not None
        panel.texts.append(best[1])  # a locant is never left out: at worst where it touches least


def _condensed(mol: Chem.Mol, ring_atom: int, atom: int) -> str | None:
    """A condensed label (CH2OTBS, CH2OAc) for a group with no table label, unless the group has
    stereocentres of its own (a label cannot show them: it is then drawn skeletal, wedged)."""
    atoms = group_atoms(mol, ring_atom, atom)
    if any(mol.GetAtomWithIdx(a).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED for a in atoms):
        return None
    label = condensed_label(fragments(mol, [(ring_atom, atom)])[(ring_atom, atom)])
    return label if label is not None and can_parse(label) else None


def _skeletal(position, mol: Chem.Mol) -> bool:
    """Whether a group is drawn as a skeletal fragment: it has no condensed label of its own (it
    was estimated by class, and is named by its formula), or it carries stereo or isotopes that
    a label would hide; and it is not too large to draw."""
    if len(group_atoms(mol, position.ring_atom, position.atom)) > MAX_SKELETAL_ATOMS:
        return False
    if hidden_by_a_label(mol, position.ring_atom, position.atom):
        return True
    return position.estimated or not _has_a_label(position.label)


def _has_a_label(label: str) -> bool:
    """Whether a group's label is a condensed label short enough to write beside a chair."""
    return can_parse(label) and len(label) <= MAX_LABEL


def _shown(label: str, hetero: bool, stereocentre: bool, style: Style) -> bool:
    if label != "H" or hetero:
        return True  # groups, and a heteroatom's H, are always drawn
    return style.hydrogens == "all" or (style.hydrogens == "stereo" and stereocentre)


def _bond_with_label(
    panel, start, direction, length, label, start_box, depth, style: Style, double: bool = False, formula: bool = False
) -> None:
    """A bond from ``start`` with its label at the end; the bond is made shorter or longer (in
    LENGTHS steps) where its label would touch what is already drawn. An H that touches at every
    length is left out (implicit, as chemists often leave it); a group is drawn anyway, at the
    length where the fewest things touch."""
    reverse = direction[0] < -0.25 and not formula  # a molecular formula reads one way only
    runs, span = label_runs(DRAWN_AS.get(label, label), reverse)
    if formula and direction[0] < -0.25:
        span = (sum(len(r.text) for r in runs) - 1, sum(len(r.text) for r in runs))  # ends at the bond
    bond_pt = length  # multiple-bond spacing follows the chair's bond length, not the stretch below
    if start_box is not None:
        # from a labelled ring atom (N, O): measured from the edge of its label, not its centre,
        # so that the bond is not a stub
        inner = clip_to_box(
            (start[0] + direction[0] * 3 * length, start[1] + direction[1] * 3 * length), start, start_box
        )
        length += math.dist(start, inner)
    best: tuple[int, list[Stroke], Text] | None = None
    for factor in LENGTHS:
        end = (start[0] + direction[0] * length * factor, start[1] + direction[1] * length * factor)
        text = anchored_label(runs, span, end, style.font_size, font=style.font)
        strokes = _bond_strokes(start, end, direction, text, span, start_box, depth, style, double, bond_pt)
        touching = _touches(strokes, text, panel, H_CLEARANCE if label == "H" else LABEL_CLEARANCE)
        if best is None or touching < best[0]:
            best = (touching, strokes, text)
        if not touching:
            break
    assert best is not None
    if best[0] and label == "H":
        return
    panel.strokes.extend(best[1])
    panel.texts.append(best[2])


def _bond_strokes(
    start, end, direction, text, span, start_box, depth, style: Style, double: bool, bond_pt: float
) -> list[Stroke]:
    if direction[0] < -0.25:  # a bond coming from the right meets the attachment unit's count too
        span = (span[0], sum(len(r.text) for r in text.runs))
    box = symbol_box(text, span, style.label_gap)
    return bond_lines(start, end, 2 if double else 1, start_box, box, bond_pt, style.line_width, depth=depth)


def _touches(strokes: list[Stroke], text: Text, panel: Panel, clearance: float) -> int:
    """How many things a new bond and label touch among what the panel already holds."""
    count = len(clashes(panel.strokes + strokes, [text], tolerance=-clearance, others=panel.texts))
    boxes = [b for t in panel.texts for b in t.boxes()]
    return count + sum(1 for s in strokes for b in boxes if segment_hits_box(s.start, s.end, _shrink(b)))


def _shrink(b, by: float = 0.3):
    return b[0] + by, b[1] + by, b[2] - by, b[3] - by


def _flat_groups(mol: Chem.Mol, atom_idx: int, ring_atoms: set[int], drawn: set) -> list[tuple[str, bool, int, bool]]:
    """(label, double bond?, atom, estimated?) of the exocyclic neighbours of a trigonal ring atom
    not already drawn as positions: the partner of a C=X, or the group on a planar ring N."""
    atom = mol.GetAtomWithIdx(atom_idx)
    out = []
    for bond in atom.GetBonds():
        other = bond.GetOtherAtom(atom)
        if other.GetIdx() in ring_atoms or (atom_idx, other.GetIdx()) in drawn or other.GetAtomicNum() == 1:
            continue
        if bond.GetBondType() == Chem.BondType.DOUBLE:
            h = other.GetTotalNumHs()
            label = other.GetSymbol() + ("H" if h else "") + (str(h) if h > 1 else "")
            # =O, =CH2, =NH: a label; =NOH, =CHCO2Et (and E/Z): drawn, as "estimated" groups are
            more = any(n.GetIdx() != atom_idx and n.GetAtomicNum() > 1 for n in other.GetNeighbors())
            out.append((label, True, other.GetIdx(), more or hidden_by_a_label(mol, atom_idx, other.GetIdx())))
        else:
            graph = MolGraph(mol)
            group = substituent_groups(mol, graph, [(atom_idx, other.GetIdx())])[(atom_idx, other.GetIdx())]
            out.append((group.label, False, other.GetIdx(), bool(group.estimated_as)))
    return out


def shown_chairs(ring: RingResult, chairs: str) -> list[int]:
    """Chair numbers drawn for ``chairs``: both, the favoured one (the first of a degenerate
    pair), or the other one ('flip')."""
    if chairs not in CHAIRS:
        raise FigureError(f"chairs must be one of {', '.join(CHAIRS)}, not {chairs!r}")
    if chairs == "both":
        return [0, 1]
    low = next((i for i, c in enumerate(ring.chairs) if c.favored), 0)
    return [low if chairs == "favored" else 1 - low]
