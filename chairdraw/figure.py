"""Analysis -> Figure: both chairs of each ring with the equilibrium between them.

A figure has one row per analysed ring (and per relative configuration where the input left the
stereo open). A row shows chair, equilibrium arrows, chair; under each chair its name and
population, under the arrows the free-energy difference. The favoured chair is flagged in ways
that survive black-and-white printing: its caption is bold, and the equilibrium half-arrow that
points to it is the longer one (the usual way of drawing an equilibrium that lies to one side).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from rdkit import Chem

from .errors import FigureError
from .labels import NORMAL, SUP, can_parse
from .layout import (
    Point,
    Polygon,
    Stroke,
    Text,
    TextRun,
    anchored_label,
    centred_text,
    chair_name_runs,
    clashes,
    clip_to_box,
    label_runs,
    ring_picture,
    segment_hits_box,
    symbol_box,
    with_gaps,
)
from .molgraph import MolGraph
from .render import text as fonttext
from .render.style import CHAIRS, Style
from .results import Analysis, Chair, RingResult
from .skeletal import MAX_ATOMS as MAX_SKELETAL_ATOMS
from .skeletal import draw_flat, draw_groups, group_atoms
from .substituents import substituent_groups

KJ_PER_KCAL = 4.184
DOUBLE_SPACING = 0.18  # of the bond length, between the lines of a double bond (common practice)
ARROW_HEAD = 5.0  # pt, length of an equilibrium half-arrow head
# the chair is drawn larger, in these steps, until no label touches a bond or another label
CHAIR_SCALES = (1.0, 1.12, 1.25, 1.4, 1.6, 1.8, 2.0, 2.3, 2.6)
LENGTHS = (1.0, 0.8, 1.25, 1.5, 0.65, 1.8)  # of the bond length, tried in turn where a label touches
LABEL_CLEARANCE = 1.0  # pt kept free around a label when placing it (the final check allows 0)
MAX_LABEL = 8  # characters; a longer condensed label is drawn as a skeletal fragment
H_BOND = 0.8  # bonds to H are drawn shorter: less clutter beside the groups that matter


@dataclass(frozen=True)
class Figure:
    """A laid-out figure in points (y down). ``svg()`` writes it; in Jupyter it shows itself."""

    width: float
    height: float
    strokes: tuple[Stroke, ...]
    texts: tuple[Text, ...]
    polygons: tuple[Polygon, ...]
    title: str
    description: str
    style: Style = field(default_factory=Style)

    def svg(self) -> str:
        from .render.svg import to_svg

        return to_svg(self)

    def _repr_svg_(self) -> str:
        return self.svg()

    def render(self, kind: str = "svg", dpi: float = 300.0) -> bytes:
        """The figure as SVG, PNG or PDF bytes."""
        from .render.export import render

        return render(self.svg(), kind, dpi)

    def save(self, path, dpi: float = 300.0):
        """Write the figure; the type follows the file name (.svg, .png, .pdf)."""
        from .render.export import write

        return write(self.svg(), path, dpi)


@dataclass
class _Panel:
    strokes: list[Stroke] = field(default_factory=list)
    texts: list[Text] = field(default_factory=list)
    polygons: list[Polygon] = field(default_factory=list)
    # where the drawing puts each atom (ring atoms, and the first atom of each drawn group, keyed
    # (ring atom, group atom or None for H)): what a chair molfile or a 3D rebuild reads
    atoms: dict = field(default_factory=dict)

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

    def moved(self, dx: float, dy: float) -> _Panel:
        def mv(p: Point) -> Point:
            return p[0] + dx, p[1] + dy

        return _Panel(
            [Stroke(mv(s.start), mv(s.end), s.width, s.role, s.depth) for s in self.strokes],
            [Text(t.runs, t.x + dx, t.y + dy, t.size, t.weight, t.role, t.plain) for t in self.texts],
            [Polygon(tuple(mv(q) for q in p.points), p.role) for p in self.polygons],
        )

    def add(self, other: _Panel) -> None:
        self.strokes += other.strokes
        self.texts += other.texts
        self.polygons += other.polygons


def chair_panel(analysis: Analysis, ring: RingResult, chair: Chair, style: Style) -> tuple[_Panel, Point]:
    """One chair with its substituents, and the centre of its ring (both in points, y down): at
    the smallest scale at which nothing touches (the largest tried if something always does)."""
    for scale in CHAIR_SCALES:
        panel, centre = _chair_at(analysis, ring, chair, style, scale)
        if not clashes(panel.strokes, panel.texts):
            break
    return panel, centre


def _chair_at(analysis: Analysis, ring: RingResult, chair: Chair, style: Style, scale: float) -> tuple[_Panel, Point]:
    mol = analysis.mol
    first = next((k for k, loc in enumerate(ring.locants) if loc.lstrip("CONS") == "1"), 0)
    g = ring_picture(tuple(a in chair.up_atoms for a in ring.atoms), first)  # indexed by ring index
    mean_bond = sum(math.dist(g.points[k], g.points[(k + 1) % 6]) for k in range(6)) / 6
    s = style.bond_length * scale / mean_bond  # ring bonds as drawn average the style's bond length
    at = [(g.points[k][0] * s, -g.points[k][1] * s) for k in range(6)]
    depth = list(g.depth)
    panel = _Panel()
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
        text = anchored_label(runs, (0, len(atom.GetSymbol())), at[k], style.font_size, "atom")
        panel.texts.append(text)
        ring_boxes[k] = symbol_box(text, (0, len(atom.GetSymbol())), pad)
    for k in range(6):
        a, b = at[k], at[(k + 1) % 6]
        start = clip_to_box(b, a, ring_boxes[k]) if k in ring_boxes else a
        end = clip_to_box(a, b, ring_boxes[(k + 1) % 6]) if (k + 1) % 6 in ring_boxes else b
        panel.strokes.append(Stroke(start, end, style.line_width, "ring", (depth[k] + depth[(k + 1) % 6]) / 2))
    stereo_atoms = {c.atom for c in ring.stereo}
    skeletal: list[tuple[int, int, Point]] = []
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
        if p.atom is not None and _skeletal(p, mol):
            skeletal.append((p.ring_atom, p.atom, panel.atoms[(p.ring_atom, p.atom)]))
            continue
        eq_depth = depth[k] + (0.5 if not axial else 0)
        _bond_with_label(
            panel, at[k], direction, length, p.label, ring_boxes.get(k), eq_depth, style, formula=p.estimated
        )
    drawn = {(p.ring_atom, p.atom) for p in chair.positions}
    for atom_idx in ring.trigonal_atoms:
        # a C=O, C=CH2 or the group on a planar N: in the ring's plane, along the outer bisector
        k = ring.atoms.index(atom_idx)
        u1 = _unit((at[(k - 1) % 6][0] - at[k][0], at[(k - 1) % 6][1] - at[k][1]))
        u2 = _unit((at[(k + 1) % 6][0] - at[k][0], at[(k + 1) % 6][1] - at[k][1]))
        out = _unit((-(u1[0] + u2[0]), -(u1[1] + u2[1])))
        for label, double, other, estimated in _flat_groups(mol, atom_idx, set(ring.atoms), drawn):
            reach = style.bond_length * scale
            end = (at[k][0] + out[0] * reach, at[k][1] + out[1] * reach)
            panel.atoms[(atom_idx, other)] = end
            if not double and (estimated or not can_parse(label) or len(label) > MAX_LABEL):
                if len(group_atoms(mol, atom_idx, other)) <= MAX_SKELETAL_ATOMS:
                    skeletal.append((atom_idx, other, end))
                    continue
            _bond_with_label(
                panel, at[k], out, reach, label, ring_boxes.get(k), depth[k], style, double, formula=estimated
            )
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
    if style.numbering:
        for k in range(6):
            u1 = _unit((at[(k - 1) % 6][0] - at[k][0], at[(k - 1) % 6][1] - at[k][1]))
            u2 = _unit((at[(k + 1) % 6][0] - at[k][0], at[(k + 1) % 6][1] - at[k][1]))
            inward = _unit((u1[0] + u2[0], u1[1] + u2[1]))
            c = (at[k][0] + inward[0] * 0.42 * s, at[k][1] + inward[1] * 0.42 * s)
            number = ring.locants[k].lstrip("CONS")
            panel.texts.append(
                anchored_label((TextRun(number, NORMAL),), (0, len(number)), c, style.caption_size * 0.75, "locant")
            )
    for k, atom_idx in enumerate(ring.atoms):
        panel.atoms[(atom_idx, atom_idx)] = at[k]
    centre = (sum(x for x, _ in at) / 6, sum(y for _, y in at) / 6)
    return panel, centre


def _skeletal(position, mol: Chem.Mol) -> bool:
    """Whether a group is drawn as a skeletal fragment: it has no condensed label of its own (it
    was estimated by class, and is named by its formula) and is not too large to draw."""
    if not position.estimated and can_parse(position.label) and len(position.label) <= MAX_LABEL:
        return False
    return len(group_atoms(mol, position.ring_atom, position.atom)) <= MAX_SKELETAL_ATOMS


def _shown(label: str, hetero: bool, stereocentre: bool, style: Style) -> bool:
    if label != "H" or hetero:
        return True  # groups, and a heteroatom's H, are always drawn
    return style.hydrogens == "all" or (style.hydrogens == "stereo" and stereocentre)


def _bond_with_label(
    panel, start, direction, length, label, start_box, depth, style: Style, double: bool = False, formula: bool = False
) -> None:
    """A bond from ``start`` with its label at the end; the bond is made shorter or longer (in
    LENGTHS steps) where its label would touch what is already drawn."""
    reverse = direction[0] < -0.25 and not formula  # a molecular formula reads one way only
    runs, span = label_runs(label, reverse)
    best = None
    for factor in LENGTHS:
        end = (start[0] + direction[0] * length * factor, start[1] + direction[1] * length * factor)
        text = anchored_label(runs, span, end, style.font_size)
        strokes = _bond_strokes(start, end, direction, text, span, start_box, depth, style, double)
        if not _touches(strokes, text, panel):
            best = (strokes, text)
            break
        best = best or (strokes, text)
    assert best is not None
    panel.strokes.extend(best[0])
    panel.texts.append(best[1])


def _bond_strokes(start, end, direction, text, span, start_box, depth, style: Style, double: bool) -> list[Stroke]:
    box = symbol_box(text, span, style.label_gap)
    if not double:
        base = clip_to_box(end, start, start_box) if start_box else start
        return [Stroke(base, clip_to_box(start, end, box), style.line_width, "bond", depth)]
    off = DOUBLE_SPACING * style.bond_length / 2
    n = (-direction[1] * off, direction[0] * off)
    out = []
    for sign in (1, -1):
        a = (start[0] + sign * n[0], start[1] + sign * n[1])
        b = (end[0] + sign * n[0], end[1] + sign * n[1])
        # each line of the pair stops at the label by itself (the offset lines meet its box elsewhere)
        a2 = clip_to_box(b, a, start_box) if start_box else a
        out.append(Stroke(a2, clip_to_box(a2, b, box), style.line_width, "double", depth))
    return out


def _touches(strokes: list[Stroke], text: Text, panel: _Panel) -> bool:
    """Whether a new bond and label touch what the panel already holds."""
    if clashes(panel.strokes + strokes, [text], tolerance=-LABEL_CLEARANCE, others=panel.texts):
        return True
    boxes = [b for t in panel.texts for b in t.boxes()]
    return any(segment_hits_box(s.start, s.end, _shrink(b)) for s in strokes for b in boxes)


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
            out.append(
                (other.GetSymbol() + ("H" if h else "") + (str(h) if h > 1 else ""), True, other.GetIdx(), False)
            )
        else:
            graph = MolGraph(mol)
            group = substituent_groups(mol, graph, [(atom_idx, other.GetIdx())])[(atom_idx, other.GetIdx())]
            out.append((group.label, False, other.GetIdx(), bool(group.estimated_as)))
    return out


def _unit(v: Point) -> Point:
    n = math.hypot(*v) or 1.0
    return v[0] / n, v[1] / n


# --- rows and the whole figure -------------------------------------------------------------------


def _energy_text(delta_kcal: float, style: Style) -> str:
    if style.units == "kJ":
        return f"\u0394G = {delta_kcal * KJ_PER_KCAL:.1f} kJ/mol"
    return f"\u0394G = {delta_kcal:.2f} kcal/mol"


def _caption(chair: Chair, style: Style, bold: bool, cx: float, baseline: float) -> Text:
    runs = chair_name_runs(chair.name) + (TextRun(f"  {100 * chair.population:.1f}%", NORMAL),)
    if bold:
        runs += (TextRun("  favoured", NORMAL),)
    return centred_text(runs, cx, baseline, style.caption_size, "bold" if bold else "regular", "caption")


def _arrows(x0: float, x1: float, y: float, towards: int | None, style: Style) -> _Panel:
    """Equilibrium half-arrows between x0 and x1 at height y; the one pointing to the favoured
    side (0 left, 1 right) is drawn longer."""
    panel = _Panel()
    gap = 1.6
    length = x1 - x0
    short = 0.25 * length
    for direction, dy in ((1, -gap), (-1, gap)):
        shrink = short if towards is not None and ((direction == 1) != (towards == 1)) else 0.0
        a = x0 + shrink / 2
        b = x1 - shrink / 2
        start, end = ((a, y + dy), (b, y + dy)) if direction == 1 else ((b, y + dy), (a, y + dy))
        panel.strokes.append(Stroke(start, end, style.line_width, "arrow"))
        barb_y = y + dy - direction * ARROW_HEAD * 0.5  # the barb on the outer side of each line
        panel.polygons.append(
            Polygon(
                (end, (end[0] - direction * ARROW_HEAD, barb_y), (end[0] - direction * ARROW_HEAD * 0.8, y + dy)),
                "arrow",
            )
        )
    return panel


def ring_row(
    analysis: Analysis, ring: RingResult, style: Style, chairs: str = "both", heading: str | None = None
) -> _Panel:
    """One row: the chairs asked for, with arrows, captions and the energy difference."""
    if chairs not in CHAIRS:
        raise FigureError(f"chairs must be one of {', '.join(CHAIRS)}, not {chairs!r}")
    favoured = next((i for i, c in enumerate(ring.chairs) if c.favored), None)
    if chairs == "both":
        shown = [0, 1]
    else:
        low = favoured if favoured is not None else 0
        shown = [low if chairs == "favored" else 1 - low]
    row = _Panel()
    energy = _energy_text(ring.delta_g_kcal_mol, style)
    spacing = max(style.chair_spacing, fonttext.width(energy, style.caption_size) + 10)
    x = 0.0
    built = []
    for n, i in enumerate(shown):
        panel, centre = chair_panel(analysis, ring, ring.chairs[i], style)
        bx0, _, bx1, _ = panel.box()
        panel = panel.moved(x - bx0, -centre[1])
        built.append((i, panel, x, x + bx1 - bx0))
        x += bx1 - bx0 + (spacing if n == 0 else 0)
        row.add(panel)
    bottom = max(p.box()[3] for _, p, _, _ in built)
    for i, _, left, right in built:
        cap = _caption(ring.chairs[i], style, i == favoured, (left + right) / 2, bottom + 1.6 * style.caption_size)
        row.texts.append(cap)
    if len(built) == 2:
        x0, x1 = built[0][3] + 6, built[1][2] - 6
        row.add(_arrows(x0, x1, 0.0, favoured, style))
        row.texts.append(
            centred_text(
                (TextRun(energy, NORMAL),),
                (x0 + x1) / 2,
                1.4 * style.caption_size + 2,
                style.caption_size,
                "regular",
                "energy",
            )
        )
    if heading:
        top = row.box()[1]
        row.texts.append(
            Text(
                (TextRun(heading, NORMAL),),
                row.box()[0],
                top - 0.6 * style.caption_size,
                style.caption_size,
                "regular",
                "title",
                heading,
            )
        )
    return row


def row_heading(ring: RingResult, rows: int) -> str | None:
    parts = []
    if rows > 1:
        parts.append(f"{ring.kind}, atoms {'-'.join(str(a + 1) for a in ring.atoms)}")
    if ring.configuration is not None:
        parts.append(ring.configuration.label)
    return "; ".join(parts) or None


FLAT_GAP = 24.0  # pt between the flat input and the chairs


def flat_panel(analysis: Analysis, style: Style) -> _Panel:
    """The input as drawn flat (hexagon, wedges and hashes), with a caption saying so."""
    strokes, texts, wedges = draw_flat(analysis.mol, style.bond_length, style)
    panel = _Panel(strokes, texts, wedges)
    x0, _, x1, y1 = panel.box()
    panel.texts.append(
        centred_text(
            (TextRun("as drawn", NORMAL),),
            (x0 + x1) / 2,
            y1 + 1.6 * style.caption_size,
            style.caption_size,
            "regular",
            "caption",
        )
    )
    return panel


def draw_analysis(
    analysis: Analysis,
    style: Style | None = None,
    chairs: str = "both",
    ring: int | None = None,
    caption: str | None = None,
    show_flat: bool = False,
) -> Figure:
    """The figure of an analysis: every ring result as a row (or only result ``ring``, 0-based),
    with the flat input on the left when ``show_flat``."""
    style = style or Style()
    results = list(analysis.rings)
    if not results:
        raise FigureError("no ring that can take a chair: nothing to draw")
    if ring is not None:
        if not 0 <= ring < len(results):
            raise FigureError(
                f"ring {ring} asked for, but the analysis has {len(results)} ring result(s) (0-{len(results) - 1})"
            )
        results = [results[ring]]
    whole = _Panel()
    y = 0.0
    for r in results:
        row = ring_row(analysis, r, style, chairs, row_heading(r, len(results)))
        x0, y0, _, y1 = row.box()
        whole.add(row.moved(-x0, y - y0))
        y += y1 - y0 + style.row_spacing
    if show_flat:
        flat = flat_panel(analysis, style)
        fx0, fy0, fx1, fy1 = flat.box()
        wx0, wy0, _, wy1 = whole.box()
        whole = whole.moved(fx1 - fx0 + FLAT_GAP - wx0, 0.0)
        whole.add(flat.moved(-fx0, (wy0 + wy1) / 2 - (fy0 + fy1) / 2))
    if caption:
        _, _, _, y1 = whole.box()
        whole.texts.append(
            Text(
                (TextRun(caption, NORMAL),),
                0.0,
                y1 + 1.6 * style.caption_size,
                style.caption_size,
                "regular",
                "title",
                caption,
            )
        )
    x0, y0, x1, y1 = whole.box()
    m = style.margin
    whole = whole.moved(m - x0, m - y0)
    strokes = with_gaps(whole.strokes, style.crossing_gap)
    return Figure(
        width=x1 - x0 + 2 * m,
        height=y1 - y0 + 2 * m,
        strokes=tuple(strokes),
        texts=tuple(whole.texts),
        polygons=tuple(whole.polygons),
        title=f"Chair conformations of {analysis.record or analysis.smiles}",
        description=_description(analysis, results, style),
        style=style,
    )


def draw(
    structure,
    chairs: str = "both",
    style: Style | None = None,
    ring: int | None = None,
    caption: str | None = None,
    show_flat: bool = False,
    temperature: float = 298.15,
    solvent: str = "aprotic",
    format: str | None = None,
) -> Figure:
    """The chair figure of a structure (text, path, RDKit molecule, Structure) or of an Analysis."""
    if not isinstance(structure, Analysis):
        from .analyze import analyze

        structure = analyze(structure, temperature=temperature, solvent=solvent, format=format)
    return draw_analysis(structure, style, chairs, ring, caption, show_flat)


def _description(analysis: Analysis, results: list[RingResult], style: Style) -> str:
    lines = []
    for r in results:
        fav = r.favored
        parts = [f"{r.kind}: chairs {r.chairs[0].name} and {r.chairs[1].name}"]
        parts.append(_energy_text(r.delta_g_kcal_mol, style))
        parts.append("degenerate" if fav is None else f"{fav.name} favoured ({100 * fav.population:.1f}%)")
        lines.append(", ".join(parts))
    return "; ".join(lines) + f". SMILES {analysis.smiles}. Modelled, not measured."


__all__ = ["Figure", "draw", "draw_analysis", "chair_panel", "ring_row"]
