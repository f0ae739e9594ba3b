"""Chair figures: geometry of the chair picture, stereo read back from the drawing by RDKit, the
files written, and the command line.

The stereo round trip rebuilds 3D coordinates from the drawing alone (ring atom up or down from
the V it makes on the page, axial bonds vertical, the known viewing angle) and lets RDKit perceive
the stereo from 3D; its InChI must equal the input's. RDKit's 3D perception is the outside
reference here, independent of chairdraw's face code."""

from __future__ import annotations

import io
import itertools
import math
import xml.etree.ElementTree as ET

import pytest
from hypothesis import HealthCheck, given, settings
from PIL import Image
from rdkit import Chem
from rdkit.Chem import rdDepictor
from rdkit.Geometry import Point3D
from strategies import substituted_rings

import chairdraw
from chairdraw.cli import main
from chairdraw.figure import chair_panel, draw_analysis
from chairdraw.layout import ELEVATION_DEG, clashes, ring_picture
from chairdraw.render.style import Style

CHAIR_PATTERNS = [tuple(k % 2 == p for k in range(6)) for p in (0, 1)]


def _angle(u, v) -> float:
    """Angle between two lines in degrees (0-90: direction of travel ignored)."""
    cos = abs(u[0] * v[0] + u[1] * v[1]) / (math.hypot(*u) * math.hypot(*v))
    return math.degrees(math.acos(min(1.0, cos)))


def _vec(a, b):
    return b[0] - a[0], b[1] - a[1]


@pytest.mark.parametrize("up,first", list(itertools.product(CHAIR_PATTERNS, range(6))))
def test_chair_picture_follows_the_drawing_rules(up, first):
    g = ring_picture(up, first)
    p = g.points
    for k in range(3):  # three pairs of parallel ring bonds
        assert _angle(_vec(p[k], p[k + 1]), _vec(p[k + 3], p[(k + 4) % 6])) < 1.0
    for k in range(6):
        assert abs(g.axial[k][0]) < 1e-9 and (g.axial[k][1] > 0) == g.up[k]  # vertical, the way of its V
        one_step = _vec(p[(k + 1) % 6], p[(k + 2) % 6])
        assert _angle(g.equatorial[k], one_step) < 1.0
        assert _angle(g.equatorial[k], _vec(p[(k - 1) % 6], p[(k - 2) % 6])) < 1.0
        here, before, after = p[k][1], p[(k - 1) % 6][1], p[(k + 1) % 6][1]
        assert (here > before and here > after) if g.up[k] else (here < before and here < after)  # a V
        outward = (p[k][0] - sum(q[0] for q in p) / 6, p[k][1] - sum(q[1] for q in p) / 6)
        assert g.equatorial[k][0] * outward[0] + g.equatorial[k][1] * outward[1] > 0  # points out of the ring


def test_the_atom_numbered_1_sits_on_the_right_tip():
    for up in CHAIR_PATTERNS:
        g = ring_picture(up, 2)
        assert g.points[2][0] == max(x for x, _ in g.points)


# --- stereo read back from the drawing ------------------------------------------------------------


def _lift(analysis, ring, chair) -> Chem.Mol:
    """The molecule with 3D coordinates rebuilt from the 2D chair drawing."""
    panel, _ = chair_panel(analysis, ring, chair, Style(hydrogens="all"))
    eps = math.radians(ELEVATION_DEG)
    ring_pts = [panel.atoms[(a, a)] for a in ring.atoms]
    ups = []
    for k in range(6):
        y, yb, ya = -ring_pts[k][1], -ring_pts[k - 1][1], -ring_pts[(k + 1) % 6][1]
        ups.append(y > yb and y > ya)
    h = _pucker(ring_pts, ups, eps)
    z_ring = {a: (h if ups[k] else -h) for k, a in enumerate(ring.atoms)}
    mol = Chem.AddHs(analysis.mol)
    conf = Chem.Conformer(mol.GetNumAtoms())
    rdDepictor.Compute2DCoords(mol)
    flat = mol.GetConformer()
    for i in range(mol.GetNumAtoms()):  # atoms the drawing does not place: far away, off to one side
        q = flat.GetAtomPosition(i)
        conf.SetAtomPosition(i, Point3D(q.x * 20 + 500, q.y * 20, 0))

    def put(idx, x2, y2, z):
        y_page = -y2
        depth = (y_page - z * math.cos(eps)) / math.sin(eps)
        conf.SetAtomPosition(idx, Point3D(x2, depth, z))

    for k, a in enumerate(ring.atoms):
        put(a, ring_pts[k][0], ring_pts[k][1], z_ring[a])
    ring_3d = [tuple(conf.GetAtomPosition(a)) for a in ring.atoms]
    used_h = set()
    for (ring_atom, atom), (x2, y2) in panel.atoms.items():
        if atom == ring_atom:
            continue
        rx, ry = ring_pts[ring.atoms.index(ring_atom)]
        dx, dy = x2 - rx, -(y2 - ry)
        length = math.hypot(dx, dy)
        if abs(dx) < 1e-6:  # vertical: axial, straight up or down
            z = z_ring[ring_atom] + math.copysign(length, dy)
        else:  # equatorial: parallel to the ring bonds one step away, so its 3D direction is theirs
            k = ring.atoms.index(ring_atom)
            a3, b3 = ring_3d[(k + 1) % 6], ring_3d[(k + 2) % 6]
            v = (b3[0] - a3[0], b3[1] - a3[1], b3[2] - a3[2])
            t = dx / v[0] if abs(v[0]) > 1e-6 else dy / (v[2] * math.cos(eps) + v[1] * math.sin(eps))
            z = z_ring[ring_atom] + t * v[2]
        if atom is None:  # an H: use one of the ring atom's explicit H atoms
            hs = [
                n.GetIdx()
                for n in mol.GetAtomWithIdx(ring_atom).GetNeighbors()
                if n.GetAtomicNum() == 1 and n.GetIdx() not in used_h
            ]
            if not hs:
                continue
            atom = hs[0]
            used_h.add(atom)
        conf.SetAtomPosition(atom, Point3D(0, 0, 0))
        y_page = y2
        put(atom, x2, y_page, z)
    mol.RemoveAllConformers()
    mol.AddConformer(conf, assignId=True)
    Chem.AssignStereochemistryFrom3D(mol, replaceExistingTags=True)
    mol.RemoveAllConformers()  # InChI would read the rough 3D itself; the test is RDKit's perception
    return Chem.RemoveHs(mol)


def _pucker(points, ups, eps) -> float:
    """How far (pt) the ring atoms sit above and below the mean plane: the value at which the six
    ring bonds rebuilt in 3D come out equally long, as they are in a chair."""

    def spread(h):
        xyz = []
        for (x, y), up in zip(points, ups):
            z = h if up else -h
            xyz.append((x, (-y - z * math.cos(eps)) / math.sin(eps), z))
        lengths = [math.dist(xyz[k], xyz[(k + 1) % 6]) for k in range(6)]
        return max(lengths) - min(lengths)

    return min((spread(h / 20), h / 20) for h in range(1, 400))[1]


@settings(max_examples=2000, deadline=None, suppress_health_check=[HealthCheck.filter_too_much])
@given(substituted_rings())
def test_drawn_chairs_read_back_as_the_input_stereoisomer(smiles):
    if smiles is None:
        return
    analysis = chairdraw.analyze(smiles)
    if len(analysis.rings) != 1 or analysis.rings[0].configuration is not None:
        return  # open stereo: enumerated configurations are checked in the engine's own tests
    ring = analysis.rings[0]
    want = Chem.MolToInchi(Chem.MolFromSmiles(smiles))
    for chair in ring.chairs:
        got = Chem.MolToInchi(_lift(analysis, ring, chair))
        assert got == want, (smiles, chair.name)


@pytest.mark.parametrize(
    "smiles",
    [
        "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O",  # beta-D-glucopyranose
        "CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O",  # (-)-menthol
        "CO[C@@H]1O[C@H](CO)[C@@H](O)[C@H](O)[C@H]1O",
        "C[C@H]1CC[C@@H](O[Si](C)(C)C(C)(C)C)CC1",
    ],
)
def test_named_examples_read_back_from_both_chairs(smiles):
    analysis = chairdraw.analyze(smiles)
    want = Chem.MolToInchi(Chem.MolFromSmiles(smiles))
    for chair in analysis.rings[0].chairs:
        assert Chem.MolToInchi(_lift(analysis, analysis.rings[0], chair)) == want


# --- the figure and its files -------------------------------------------------------------------

DEMO_LIKE = [
    "C[C@H]1CC[C@@H](O)CC1",
    "CC1CCCCC1",  # small chairs: the captions must clear the energy text
    "C1CC[NH2+]CC1",  # a ring N+: bonds clear of its charge
    "C[C@H]1CC[C@@H](C(F)(F)C(F)(F)F)CC1",  # a group with no condensed label (skeletal)
    "O=C(N[C@H]1CC[C@@H](c2ccc(F)cc2)CC1)c1ccccn1",
    "C[C@@H](O)[C@H]1CC[C@@H](C)CC1",
    "CO[C@@H]1O[C@H](CO)[C@@H](O)[C@H](O)[C@H]1O",
    "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O",
    "COC(=O)[C@H]1CC[C@@H](O[Si](C)(C)C(C)(C)C)CC1",
    "CC(=O)N1CCCC[C@@H]1C",
    "C[C@@H]1CCC(=O)CC1",
]


@pytest.mark.parametrize("smiles", DEMO_LIKE)
def test_nothing_touches_in_the_figure(smiles):
    figure = chairdraw.draw(smiles)
    assert clashes(list(figure.strokes), list(figure.texts)) == []


def test_favoured_chair_is_flagged_without_colour():
    figure = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1")  # cis: 4-Me equatorial favoured
    captions = [t for t in figure.texts if t.role == "caption"]
    assert [t.weight for t in captions].count("bold") == 1
    arrows = sorted(
        (abs(s.end[0] - s.start[0]), s.end[0] - s.start[0] > 0) for s in figure.strokes if s.role == "arrow"
    )
    (short, _), (long_, long_points_right) = arrows
    assert long_ > short
    bold_x = next(t.x for t in captions if t.weight == "bold")
    other_x = next(t.x for t in captions if t.weight != "bold")
    assert long_points_right == (bold_x > other_x)
    assert 'fill="red"' not in figure.svg() and 'stroke="red"' not in figure.svg()


def test_svg_is_valid_xml_with_title_description_and_point_size():
    svg = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1").svg()
    root = ET.fromstring(svg)
    ns = "{http://www.w3.org/2000/svg}"
    assert root.find(f"{ns}title").text.startswith("Chair conformations")
    assert "favoured" in root.find(f"{ns}desc").text
    assert root.get("width").endswith("pt")


def test_png_has_the_size_the_dpi_asks_for_and_is_not_blank():
    figure = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1")
    image = Image.open(io.BytesIO(figure.render("png", dpi=150))).convert("L")
    assert abs(image.width - figure.width * 150 / 72) <= 1 and abs(image.height - figure.height * 150 / 72) <= 1
    dark = image.histogram()[:128]
    dark = sum(dark)
    assert 0.005 < dark / (image.width * image.height) < 0.3


def test_pdf_page_is_the_figure_size_in_points():
    pypdf = pytest.importorskip("pypdf")
    figure = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1")
    page = pypdf.PdfReader(io.BytesIO(figure.render("pdf"))).pages[0]
    assert abs(float(page.mediabox.width) - figure.width) < 0.5
    assert abs(float(page.mediabox.height) - figure.height) < 0.5


def test_analysis_shows_itself_in_jupyter():
    assert chairdraw.analyze("CC1CCCCC1")._repr_svg_().startswith("<svg")
    assert chairdraw.analyze("CCO")._repr_svg_() is None


def test_units_kj():
    figure = draw_analysis(chairdraw.analyze("CC1CCCCC1"), Style(units="kJ"))
    energy = next(t.plain for t in figure.texts if t.role == "energy")
    assert energy.startswith("\u0394G(298 K) = ") and energy.endswith("kJ/mol")
    assert (
        abs(float(energy.split("=")[1].split()[0]) - 1.74 * 4.184) < 0.1
    )  # Me A-value 1.74 kcal/mol (Booth 1980; Eliel & Wilen 1994)


def test_single_chair_choices():
    analysis = chairdraw.analyze("CC1CCCCC1")
    favoured = draw_analysis(analysis, chairs="favored")
    flipped = draw_analysis(analysis, chairs="flip")
    assert [t.weight for t in favoured.texts if t.role == "caption"] == ["bold"]
    assert [t.weight for t in flipped.texts if t.role == "caption"] == ["regular"]
    assert not [s for s in favoured.strokes if s.role == "arrow"]


# --- command line -------------------------------------------------------------------------------


def test_cli_draw_writes_each_type(tmp_path, capsys):
    for kind in ("svg", "png", "pdf"):
        out = tmp_path / f"f.{kind}"
        assert main(["draw", "C[C@H]1CC[C@@H](O)CC1", "-o", str(out), "--dpi", "100", "--forcefield", "never"]) == 0
        assert out.stat().st_size > 500
    assert "wrote" in capsys.readouterr().err


@pytest.mark.parametrize(
    "argv,message",
    [
        (["draw", "CCO", "-o", "x.svg"], "no ring that can take a chair"),
        (["draw", "CC1CCCCC1", "-o", "x.gif"], "ending in .svg, .png or .pdf"),
        (["draw", "CC1CCCCC1", "-o", "x.svg", "--ring", "3"], "ring 3 asked for"),
        (["draw", "CC1CCCCC1", "-o", "x.png", "--dpi", "0"], "dpi must be"),
        (["draw", "CC1CCCCC1", "-o", "x.svg", "--bond-length", "-2"], "bond_length"),
        (["draw", "CC1CCCCC1", "-o", "x.svg", "--bond-length", "2000"], "bond_length must be a number from 0 to 144"),
        (["draw", "CC1CCCCC1", "-o", "x.png", "--dpi", "5"], "dpi must be"),
        (["draw", "OCC1OC(O)C(O)C(O)C1O", "-o", "x.png", "--dpi", "2400"], "larger than cairo can make"),
        (["demo", "--out", "afile"], "cannot make the gallery directory"),
    ],
)
def test_cli_draw_bad_input(tmp_path, capsys, monkeypatch, argv, message):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "afile").write_text("")
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert message in err and "Traceback" not in err and len(err.strip().splitlines()) == 1


def test_cli_style_file(tmp_path):
    style = tmp_path / "journal.toml"
    style.write_text("[style]\nbond_length = 20\nfont_size = 8\n")
    small = tmp_path / "a.svg"
    big = tmp_path / "b.svg"
    assert main(["draw", "CC1CCCCC1", "-o", str(small), "--forcefield", "never"]) == 0
    assert main(["draw", "CC1CCCCC1", "-o", str(big), "--style", str(style), "--forcefield", "never"]) == 0
    width = [float(ET.parse(p).getroot().get("width")[:-2]) for p in (small, big)]
    assert width[1] > width[0]
    for bad in (
        "bond_lenght = 20\n",
        "style = 3\n",
        "bond_length = true\n",
        'numbering = "no"\n',
        "font_size = 1e308\n",
    ):
        style.write_text(bad)
        assert main(["draw", "CC1CCCCC1", "-o", str(big), "--style", str(style)]) == 2


def test_demo_writes_the_gallery(tmp_path):
    assert main(["demo", "--out", str(tmp_path), "--forcefield", "never"]) == 0
    svgs = sorted(p.name for p in tmp_path.glob("*.svg"))
    assert len(svgs) >= 12 and len(list(tmp_path.glob("*.png"))) == len(svgs)


# --- the chair as a molfile ---------------------------------------------------------------------


def _lift_molfile(block: str, analysis, ring) -> Chem.Mol:
    """3D from a chair molfile's 2D coordinates (same rules as _lift), stereo perceived by RDKit.
    The file numbers atoms as the input without its explicit H atoms (then the added H)."""
    from types import SimpleNamespace

    from chairdraw._rdkit import without_hs

    new = without_hs(analysis.mol)[1]
    ring = SimpleNamespace(atoms=tuple(new[a] for a in ring.atoms))
    mol = Chem.MolFromMolBlock(block, removeHs=False)
    assert mol is not None
    # centres away from the chair are read from the file's wedges (as RDKit does), the chair's
    # own from its geometry below
    kept = {a.GetIdx(): a.GetChiralTag() for a in mol.GetAtoms() if a.GetIdx() not in ring.atoms}
    xy = mol.GetConformer()
    eps = math.radians(ELEVATION_DEG)
    pts = [(xy.GetAtomPosition(a).x, -xy.GetAtomPosition(a).y) for a in ring.atoms]  # page y down
    ups = [(-pts[k][1] > -pts[k - 1][1] and -pts[k][1] > -pts[(k + 1) % 6][1]) for k in range(6)]
    h = _pucker(pts, ups, eps)
    conf = Chem.Conformer(mol.GetNumAtoms())
    z_of = {}
    for k, a in enumerate(ring.atoms):
        z_of[a] = h if ups[k] else -h
    ring_3d = []
    for k, a in enumerate(ring.atoms):
        x, y = pts[k]
        ring_3d.append((x, (-y - z_of[a] * math.cos(eps)) / math.sin(eps), z_of[a]))
        conf.SetAtomPosition(a, Point3D(*ring_3d[-1]))
    for atom in mol.GetAtoms():
        i = atom.GetIdx()
        if i in z_of:
            continue
        ring_nbrs = [n.GetIdx() for n in atom.GetNeighbors() if n.GetIdx() in z_of]
        p = xy.GetAtomPosition(i)
        if not ring_nbrs:
            conf.SetAtomPosition(i, Point3D(p.x + 100, p.y, 0))
            continue
        r = ring_nbrs[0]
        k = ring.atoms.index(r)
        dx, dy = p.x - pts[k][0], p.y - xy.GetAtomPosition(r).y  # dy: up the page
        if abs(dx) < 1e-3:
            z = z_of[r] + math.copysign(math.hypot(dx, dy), dy)
        else:
            a3, b3 = ring_3d[(k + 1) % 6], ring_3d[(k + 2) % 6]
            v = tuple(b3[n] - a3[n] for n in range(3))
            t = dx / v[0] if abs(v[0]) > 1e-6 else dy / (v[2] * math.cos(eps) + v[1] * math.sin(eps))
            z = z_of[r] + t * v[2]
        conf.SetAtomPosition(i, Point3D(p.x, (p.y - z * math.cos(eps)) / math.sin(eps), z))
    mol.RemoveAllConformers()
    mol.AddConformer(conf, assignId=True)
    Chem.AssignStereochemistryFrom3D(mol, replaceExistingTags=True)
    for i, tag in kept.items():
        mol.GetAtomWithIdx(i).SetChiralTag(tag)
    mol.RemoveAllConformers()
    Chem.AssignStereochemistry(mol, cleanIt=True, force=True)
    return Chem.RemoveHs(mol)


@pytest.mark.parametrize(
    "smiles",
    [
        "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O",  # beta-D-glucopyranose
        "CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O",  # (-)-menthol
        "C[C@H]1CC[C@@H](O)CC1",
        "C[C@@H]1CCCCO1",
        "C[C@H](O)[C@H]1CC[C@@H](C)CC1",  # a side-chain stereocentre: wedged in the file
        "C[C@@H]1CC[C@H](CC1)[C@H]1CC[C@H](O)CC1",  # a second chair ring: its centres wedged
        "[H][C@]1(CC[C@@H](C)CC1)O",  # an explicit H atom first
    ],
)
@pytest.mark.parametrize("which", ["favored", "flip"])
def test_chair_molfile_reads_back_as_the_input(smiles, which):
    from chairdraw.chairmol import chair_molblock

    analysis = chairdraw.analyze(smiles)
    block = chair_molblock(analysis, chair=which)
    plain = Chem.MolFromMolBlock(block)
    # read by RDKit alone (wedges only), the chair's own centres are open and the others set
    ring = set(analysis.rings[0].atoms)
    outside = [i for i, _ in Chem.FindMolChiralCenters(analysis.mol) if i not in ring]  # the input's numbering
    read = Chem.FindMolChiralCenters(plain, includeUnassigned=True, useLegacyImplementation=False)
    assert sum(1 for _, label in read if label != "?") == len(outside)
    mol = Chem.MolFromMolBlock(block, removeHs=False)
    from chairdraw._rdkit import without_hs

    new = without_hs(analysis.mol)[1]
    assert all(mol.GetAtomWithIdx(new[c.atom]).GetDegree() == 4 for c in analysis.rings[0].stereo)  # H on centres
    got = Chem.MolToInchi(_lift_molfile(block, analysis, analysis.rings[0]))
    assert got == Chem.MolToInchi(Chem.MolFromSmiles(smiles))


def test_cli_writes_the_chair_molfile(tmp_path):
    out = tmp_path / "chair.mol"
    assert (
        main(
            [
                "draw",
                "C[C@H]1CC[C@@H](O)CC1",
                "-o",
                str(tmp_path / "f.svg"),
                "--molfile",
                str(out),
                "--forcefield",
                "never",
            ]
        )
        == 0
    )
    assert "V2000" in out.read_text() and Chem.MolFromMolFile(str(out)) is not None


# --- groups drawn as skeletal fragments -------------------------------------------------------


def test_a_group_without_a_condensed_label_is_drawn_skeletal_with_its_stereo():
    smiles = "C[C@@H](O)[C@H]1CC[C@@H](C)CC1"  # a 1-hydroxyethyl group: no table row, estimated
    analysis = chairdraw.analyze(smiles)
    assert any(p.estimated for p in analysis.rings[0].chairs[0].positions)
    figure = draw_analysis(analysis)
    plain = [t.plain for t in figure.texts]
    labels = [t.plain for t in figure.texts if t.role == "label"]
    assert not any("C2H5O" in t or "OH5C2" in t for t in labels)  # drawn, not written as a formula
    assert plain.count("OH") + plain.count("HO") == 2  # the group's O, once per chair
    marks = [p for p in figure.polygons if p.role == "wedge"] + [s for s in figure.strokes if s.role == "hash"]
    assert marks  # its stereocentre keeps a wedge or hash
    panel, _ = chair_panel(analysis, analysis.rings[0], analysis.rings[0].chairs[0], Style())
    ring_xy = [panel.atoms[(a, a)] for a in analysis.rings[0].atoms]
    for wedge in (p for p in panel.polygons if p.role == "wedge"):
        assert min(math.dist(wedge.points[0], q) for q in ring_xy) > 1.0  # never on a chair atom


def test_labelled_groups_stay_labels():
    figure = chairdraw.draw("COC(=O)[C@H]1CC[C@@H](O[Si](C)(C)C(C)(C)C)CC1")
    plain = {t.plain for t in figure.texts}
    assert {"OTBS", "TBSO"} & plain and {"CO2Me", "MeO2C"} & plain
    assert not figure.polygons or all(p.role == "arrow" for p in figure.polygons)


def test_show_flat_adds_the_input_as_drawn(tmp_path):
    from rdkit.Chem import AllChem

    mol = Chem.MolFromSmiles("C[C@H]1CC[C@@H](O)CC1")
    AllChem.Compute2DCoords(mol)
    path = tmp_path / "in.mol"
    path.write_text(Chem.MolToMolBlock(mol))  # the file's own wedges are drawn
    plain = draw_analysis(chairdraw.analyze(str(path)))
    flat = draw_analysis(chairdraw.analyze(str(path)), show_flat=True)
    assert flat.width > plain.width
    assert "as drawn" in {t.plain for t in flat.texts}
    wedges = [p for p in flat.polygons if p.role == "wedge"] + [s for s in flat.strokes if s.role == "hash"]
    assert wedges and clashes(list(flat.strokes), list(flat.texts)) == []


def test_control_characters_do_not_break_the_svg():
    figure = draw_analysis(chairdraw.analyze("CC1CCCCC1"), caption="a\x01b\x07c")
    root = ET.fromstring(figure.svg())  # parses: the characters XML forbids are dropped
    assert root is not None and "a\x01b" not in figure.svg()


def test_pyranose_c1_on_the_right_tip():
    analysis = chairdraw.analyze("OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O")  # ring atoms O5, C1 .. C5
    ring = analysis.rings[0]
    c1 = ring.atoms[[loc.lstrip("CO") for loc in ring.locants].index("1")]
    assert ring.locants[ring.atoms.index(c1)] in ("C1", "1")
    for chair in ring.chairs:
        panel, _ = chair_panel(analysis, ring, chair, Style())
        xs = {a: panel.atoms[(a, a)][0] for a in ring.atoms}
        assert xs[c1] == max(xs.values())


def test_overlaps_are_rare_on_rdkit_sample_molecules():
    """On RDKit's NCI sample (its first 60 usable ring molecules, stereo assigned), at most one
    figure in ten may have anything touching; 9 of 132 did when this was written, all crowded
    peracetylated sugars or skeletal groups next to labels."""
    import os

    from rdkit import RDConfig
    from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

    options = StereoEnumerationOptions(onlyUnassigned=True, maxIsomers=1)
    drawn = touching = 0
    with open(os.path.join(RDConfig.RDDataDir, "NCI", "first_5K.smi")) as handle:
        for line in handle:
            mol = Chem.MolFromSmiles(line.split()[0])
            if mol is None:
                continue
            mol = next(iter(EnumerateStereoisomers(mol, options=options)), mol)
            try:
                figure = chairdraw.draw(Chem.MolToSmiles(mol))
            except chairdraw.ChairdrawError:
                continue
            drawn += 1
            touching += bool(clashes(list(figure.strokes), list(figure.texts)))
            if drawn == 60:
                break
    assert drawn == 60
    assert touching <= 6, touching


def test_groups_behind_ch2_get_condensed_labels():
    from chairdraw.substituents import condensed_label

    assert condensed_label("*CO[Si](C)(C)C(C)(C)C") == "CH2OTBS"
    assert condensed_label("*COC(C)=O") == "CH2OAc"
    assert condensed_label("*CCO") == "CH2CH2OH"
    assert condensed_label("*CCC") is None  # an alkyl chain is drawn, not written CH2Et
    assert condensed_label("*C(C)OC(C)=O") is None  # not a CH2 link
    figure = chairdraw.draw("CC(=O)OC[C@H]1O[C@@H](OC(C)=O)[C@H](OC(C)=O)[C@@H](OC(C)=O)[C@@H]1OC(C)=O")
    assert {"CH2OAc", "AcOH2C"} & {t.plain for t in figure.texts}


@pytest.mark.parametrize(
    "smiles", ["OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O", "CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O", "C[C@@H]1CCCCN1"]
)
def test_each_locant_sits_nearest_its_own_ring_atom(smiles):
    analysis = chairdraw.analyze(smiles)
    ring = analysis.rings[0]
    for chair in ring.chairs:
        panel, _ = chair_panel(analysis, ring, chair, Style(numbering=True))
        at = {loc.lstrip("C"): panel.atoms[(a, a)] for a, loc in zip(ring.atoms, ring.locants)}
        numbers = [t for t in panel.texts if t.role == "locant"]
        assert len(numbers) >= 5  # the ring O of a sugar gets none; every carbon one
        for t in numbers:
            x0, y0, x1, y1 = t.extent()
            centre = ((x0 + x1) / 2, (y0 + y1) / 2)
            nearest = min(at, key=lambda n: math.dist(at[n], centre))
            assert nearest == t.plain, (smiles, chair.name, t.plain, nearest)


def _molfile_with_h_in_the_middle() -> str:
    from rdkit.Chem import AllChem

    mol = Chem.AddHs(Chem.MolFromSmiles("O[C@H]1CC[C@@H](C)CC1"))  # H atoms numbered after the heavy atoms
    order = [0, 1, 8, 2, 3, 4, 5, 6, 7] + list(range(9, mol.GetNumAtoms()))  # one H moved among them
    mol = Chem.RenumberAtoms(mol, order)
    AllChem.Compute2DCoords(mol)
    Chem.WedgeMolBonds(mol, mol.GetConformer())
    return Chem.MolToMolBlock(mol)


def test_explicit_h_atoms_anywhere_in_a_molfile(tmp_path):
    path = tmp_path / "h.mol"
    path.write_text(_molfile_with_h_in_the_middle())
    out, chair = tmp_path / "f.svg", tmp_path / "chair.mol"
    assert (
        main(["draw", str(path), "-o", str(out), "--molfile", str(chair), "--show-flat", "--forcefield", "never"]) == 0
    )
    analysis = chairdraw.analyze(str(path))
    figure = draw_analysis(analysis, show_flat=True)
    assert {"OH", "HO"} & {t.plain for t in figure.texts} and "as drawn" in {t.plain for t in figure.texts}
    want = Chem.MolToInchi(Chem.MolFromSmiles("O[C@H]1CC[C@@H](C)CC1"))
    assert Chem.MolToInchi(_lift_molfile(chair.read_text(), analysis, analysis.rings[0])) == want


@pytest.mark.parametrize(
    "smiles,hidden",
    [
        ("CC1CCC(=NO)CC1", None),  # an oxime: the whole =N-OH, not '=N'
        ("CCOC(=O)/C=C1/CC[C@@H](C)[C@H](C)C1", None),  # an exocyclic alkylidene ester, with its E/Z
        ("C[S@@](=O)[C@H]1CC[C@@H](C)CC1", "S(O)Me"),  # a stereogenic sulfoxide: not hidden in a label
        ("O[C@@H]([2H])[C@H]1CC[C@@H](C)CC1", "CH2OH"),  # an isotope and a stereocentre: drawn
        ("[13CH3][C@H]1CC[C@@H](C)CC1", None),
    ],
)
def test_what_a_label_would_hide_is_drawn(smiles, hidden):
    figure = chairdraw.draw(smiles)
    texts = {t.plain for t in figure.texts}
    if hidden:
        assert hidden not in texts and DRAWN_REVERSED.get(hidden, hidden) not in texts
    if "13C" in smiles:
        assert "13CH3" in texts  # the isotope written with its mass number
    heavy = Chem.MolFromSmiles(smiles).GetNumHeavyAtoms()
    ring_kept = 6
    drawn_bonds = [s for s in figure.strokes if s.role in ("bond", "double", "hash")]
    assert drawn_bonds and len(drawn_bonds) + len(figure.polygons) >= heavy - ring_kept  # every group atom drawn


DRAWN_REVERSED = {"S(O)Me": "MeS(O)", "CH2OH": "HOH2C", "Me": "Me"}


def test_e_and_z_exocyclic_isomers_differ():
    e = chairdraw.draw("CCOC(=O)/C=C1/CC[C@@H](C)[C@H](C)C1").svg()
    z = chairdraw.draw("CCOC(=O)/C=C1\\CC[C@@H](C)[C@H](C)C1").svg()
    assert e != z


@pytest.mark.parametrize(
    "smiles",
    [
        "CCN(CC)[C@@H]1CCCC/C1=N/O",  # RDKit's layout around the pinned chair drew this oxime E
        "CCN(CC)[C@@H]1CCCC/C1=N\\O",
        "CCOC(=O)/C=C1/CC[C@@H](C)[C@H](C)C1",
        "CCOC(=O)/C=C1\\CC[C@@H](C)[C@H](C)C1",
        "C/C=C/[C@H]1CC[C@@H](C)CC1",
        "C/C=C\\[C@H]1CC[C@@H](C)CC1",
    ],
)
@pytest.mark.parametrize("which", ["favored", "flip"])
def test_double_bonds_keep_their_geometry_in_the_chair_molfile(smiles, which):
    """RDKit reads E/Z from the molfile's 2D coordinates; its CIP label must be the input's."""
    from rdkit.Chem import rdCIPLabeler

    from chairdraw.chairmol import chair_molblock

    def labels(mol):
        rdCIPLabeler.AssignCIPLabels(mol)
        return sorted(b.GetProp("_CIPCode") for b in mol.GetBonds() if b.HasProp("_CIPCode"))

    block = chair_molblock(chairdraw.analyze(smiles), chair=which)
    assert labels(Chem.MolFromMolBlock(block)) == labels(Chem.MolFromSmiles(smiles))


def test_racemic_input_says_so_in_the_figure():
    figure = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1 |&1:1,4|")
    assert any(t.role == "note" and "racemic" in t.plain for t in figure.texts)


def test_protected_sugars_get_their_usual_labels():
    glcnac = chairdraw.draw("CC(=O)N[C@H]1[C@@H](O)O[C@H](CO)[C@@H](O)[C@@H]1O")  # N-acetylglucosamine
    assert {"NHAc", "AcHN"} & {t.plain for t in glcnac.texts}
    benzyl = chairdraw.draw("CO[C@@H]1O[C@H](COCc2ccccc2)[C@@H](OCc2ccccc2)[C@H](OCc2ccccc2)[C@H]1OCc1ccccc1")
    texts = {t.plain for t in benzyl.texts}
    assert {"OBn", "BnO"} & texts and {"CH2OBn", "BnOH2C"} & texts


@pytest.mark.parametrize(
    "smiles,label",
    [
        ("CC(C)(C)OC(=O)N1CCCC[C@@H]1C", "Boc"),  # carbamates on a ring N are written as such
        ("O=C(OCc1ccccc1)N1CCCC[C@@H]1C", "Cbz"),
        ("O=C(c1ccccc1)N1CCCC[C@@H]1C", "Bz"),
        ("CC(=O)N1CCCC[C@@H]1C", "Ac"),
    ],
)
def test_n_protecting_groups_are_written_the_usual_way(smiles, label):
    assert label in {t.plain for t in chairdraw.draw(smiles).texts}


def test_a_font_file_of_ones_own(tmp_path):
    from importlib import resources

    bold = str(resources.files("chairdraw") / "fonts" / "LiberationSans-Bold.ttf")  # any TTF will do
    plain = chairdraw.draw("C[C@H]1CC[C@@H](O)CC1")
    own = draw_analysis(chairdraw.analyze("C[C@H]1CC[C@@H](O)CC1"), Style(font_file=bold))
    from chairdraw.render.text import font_key

    assert {t.font for t in own.texts} == {font_key(bold)}
    own_o = next(t for t in own.texts if t.plain == "OH")
    ref_o = next(t for t in plain.texts if t.plain == "OH")
    from chairdraw.render import text as fonttext

    assert fonttext.outline("O", 0, 0, 10, "regular", own_o.font) != fonttext.outline(
        "O", 0, 0, 10, "regular", ref_o.font
    )
    assert clashes(list(own.strokes), list(own.texts)) == []
    assert main(["draw", "CC1CCCCC1", "-o", str(tmp_path / "f.png"), "--font", bold, "--forcefield", "never"]) == 0
    bad = tmp_path / "not-a-font.ttf"
    bad.write_text("hello")
    assert main(["draw", "CC1CCCCC1", "-o", str(tmp_path / "g.svg"), "--font", bad.as_posix()]) == 2
    assert main(["draw", "CC1CCCCC1", "-o", str(tmp_path / "g.svg"), "--font", str(tmp_path / "none.ttf")]) == 2


def _font_without(tmp_path, chars: str) -> str:
    """A copy of the shipped font with the glyphs of ``chars`` unmapped."""
    from importlib import resources

    from fontTools.ttLib import TTFont

    face = TTFont(str(resources.files("chairdraw") / "fonts" / "LiberationSans-Regular.ttf"))
    for table in face["cmap"].tables:
        for ch in chars:
            table.cmap.pop(ord(ch), None)
    path = tmp_path / "partial.ttf"
    face.save(str(path))
    return str(path)


def test_signs_missing_from_a_font_come_from_the_shipped_one(tmp_path):
    from chairdraw.render import text as fonttext

    partial = _font_without(tmp_path, "\u2261\u0394")  # no triple bond, no Delta
    key = fonttext.font_key(partial)
    assert fonttext.outline("\u0394", 0, 0, 10, "regular", key) == fonttext.outline("\u0394", 0, 0, 10)
    assert fonttext.outline("?", 0, 0, 10, "regular", key) != fonttext.outline("\u0394", 0, 0, 10, "regular", key)
    figure = draw_analysis(chairdraw.analyze("C#C[C@H]1CC[C@@H](C)CC1"), Style(font_file=partial))
    assert figure.svg()  # drawn, with the shipped glyphs for the missing signs


def test_broken_font_files_are_clean_errors(tmp_path):
    from importlib import resources

    good = (resources.files("chairdraw") / "fonts" / "LiberationSans-Regular.ttf").read_bytes()
    truncated = tmp_path / "truncated.ttf"
    truncated.write_bytes(good[: len(good) // 3])
    for path in (truncated,):
        assert (
            main(["draw", "CC1CCCCC1", "-o", str(tmp_path / "x.svg"), "--font", str(path), "--forcefield", "never"])
            == 2
        )


def test_explicit_h_atoms_keep_heteroatom_hydrogens_in_drawn_groups():
    # SMILES with H atoms written out: the flat panel and a skeletal group still say NH2 and OH
    figure = chairdraw.draw("[H]N([H])C(=O)[C@@H]1CC[C@H](C[C@@H](C)O[H])CC1", show_flat=True)
    texts = [t.plain for t in figure.texts]
    assert any(t in ("NH2", "H2N") for t in texts) and "N" not in texts
    assert sum(t in ("OH", "HO") for t in texts) == 3  # the side chain in both chairs and the flat panel


@pytest.mark.parametrize(
    "smiles,captions",
    [
        ("C[C@H]1CC[C@@H](O)CC1", {"4-Me axial", "1-OH axial"}),
        ("CC(=O)OC[C@H]1CC[C@@H](O)CC1", {"4-CH2OAc axial", "1-OH axial"}),  # as the chair writes it
        ("C#C[C@H]1CC[C@@H](C)CC1", {"1-C\u2261CH axial", "4-Me axial"}),
        ("CC[C@H](C)[C@H]1CC[C@@H](C)CC1", {"1-group axial", "4-Me axial"}),  # drawn skeletal
        ("C[C@H]1CC[C@H](C)CC1", {"all equatorial", "1-Me, 4-Me axial"}),  # trans-1,4
    ],
)
def test_captions_name_the_axial_groups_as_drawn(smiles, captions):
    figure = chairdraw.draw(smiles)
    got = {t.plain.split("  ")[0] for t in figure.texts if t.role == "caption"}
    assert got == captions
