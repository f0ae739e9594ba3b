"""Readable text reports of analyses (the CLI prints them; the library only builds strings)."""

from __future__ import annotations

from .energy import equilibrium, tables
from .results import Analysis, RingResult

DISCLAIMER = (
    "chairdraw models conformations from tabulated energies; it does not replace experimental "
    "proof of configuration or an organisation's registration rules."
)


def energy_text(kcal: float, units: str) -> str:
    if units == "kJ":
        return f"{equilibrium.to_kj(kcal):.2f} kJ/mol"
    return f"{kcal:.2f} kcal/mol"


def percent(fraction: float) -> str:
    """A population in per cent to one decimal; never '100.0' or '0.0' for a chair that is
    merely very scarce (a Boltzmann population is never exactly 0 or 1)."""
    value = fraction * 100
    if value >= 99.95 and fraction < 1:
        return ">99.9"
    if value < 0.05 and fraction > 0:
        return "<0.1"
    return f"{value:.1f}"


def format_analysis(analysis: Analysis, units: str = "kcal") -> str:
    lines = []
    title = analysis.record or analysis.source
    lines.append(f"{title}")
    lines.append(f"  SMILES  {analysis.smiles}")
    lines.append(f"  InChI   {analysis.inchi}")
    lines.append(
        f"  T = {analysis.temperature_K:g} K, {analysis.solvent} solvent, additive model; "
        f"stereo read as {analysis.stereo_meaning}"
    )
    for note in analysis.notes:
        lines.append(f"  note: {note}")
    used: list[str] = []
    for k, ring in enumerate(analysis.rings, start=1):
        lines.append("")
        lines.extend(_ring_lines(k, ring, units, used))
    for refused in analysis.refused:
        lines.append("")
        lines.append(
            f"  ring of atoms {', '.join(map(str, refused.atoms))} (numbered from 0): not analysed: {refused.reason}"
        )
    if used:
        lines.append("")
        lines.append("  sources")
        for key in used:
            lines.append(f"    [{key}] {tables.citation(key)}")
    return "\n".join(lines)


def _ring_lines(k: int, ring: RingResult, units: str, used: list[str]) -> list[str]:
    a, b = ring.chairs
    head = f"  ring {k}: {ring.kind} (atoms {', '.join(map(str, ring.atoms))}, numbered from 0)"
    if ring.configuration:
        head += f", configuration {ring.configuration.label}: {ring.configuration.smiles}"
    out = [head]
    width = 11
    out.append(f"    {'pos':<5}{'group':<10}{'face':<8}{a.name:<{width}}{b.name:<{width}}")
    for pa, pb in zip(a.positions, b.positions):
        if pa.label in ("H", "lone pair") and not pa.inverting:
            continue
        if pa.label == "lone pair":
            continue
        face = "invert" if pa.inverting else pa.face
        label = pa.label + ("*" if pa.estimated else "")
        out.append(f"    {pa.locant:<5}{label:<10}{face:<8}{pa.orientation:<{width}}{pb.orientation:<{width}}")
    out.append(f"    {'energy':<23}{_e(a.energy_kcal_mol, units):<{width}}{_e(b.energy_kcal_mol, units):<{width}}")
    out.append(f"    {'population':<23}{percent(a.population):<{width}}{percent(b.population):<{width}}(%)")
    if ring.degenerate:
        out.append("    the two chairs are equal in energy (degenerate)")
    else:
        fav = ring.favored
        assert fav is not None
        out.append(f"    favoured chair: {fav.name}, ΔG = {energy_text(ring.delta_g_kcal_mol, units)}")
    for chair in ring.chairs:
        for term in chair.terms:
            for key in term.sources:
                if key not in used:
                    used.append(key)
            keys = ",".join(term.sources)
            out.append(f"      {chair.name}: {term.name}: {_signed(term.value, units)} [{keys}]")
    if ring.forcefield_kcal_mol is not None:
        ff = ring.forcefield_kcal_mol
        out.append(f"    {'MMFF94 (check)':<23}{_e(ff[0], units):<{width}}{_e(ff[1], units):<{width}}")
    for note in ring.notes:
        out.append(f"    note: {note}")
    for warning in ring.warnings:
        out.append(f"    warning: {warning}")
    if any(p.estimated for p in a.positions):
        out.append("    * estimated by class (not in the A-value table)")
    return out


def _e(kcal: float, units: str) -> str:
    return f"{equilibrium.to_kj(kcal):.2f}" if units == "kJ" else f"{kcal:.2f}"


def _signed(kcal: float, units: str) -> str:
    value = equilibrium.to_kj(kcal) if units == "kJ" else kcal
    return f"{value:+.2f} {'kJ' if units == 'kJ' else 'kcal'}/mol"


def caveats(ring) -> list[str]:
    """Short warnings that can change the answer itself, for summary lines and figures."""
    out = []
    if any("twist-boat" in w for w in ring.warnings):
        out.append("twist-boat likely")
    if any("A(1,3) strain" in w for w in ring.warnings):
        # the one effect the tables miss that can reverse the answer
        out.append("A(1,3) strain (not modelled) may put the group beside the planar N axial")
    return out


def summary_line(analysis: Analysis, units: str = "kcal") -> str:
    """One line per ring: id, ring kind, favoured chair, ΔG, population of the favoured chair."""
    title = analysis.record or analysis.source
    if not analysis.rings:
        reason = analysis.refused[0].reason if analysis.refused else "no six-membered ring"
        return f"{title}: no chair ring ({reason})"
    parts = []
    for ring in analysis.rings:
        cfg = f" [{ring.configuration.label}]" if ring.configuration else ""
        if ring.degenerate:
            text = f"{ring.kind}{cfg}: chairs equal ({ring.chairs[0].name} = {ring.chairs[1].name})"
        else:
            fav = ring.favored
            assert fav is not None
            axial = ", ".join(f"{p.label}-{p.locant}" for p in fav.axial()) or "none"
            text = (
                f"{ring.kind}{cfg}: {fav.name} favoured by {energy_text(ring.delta_g_kcal_mol, units)} "
                f"({percent(fav.population)} %), axial: {axial}"
            )
        for caveat in caveats(ring):
            text += f", but {caveat}" if caveat.startswith("A(1,3)") else f", {caveat}"
        if ring.warnings:
            text += f" ({len(ring.warnings)} warning{'s' if len(ring.warnings) > 1 else ''}: see --full)"
        parts.append(text)
    return f"{title}: " + "; ".join(parts)


def format_check(result) -> str:
    """A check's verdict for a person: the verdict and why, the differing centres, the chair drawn
    and the drawing-quality warnings (atoms numbered from 1, as in the files)."""
    title = result.record or "drawing"
    lines = [f"{title}: {result.verdict} ({result.reason})"]
    for c in result.differing_centers:
        lines.append(
            f"  differs at registered {c.where}, {c.element}, {c.registered_cip or 'no CIP label'}"
            f" = drawn atom {c.drawn_atom}, {c.drawn_cip or 'no CIP label'}"
        )
    lines.append(f"  registered stereo: {result.registered_stereo}")
    if result.perception is not None:
        for ring in result.perception.rings:
            atoms = ", ".join(str(a + 1) for a in ring.atoms)
            what = ring.drawn_as if not ring.reason else f"{ring.drawn_as}: {ring.reason}"
            lines.append(f"  ring of atoms {atoms}: drawn {what}")
    if result.drawn_chair_favored is not None:
        lines.append(
            "  the chair drawn is the favoured one"
            if result.drawn_chair_favored
            else "  the chair drawn is NOT the favoured one (not wrong; a caption calling it favoured would be)"
        )
    for warning in result.warnings:
        lines.append(f"  warning: {warning}")
    return "\n".join(lines)


def check_line(result, drawn: str = "") -> str:
    """One line per check, for lists of many: id, verdict, where it differs, the chair drawn."""
    what = f" [{drawn}]" if drawn else ""
    line = f"  {result.record or 'drawing'}{what}: {result.verdict}"
    if result.verdict != "match":
        line += f" - {result.reason}"
    if result.drawn_chair_favored is False:
        line += " (the minor chair is drawn)"
    return line
