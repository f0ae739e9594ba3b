"""Chair figures as geometry: strokes, text and arrow heads in points, y down, no SVG syntax.

A chair is drawn the way chemists draw it, and here it is an exact picture: the ideal chair
(tetrahedral angles, D3d) is projected orthographically from slightly above and to one side. So
opposite ring bonds are parallel, axial bonds are vertical, and every equatorial bond is parallel
to the ring bonds one step away from its atom, because all three hold in the ideal chair itself.
The page's up is the ring's top face (the face from which the numbering runs clockwise), so a
group on the top face points up-axial or up-equatorial, and faces read off the picture.

Picture slots: 0 right tip, 1 front right, 2 front left, 3 left tip, 4 back left, 5 back right
(clockwise seen from the top face). The ring atom numbered 1 (C1 in a sugar) sits on the right
tip. Where it points down, the picture is the mirror image (right tip down, left tip up) with the
ring numbered the other way round the page, which keeps clockwise-from-the-top: so 4C1 and 1C4
look the way they are usually drawn, each the mirror image of the other.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cache, cached_property

from .labels import NORMAL, SUB, SUP, can_parse, parse_label
from .render import text as fonttext
from .render.style import Style

AZIMUTH_DEG = 15.0  # turns the back and front bonds off the horizontal, so no two atoms share an x
ELEVATION_DEG = 16.0  # view from above; below about 18 deg every ring atom stays a V (see tests)
_H = 1 / (4 * math.sqrt(2))  # half the ring's thickness for radius 1 and tetrahedral angles
_BOND_3D = math.sqrt(1 + 4 * _H * _H)  # ring bond length for radius 1
SUB_SCALE, SUB_DROP, SUP_RISE = 0.7, 0.25, 0.45  # subscript size and shifts, of the font size
DOUBLE_SPACING = 0.18  # of the bond length, between the lines of a multiple bond (common practice)

Point = tuple[float, float]


@dataclass(frozen=True)
class Stroke:
    """A straight line; ``role`` is ring, bond, double, arrow or mark (for tests and styling)."""

    start: Point
    end: Point
    width: float
    role: str
    depth: float = 0.0  # towards the viewer; a ring bond behind a crossing stroke gets a gap


@dataclass(frozen=True)
class TextRun:
    text: str
    kind: str  # normal, sub, sup


@dataclass(frozen=True)
class Text:
    """A piece of text with its baseline starting at (x, y); sub/superscripts shift from it."""

    runs: tuple[TextRun, ...]
    x: float
    y: float
    size: float
    weight: str
    role: str  # label, atom, caption, energy, locant, title
    plain: str  # the text as read aloud (aria-label)
    font: str = ""  # a user's font file(s) (Style.font_file), "" for the shipped font

    @cached_property
    def _boxes(self) -> tuple[tuple[float, float, float, float], ...]:
        return tuple(self._measure())

    def boxes(self) -> tuple[tuple[float, float, float, float], ...]:
        """Box (x0, y0, x1, y1) of each run: advance width by cap height, shifted for sub/sup."""
        return self._boxes

    def _measure(self):
        m = fonttext.metrics(self.weight, self.font)
        x, out = self.x, []
        for run in self.runs:
            size = self.size * (SUB_SCALE if run.kind != NORMAL else 1)
            base = self.y + {NORMAL: 0.0, SUB: SUB_DROP, SUP: -SUP_RISE}[run.kind] * self.size
            w = fonttext.width(run.text, size, self.weight, self.font)
            out.append((x, base - m.cap_height * size, x + w, base))
            x += w
        return out

    def extent(self) -> tuple[float, float, float, float]:
        boxes = self.boxes()
        return boxes[0][0], min(b[1] for b in boxes), boxes[-1][2], max(b[3] for b in boxes)


@dataclass(frozen=True)
class Polygon:
    points: tuple[Point, ...]
    role: str


@dataclass(frozen=True)
class ChairGeometry:
    """One chair in abstract units (ring bond 1, y up): per picture slot the atom's point, its
    axial and equatorial unit vectors, and depth."""

    points: tuple[Point, ...]
    axial: tuple[Point, ...]
    equatorial: tuple[Point, ...]
    depth: tuple[float, ...]
    up: tuple[bool, ...]


def clashes(strokes: list[Stroke], texts: list[Text], tolerance: float = 0.3, others: Sequence[Text] = ()) -> list[str]:
    """What touches what: pairs of texts whose run boxes overlap, and strokes that pass through a
    text's run box (each shrunk by ``tolerance`` pt). Bonds stop short of their labels, so a
    correct figure has none. With ``others``, ``texts`` are checked against them and not among
    themselves, and strokes against ``texts`` only (adding to a figure already checked)."""
    out = []

    def shrunk(t):
        return [(b[0] + tolerance, b[1] + tolerance, b[2] - tolerance, b[3] - tolerance) for b in t.boxes()]

    boxes = [(t, shrunk(t)) for t in texts]
    fixed = [(t, shrunk(t)) for t in others]
    for n, (t, bs) in enumerate(boxes):
        for u, cs in fixed if others else boxes[n + 1 :]:
            if any(boxes_overlap(b, c) for b in bs for c in cs):
                out.append(f"text {t.plain!r} touches text {u.plain!r}")
        for s in strokes:
            if any(segment_hits_box(s.start, s.end, b) for b in bs):
                out.append(f"{s.role} line touches text {t.plain!r}")
    return out


@cache
def chair_geometry(up: tuple[bool, ...]) -> ChairGeometry:
    """The projected ideal chair whose picture slot j points up where ``up[j]``."""
    ce, se = math.cos(math.radians(ELEVATION_DEG)), math.sin(math.radians(ELEVATION_DEG))
    atoms = []
    for j in range(6):
        theta = math.radians(AZIMUTH_DEG - 60 * j)
        atoms.append((math.cos(theta), math.sin(theta), _H if up[j] else -_H))

    def project(v):  # (x, y-up on the page, depth towards the viewer)
        return v[0] / _BOND_3D, (v[2] * ce + v[1] * se) / _BOND_3D, (-v[1] * ce + v[2] * se) / _BOND_3D

    points, axial, equatorial, depth = [], [], [], []
    for j in range(6):
        a = atoms[j]
        ax = (0.0, 0.0, 1.0 if up[j] else -1.0)
        u1 = _unit(_sub(atoms[j - 1], a))
        u2 = _unit(_sub(atoms[(j + 1) % 6], a))
        eq = _unit(tuple(-(u1[i] + u2[i] + ax[i]) for i in range(3)))  # the fourth tetrahedral bond
        px, py, pd = project(a)
        points.append((px, py))
        depth.append(pd)
        axial.append(unit_vector(project(ax)[:2]))
        equatorial.append(unit_vector(project(eq)[:2]))
    return ChairGeometry(tuple(points), tuple(axial), tuple(equatorial), tuple(depth), tuple(up))


def ring_picture(up: tuple[bool, ...], first: int) -> ChairGeometry:
    """The chair for ring indices 0-5 (``up[k]``: ring atom k points up), with ring index ``first``
    on the right tip; the result is indexed by ring index, not by picture slot."""
    base = chair_geometry((True, False, True, False, True, False))
    mirrored = not up[first]
    order = []
    for k in range(6):
        step = (k - first) % 6
        order.append((3 - step) % 6 if mirrored else step)
    sign = -1.0 if mirrored else 1.0
    picture = ChairGeometry(
        points=tuple((sign * base.points[j][0], base.points[j][1]) for j in order),
        axial=tuple(base.axial[j] for j in order),
        equatorial=tuple((sign * base.equatorial[j][0], base.equatorial[j][1]) for j in order),
        depth=tuple(base.depth[j] for j in order),
        up=tuple(base.up[j] for j in order),
    )
    if picture.up != tuple(up):
        raise ValueError(f"not a chair: ring atoms pointing up {up}")
    return picture


def _sub(a, b):
    return tuple(a[i] - b[i] for i in range(len(a)))


def _unit(v):
    n = math.sqrt(sum(c * c for c in v))
    return tuple(c / n for c in v)


def unit_vector(v) -> Point:
    n = math.hypot(v[0], v[1])
    return v[0] / n, v[1] / n


# --- text ----------------------------------------------------------------------------------------


def label_runs(label: str, reverse: bool = False) -> tuple[tuple[TextRun, ...], tuple[int, int]]:
    """Runs of a substituent label and the character span of its attachment symbol. A label the
    grammar cannot read (a formula of an unnamed group) is shown as written, digits subscript."""
    if can_parse(label):
        parsed = parse_label(label)
        return tuple(TextRun(t, k) for t, k in parsed.runs(reverse)), parsed.attachment(reverse)
    runs: list[TextRun] = []
    for ch in label:
        kind = SUB if ch.isdigit() else NORMAL
        if runs and runs[-1].kind == kind:
            runs[-1] = TextRun(runs[-1].text + ch, kind)
        else:
            runs.append(TextRun(ch, kind))
    return tuple(runs), (0, 1)


def run_widths(runs: tuple[TextRun, ...], size: float, weight: str = "regular", font: str = "") -> list[float]:
    return [fonttext.width(r.text, size * (SUB_SCALE if r.kind != NORMAL else 1), weight, font) for r in runs]


def char_x(runs: tuple[TextRun, ...], size: float, index: int, weight: str = "regular", font: str = "") -> float:
    """x offset of character ``index`` of the joined runs from the start of the text."""
    x = 0.0
    for run in runs:
        s = size * (SUB_SCALE if run.kind != NORMAL else 1)
        if index < len(run.text):
            return x + fonttext.width(run.text[:index], s, weight, font)
        index -= len(run.text)
        x += fonttext.width(run.text, s, weight, font)
    return x


def centred_text(
    runs: tuple[TextRun, ...], cx: float, baseline: float, size: float, weight: str, role: str, font: str = ""
) -> Text:
    w = sum(run_widths(runs, size, weight, font))
    return Text(runs, cx - w / 2, baseline, size, weight, role, "".join(r.text for r in runs), font)


def chair_name_runs(name: str) -> tuple[TextRun, ...]:
    """'4C1' as superscript 4, C, subscript 1 (IUPAC typography)."""
    k = name.index("C") if "C" in name else -1
    if k <= 0:
        return (TextRun(name, NORMAL),)
    return (TextRun(name[:k], SUP), TextRun("C", NORMAL), TextRun(name[k + 1 :], SUB))


def anchored_label(
    runs: tuple[TextRun, ...], span: tuple[int, int], centre: Point, size: float, role: str = "label", font: str = ""
) -> Text:
    """A label placed so that the middle of its attachment symbol sits at ``centre`` (y down)."""
    m = fonttext.metrics("regular", font)
    x0 = char_x(runs, size, span[0], "regular", font)
    x1 = char_x(runs, size, span[1], "regular", font)
    x = centre[0] - (x0 + x1) / 2
    baseline = centre[1] + m.cap_height * size / 2
    return Text(runs, x, baseline, size, "regular", role, "".join(r.text for r in runs), font)


def symbol_box(text: Text, span: tuple[int, int], pad: float) -> tuple[float, float, float, float]:
    """Box around the attachment symbol of a placed label, grown by ``pad``."""
    m = fonttext.metrics(text.weight, text.font)
    x0 = text.x + char_x(text.runs, text.size, span[0], text.weight, text.font)
    x1 = text.x + char_x(text.runs, text.size, span[1], text.weight, text.font)
    return x0 - pad, text.y - m.cap_height * text.size - pad, x1 + pad, text.y + pad


def clip_to_box(start: Point, end: Point, box: tuple[float, float, float, float]) -> Point:
    """The point where the segment from ``start`` (outside) towards ``end`` (inside) enters box."""
    x0, y0, x1, y1 = box
    dx, dy = end[0] - start[0], end[1] - start[1]
    t_enter = 0.0
    t_exit = 1.0
    for p, q in ((-dx, start[0] - x0), (dx, x1 - start[0]), (-dy, start[1] - y0), (dy, y1 - start[1])):
        if abs(p) < 1e-12:
            if q < 0:
                return end
            continue
        t = q / p
        if p < 0:
            t_enter = max(t_enter, t)
        else:
            t_exit = min(t_exit, t)
    if t_enter > t_exit:
        return end
    return start[0] + dx * t_enter, start[1] + dy * t_enter


def trimmed(a: Point, b: Point, box_a=None, box_b=None) -> tuple[Point, Point]:
    """The segment a-b with each end stopped at the label box around it (where there is one)."""
    start = clip_to_box(b, a, box_a) if box_a else a
    return start, clip_to_box(start, b, box_b) if box_b else b


def bond_lines(
    a: Point,
    b: Point,
    order: int,
    box_a,
    box_b,
    bond_pt: float,
    width: float,
    inside: Point | None = None,
    depth: float = 0.0,
) -> list[Stroke]:
    """A bond's lines, each end stopped at its label box. A double bond in a ring (``inside``: the
    ring's centre) is drawn the usual way: one line on the bond, a shorter one inside the ring;
    other double and triple bonds as centred lines, ``DOUBLE_SPACING`` of ``bond_pt`` apart."""
    length = math.dist(a, b) or 1.0
    nx, ny = -(b[1] - a[1]) / length, (b[0] - a[0]) / length
    offsets = {1: (0.0,), 2: (-0.5, 0.5), 3: (-1.0, 0.0, 1.0)}[order]
    trim = [0.0] * len(offsets)
    if order == 2 and inside is not None:
        towards = 1.0 if (inside[0] - a[0]) * nx + (inside[1] - a[1]) * ny > 0 else -1.0
        offsets, trim = (0.0, towards), [0.0, 0.15]
    out = []
    for o, cut in zip(offsets, trim):
        d = o * DOUBLE_SPACING * bond_pt
        start, end = trimmed((a[0] + nx * d, a[1] + ny * d), (b[0] + nx * d, b[1] + ny * d), box_a, box_b)
        if cut:
            start, end = _lerp(start, end, cut), _lerp(start, end, 1 - cut)
        out.append(Stroke(start, end, width, "bond" if order == 1 else "double", depth))
    return out


def boxes_overlap(a, b, slack: float = 0.0) -> bool:
    return a[0] < b[2] - slack and b[0] < a[2] - slack and a[1] < b[3] - slack and b[1] < a[3] - slack


def segment_hits_box(p: Point, q: Point, box) -> bool:
    x0, y0, x1, y1 = box
    if max(p[0], q[0]) < x0 or min(p[0], q[0]) > x1 or max(p[1], q[1]) < y0 or min(p[1], q[1]) > y1:
        return False  # most pairs are far apart: the cheap test first
    inside = clip_to_box(p, q, box)
    if inside != q:
        return True
    return x0 <= q[0] <= x1 and y0 <= q[1] <= y1


def crossing(p1: Point, p2: Point, q1: Point, q2: Point) -> Point | None:
    """Where two segments cross, away from their ends; None if they do not."""
    d1 = (p2[0] - p1[0], p2[1] - p1[1])
    d2 = (q2[0] - q1[0], q2[1] - q1[1])
    den = d1[0] * d2[1] - d1[1] * d2[0]
    if abs(den) < 1e-9:
        return None
    t = ((q1[0] - p1[0]) * d2[1] - (q1[1] - p1[1]) * d2[0]) / den
    u = ((q1[0] - p1[0]) * d1[1] - (q1[1] - p1[1]) * d1[0]) / den
    if 0.02 < t < 0.98 and 0.02 < u < 0.98:
        return p1[0] + t * d1[0], p1[1] + t * d1[1]
    return None


def with_gaps(strokes: list[Stroke], gap: float) -> list[Stroke]:
    """A ring bond or a bond to a group that passes behind another is cut around the crossing (the
    usual depth cue: an axial bond in front of the far side of the ring, or behind its near side)."""
    out: list[Stroke] = []
    for s in strokes:
        if s.role not in ("ring", "bond"):
            out.append(s)
            continue
        cuts = []
        for o in strokes:
            if o is s or o.depth <= s.depth or o.role not in ("ring", "bond", "double"):
                continue
            at = crossing(s.start, s.end, o.start, o.end)
            if at is not None:
                cuts.append(at)
        if not cuts:
            out.append(s)
            continue
        length = math.dist(s.start, s.end)
        ts = sorted(math.dist(s.start, c) / length for c in cuts)
        half = gap / 2 / length
        t0 = 0.0
        for t in ts:
            if t - half > t0:
                out.append(Stroke(_lerp(s.start, s.end, t0), _lerp(s.start, s.end, t - half), s.width, s.role, s.depth))
            t0 = t + half
        if t0 < 1:
            out.append(Stroke(_lerp(s.start, s.end, t0), s.end, s.width, s.role, s.depth))
    return out


def _lerp(a: Point, b: Point, t: float) -> Point:
    return a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t


__all__ = ["Stroke", "Text", "TextRun", "Polygon", "ChairGeometry", "chair_geometry", "Style"]
