"""Analysis -> Figure: both chairs of each ring with the equilibrium between them.

A figure has one row per analysed ring (and per relative configuration where the input left the
stereo open). A row shows chair, equilibrium arrows, chair; under each chair its name and
population, under the arrows the free-energy difference. The favoured chair is flagged in ways
that survive black-and-white printing: its caption is bold, and the equilibrium half-arrow that
points to it is the longer one (the usual way of drawing an equilibrium that lies to one side).
"""

from __future__ import annotations

from dataclasses import dataclass, field

from .chairpanel import Panel, chair_panel, needed_scale, shown_chairs
from .errors import FigureError
from .labels import DRAWN_AS, NORMAL
from .layout import Polygon, Stroke, Text, TextRun, centred_text, chair_name_runs, label_runs, with_gaps
from .render import text as fonttext
from .render.style import Style
from .report import caveats, percent
from .results import Analysis, Chair, RingResult
from .skeletal import draw_flat

KJ_PER_KCAL = 4.184
ARROW_HEAD = 5.0  # pt, length of an equilibrium half-arrow head


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

        return render(self.svg(), kind, dpi, (self.width, self.height))

    def save(self, path, dpi: float = 300.0):
        """Write the figure; the type follows the file name (.svg, .png, .pdf)."""
        from .render.export import write

        return write(self.svg(), path, dpi, (self.width, self.height))


# --- rows and the whole figure -------------------------------------------------------------------


def _energy_text(delta_kcal: float, style: Style, kelvin: float | None = None) -> str:
    # one decimal: an additive model of tabulated values is not better than about 0.1 kcal/mol
    at = f"({kelvin:.0f} K)" if kelvin is not None else ""
    if style.units == "kJ":
        return f"\u0394G{at} = {delta_kcal * KJ_PER_KCAL:.1f} kJ/mol"
    return f"\u0394G{at} = {delta_kcal:.1f} kcal/mol"


def _caption(
    chair: Chair, ring: RingResult, shown_as: dict, style: Style, bold: bool, cx: float, baseline: float
) -> Text:
    """The chair's name where the trade has one (4C1 for a pyranose), else its axial groups by
    position, written as the chair draws them (2-Me, 4-CO2Me; a skeletal group as '4-group');
    its population; 'favoured' on the favoured chair."""
    if ring.kind == "pyranose":
        name = chair_name_runs(chair.name)
    else:
        parts: list[TextRun] = []
        for p in chair.axial():
            shown = shown_as.get((p.ring_atom, p.atom), DRAWN_AS.get(p.label, p.label))
            runs = label_runs(shown)[0] if shown else (TextRun("group", NORMAL),)
            parts += ([TextRun(", ", NORMAL)] if parts else []) + [TextRun(f"{p.locant}-", NORMAL), *runs]
        name = tuple(parts) + (TextRun(" axial", NORMAL),) if parts else (TextRun("all equatorial", NORMAL),)
    runs = name + (TextRun(f"  {percent(chair.population)}%", NORMAL),)
    if bold:
        runs += (TextRun("  favoured", NORMAL),)
    return centred_text(runs, cx, baseline, style.caption_size, "bold" if bold else "regular", "caption", style.font)


def _arrows(x0: float, x1: float, y: float, towards: int | None, style: Style) -> Panel:
    """Equilibrium half-arrows between x0 and x1 at height y; the one pointing to the favoured
    side (0 left, 1 right) is drawn longer."""
    panel = Panel()
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
    analysis: Analysis,
    ring: RingResult,
    style: Style,
    chairs: str = "both",
    heading: str | None = None,
    scale: float | None = None,
    made: dict | None = None,
) -> Panel:
    """One row: the chairs asked for (``shown_chairs``), with arrows, the energy difference,
    captions, and a note where a caveat can change the answer; all chairs at ``scale``."""
    favoured = next((i for i, c in enumerate(ring.chairs) if c.favored), None)
    shown = shown_chairs(ring, chairs)
    row = Panel()
    energy = _energy_text(ring.delta_g_kcal_mol, style, analysis.temperature_K)
    spacing = max(style.chair_spacing, fonttext.width(energy, style.caption_size, "regular", style.font) + 10)
    x = 0.0
    built = []
    for n, i in enumerate(shown):
        panel, centre = chair_panel(analysis, ring, ring.chairs[i], style, scale, made)
        bx0, _, bx1, _ = panel.box()
        panel = panel.moved(x - bx0, -centre[1])
        built.append((i, panel, x, x + bx1 - bx0))
        x += bx1 - bx0 + (spacing if n == 0 else 0)
        row.add(panel)
    bottom = max(p.box()[3] for _, p, _, _ in built)
    if len(built) == 2:
        x0, x1 = built[0][3] + 6, built[1][2] - 6
        row.add(_arrows(x0, x1, 0.0, favoured, style))
        text = centred_text(
            (TextRun(energy, NORMAL),),
            (x0 + x1) / 2,
            1.4 * style.caption_size + 2,
            style.caption_size,
            "regular",
            "energy",
            style.font,
        )
        row.texts.append(text)
        bottom = max(bottom, text.extent()[3])  # captions go below the energy, never beside it
    baseline = bottom + 1.6 * style.caption_size
    for i, drawn, left, right in built:
        row.texts.append(
            _caption(ring.chairs[i], ring, drawn.shown_as, style, i == favoured, (left + right) / 2, baseline)
        )
    for note in caveats(ring):
        baseline += 1.4 * style.caption_size
        line = f"Note: {note}; the figure shows the chair model"
        row.texts.append(
            Text(
                (TextRun(line, NORMAL),),
                row.box()[0],
                baseline,
                style.caption_size,
                "regular",
                "note",
                line,
                style.font,
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
                style.font,
            )
        )
    return row


def row_heading(ring: RingResult, number: int, rows: int) -> str | None:
    """'ring 2 (piperidine)' where a figure has several rows, and the relative configuration
    drawn where the input left it open."""
    parts = []
    if rows > 1:
        parts.append(f"ring {number} ({ring.kind})")
    if ring.configuration is not None:
        parts.append(f"configuration {ring.configuration.label}")
    return ": ".join(parts) or None


FLAT_GAP = 24.0  # pt between the flat input and the chairs
# what the input's stereo means, where it is not simply absolute (read from the enhanced-stereo
# groups or a molfile's chiral flag): the chairs show one of the stereoisomers it stands for
STEREO_NOTES = {
    "racemic": "Stereo read as racemic (AND groups): one enantiomer is drawn.",
    "relative": "Stereo read as relative (OR groups or chiral flag 0): one of the enantiomers is drawn.",
    "mixed": "Stereo groups of several kinds: the drawn configuration holds within each group only.",
}


def flat_panel(analysis: Analysis, style: Style) -> Panel:
    """The input as drawn flat (hexagon, wedges and hashes), with a caption saying so."""
    strokes, texts, wedges = draw_flat(analysis.mol, style.bond_length, style)
    panel = Panel(strokes, texts, wedges)
    x0, _, x1, y1 = panel.box()
    panel.texts.append(
        centred_text(
            (TextRun("as drawn" if _drawn_input(analysis) else "flat structure", NORMAL),),
            (x0 + x1) / 2,
            y1 + 1.6 * style.caption_size,
            style.caption_size,
            "regular",
            "caption",
            style.font,
        )
    )
    return panel


def _drawn_input(analysis: Analysis) -> bool:
    """Whether the input was a drawing (a molfile with 2D coordinates), not text laid out here."""
    mol = analysis.mol
    return bool(mol.GetNumConformers()) and not mol.GetConformer().Is3D() and analysis.format.startswith("mol")


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
    whole = Panel()
    y = 0.0
    # one size for every chair of the figure: the smallest at which none of them has a clash
    made: dict = {}  # panels made while choosing the scale, reused for the rows
    scale = needed_scale(analysis, [(r, r.chairs[i]) for r in results for i in shown_chairs(r, chairs)], style, made)
    distinct = list(dict.fromkeys(r.atoms for r in analysis.rings))  # configurations share a ring
    for r in results:
        row = ring_row(
            analysis, r, style, chairs, row_heading(r, distinct.index(r.atoms) + 1, len(results)), scale, made
        )
        x0, y0, _, y1 = row.box()
        whole.add(row.moved(-x0, y - y0))
        y += y1 - y0 + style.row_spacing
    if show_flat:
        flat = flat_panel(analysis, style)
        fx0, fy0, fx1, fy1 = flat.box()
        wx0, wy0, _, wy1 = whole.box()
        whole = whole.moved(fx1 - fx0 + FLAT_GAP - wx0, 0.0)
        whole.add(flat.moved(-fx0, (wy0 + wy1) / 2 - (fy0 + fy1) / 2))
    meaning = STEREO_NOTES.get(analysis.stereo_meaning)
    for line, role in ((meaning, "note"), (caption, "title")):
        if line:
            _, _, _, y1 = whole.box()
            whole.texts.append(
                Text(
                    (TextRun(line, NORMAL),),
                    0.0,
                    y1 + 1.6 * style.caption_size,
                    style.caption_size,
                    "regular",
                    role,
                    line,
                    style.font,
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
        parts = [f"{r.kind}: chairs {r.chairs[0].name} and {r.chairs[1].name} (as in the report)"]
        parts.append(_energy_text(r.delta_g_kcal_mol, style))
        parts.append("degenerate" if fav is None else f"{fav.name} favoured ({100 * fav.population:.1f}%)")
        lines.append(", ".join(parts))
    return "; ".join(lines) + f". SMILES {analysis.smiles}. Modelled, not measured."


__all__ = ["Figure", "draw", "draw_analysis", "chair_panel", "ring_row"]
