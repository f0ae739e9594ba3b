"""A chair as drawn, as a 2D molfile: for sketchers, and for reading the chair back.

The favoured chair (or the one asked for) is written with the coordinates of the figure: y up,
axial bonds along y, equatorial bonds parallel to the ring bonds one step away, every atom present
(labels expanded back to their atoms, laid out by RDKit around the pinned chair) and an explicit
H on each ring stereocentre. The chair's bonds are plain: the stereo of its ring is in its
geometry, as in the drawing, so a program that reads chair drawings from coordinates gets it back
(RDKit does not: a flat drawing without wedges reads as unspecified stereo). Stereocentres
elsewhere (side chains, other rings) carry wedges, as in any flat drawing.
"""

from __future__ import annotations

from rdkit import Chem
from rdkit.Geometry import Point2D

from ._rdkit import layout_around, without_hs
from .chairpanel import chair_panel, shown_chairs
from .errors import FigureError
from .render.style import CHAIRS, Style
from .results import Analysis

MOLFILE_BOND = 1.5  # angstrom-like units per bond (RDKit's depiction scale)


def chair_molblock(analysis: Analysis, ring: int = 0, chair: str = "favored", style: Style | None = None) -> str:
    """Molfile (V2000) of one chair of ring result ``ring``: 'favored' (the first chair of a
    degenerate pair), 'flip' (the other one), or 'both' is refused (a molfile holds one chair)."""
    if chair not in CHAIRS or chair == "both":
        raise FigureError(f"a chair molfile holds one chair: favored or flip, not {chair!r}")
    if not analysis.rings:
        raise FigureError("no ring that can take a chair: nothing to write")
    if not 0 <= ring < len(analysis.rings):
        raise FigureError(f"ring {ring} asked for, but the analysis has {len(analysis.rings)} ring result(s)")
    result = analysis.rings[ring]
    shown = result.chairs[shown_chairs(result, chair)[0]]
    style = (style or Style()).replace(hydrogens="stereo")
    panel, _ = chair_panel(analysis, result, shown, style)
    source = result.configuration.molecule if result.configuration is not None else analysis.mol
    heavy, new = without_hs(source)  # panel.atoms holds the input's atom numbers: translated
    mol = Chem.RWMol(heavy)
    stereo = {new[c.atom] for c in result.stereo}
    ring_xy = [panel.atoms[(a, a)] for a in result.atoms]
    mean = (
        sum(
            ((ring_xy[k][0] - ring_xy[k - 1][0]) ** 2 + (ring_xy[k][1] - ring_xy[k - 1][1]) ** 2) ** 0.5
            for k in range(6)
        )
        / 6
    )
    scale = MOLFILE_BOND / mean  # the drawn ring bonds average one molfile bond
    pinned: dict[int, Point2D] = {}
    for (ring_atom, atom), (x, y) in panel.atoms.items():
        ring_atom = new[ring_atom]
        atom = new.get(atom) if atom is not None else None  # an explicit H atom: gone, like an implicit one
        if atom is None:
            if ring_atom not in stereo or mol.GetAtomWithIdx(ring_atom).GetTotalNumHs() != 1:
                continue
            h = mol.AddAtom(Chem.Atom(1))
            mol.AddBond(ring_atom, h, Chem.BondType.SINGLE)
            ring_h = mol.GetAtomWithIdx(ring_atom)
            ring_h.SetNumExplicitHs(0)
            ring_h.SetNoImplicit(True)
            atom = h
        pinned[atom] = Point2D(x * scale, -y * scale)
    out = mol.GetMol()
    Chem.SanitizeMol(out)
    layout_around(out, pinned)
    # the chair's own centres: plain bonds, its geometry carries their stereo; every other
    # stereocentre (side chains, other rings) keeps a wedge, as in any flat drawing
    for a in result.atoms:
        out.GetAtomWithIdx(new[a]).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    Chem.WedgeMolBonds(out, out.GetConformer())
    out.SetProp("_Name", analysis.record or "chair")
    return Chem.MolToMolBlock(out, includeStereo=True, kekulize=True)
