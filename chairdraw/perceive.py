"""A chair drawn in 2D -> the faces of its substituents, and from them chiral tags.

A molfile drawing of a chair carries its stereo in the picture, not in wedges: which way each ring
atom's V points, and which bonds are axial (parallel to the chair's axis) or equatorial (parallel
to the ring bonds one step away). Reading it, the way a chemist does:

* the axis: the three alternate ring atoms of one set sit above those of the other set by the
  pucker, so the difference of the two sets' centroids is the axis as drawn; it is taken to point
  up the page (a drawing may be turned in the plane, by up to about 30 degrees);
* each ring atom is a V pointing up or down along the axis; each bond leaving the ring is axial
  or equatorial by its angle to the axis and to its reference ring bonds, with a tolerance; an
  axial bond lies on the face its V points to, an equatorial one on the other face;
* the viewer looks from a little above (the usual way a chair is drawn), so the ring order read
  round the drawing is the order seen from the upper face; that fixes which face is "top" in the
  ring numbering of ``faces.py``, and ``faces.set_faces`` turns the faces into chiral tags.

Anything the picture does not settle (a bond between axial and equatorial, an atom with two axial
bonds, a V that does not alternate) is reported with the atom's number and left undetermined: no
guess. Atom numbers in messages count from 1, as in a molfile.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from rdkit import Chem

from .errors import StereoError
from .faces import BOTTOM, TOP, forget_stereo_perception, ring_slots, set_faces
from .plane import centroid, dist, dot, line_angle, opposite_bonds_parallel, signed_area, unit
from .rings import ChairRing, find_rings

AXIAL, EQUATORIAL, UNDETERMINED = "axial", "equatorial", "undetermined"
TOLERANCE = 25.0  # degrees: a bond this close to the axis or to its equatorial reference reads as such
MARGIN = 15.0  # degrees: ... and it must be this much closer to one than to the other
QUALITY = 12.0  # degrees: beyond this a reading is still made, with a drawing-quality warning
MAX_TILT = 45.0  # degrees: a chair turned further than this in the plane has no clear "up"
MIN_PUCKER = 0.12  # pucker drawn, in mean ring-bond lengths: below it the ring is drawn flat
MIN_AREA = 0.4  # signed ring area in squared bond lengths: below it (a view from less than about 5° above) the ring is seen nearly edge-on
TURNED = 30.0  # degrees: a chair turned further in the page is read with a warning


@dataclass(frozen=True)
class BondReading:
    """One bond leaving a chair ring, read from the drawing."""

    ring_atom: int  # atom indices from 0 (RDKit's); messages use number = index + 1
    atom: int
    position: str  # axial, equatorial or undetermined
    side: str | None  # 'up' or 'down' on the page (the face it is drawn on), None if undetermined
    off_axis: float  # degrees between the bond and the chair axis
    off_equatorial: float  # degrees between the bond and its equatorial reference
    confidence: float  # 0..1: how clearly the angles separate the two readings
    problem: str = ""  # for an undetermined bond: 'between' (axial or equatorial?), 'against' (axial
    # against its V), 'inward' or 'no length'

    def to_dict(self) -> dict:
        return {
            "ring_atom_number": self.ring_atom + 1,
            "atom_number": self.atom + 1,
            "position": self.position,
            "side": self.side,
            "off_axis_deg": round(self.off_axis, 1),
            "off_equatorial_deg": round(self.off_equatorial, 1),
            "confidence": round(self.confidence, 2),
            "problem": self.problem,
        }


@dataclass(frozen=True)
class RingReading:
    """One six-membered ring of the drawing: how it is drawn and what it shows."""

    atoms: tuple[int, ...]  # in the ring numbering of rings.py
    drawn_as: str  # 'chair', 'flat' or 'unclear'
    points_up: tuple[bool, ...] = ()  # per ring atom, its V points to the top face (faces.py sense)
    bonds: tuple[BondReading, ...] = ()
    tilt: float = 0.0  # degrees the chair axis is turned from the page's vertical
    reason: str = ""  # why a ring is 'unclear'

    @property
    def up_atoms(self) -> tuple[int, ...]:
        return tuple(a for a, up in zip(self.atoms, self.points_up) if up)

    def to_dict(self) -> dict:
        return {
            "atom_numbers": [a + 1 for a in self.atoms],
            "drawn_as": self.drawn_as,
            "up_atom_numbers": [a + 1 for a in self.up_atoms],
            "tilt_deg": round(self.tilt, 1) + 0.0,
            "bonds": [b.to_dict() for b in self.bonds],
            "reason": self.reason,
        }


@dataclass(frozen=True)
class Perception:
    """What the drawing shows: the molecule with chiral tags from the chair(s) and the wedges."""

    mol: Chem.Mol = field(repr=False, compare=False)
    rings: tuple[RingReading, ...]
    warnings: tuple[str, ...]  # drawing-quality findings, each naming its atom
    undetermined: tuple[int, ...]  # ring atoms whose configuration the picture does not settle
    reasons: tuple[str, ...]  # why, one line per undetermined atom
    conflicts: tuple[str, ...]  # wedges that contradict the chair

    @property
    def chairs(self) -> tuple[RingReading, ...]:
        return tuple(r for r in self.rings if r.drawn_as == "chair")


def perceive(mol: Chem.Mol) -> Perception:
    """Read the chairs of a 2D drawing. ``mol`` as parsed from the molfile (H atoms kept)."""
    if not mol.GetNumConformers():
        raise StereoError("the drawing has no coordinates: nothing to read a chair from")
    conf = mol.GetConformer()
    xy = [(conf.GetAtomPosition(i).x, conf.GetAtomPosition(i).y) for i in range(mol.GetNumAtoms())]
    rings, _ = find_rings(mol, fused=True)
    readings: list[RingReading] = []
    warnings: list[str] = []
    reasons: dict[int, str] = {}
    conflicts: list[str] = []
    out = Chem.Mol(mol)
    by_chair: set[int] = set()  # ring atoms whose tags a chair ring has set
    for ring in rings:
        reading, ring_warnings, ring_faces, ring_reasons = _read_ring(mol, ring, xy)
        readings.append(reading)
        warnings += ring_warnings
        for atom, why in ring_reasons.items():
            reasons.setdefault(atom, why)
        if reading.drawn_as == "chair" and ring_faces:
            conflicts += _conflicts(out, ring, ring_faces, by_chair)
            out = set_faces(out, ring, ring_faces)
            by_chair |= {a for a in ring.atoms if any(s in ring_faces for s in _exo(mol, ring, a))}
    for atom in reasons.keys() - by_chair:  # undetermined: neither a guess nor a stale wedge
        out.GetAtomWithIdx(atom).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    for atom in by_chair & reasons.keys():
        del reasons[atom]  # another chair ring of a fused system settled it
    forget_stereo_perception(out)
    Chem.AssignStereochemistry(out, cleanIt=False, force=True)
    return Perception(
        mol=out,
        rings=tuple(readings),
        warnings=tuple(dict.fromkeys(warnings)),
        undetermined=tuple(sorted(reasons)),
        reasons=tuple(reasons[a] for a in sorted(reasons)),
        conflicts=tuple(dict.fromkeys(conflicts)),
    )


def _exo(mol: Chem.Mol, ring: ChairRing, atom: int) -> list[int]:
    members = set(ring.atoms)
    return [n.GetIdx() for n in mol.GetAtomWithIdx(atom).GetNeighbors() if n.GetIdx() not in members]


def _read_ring(mol, ring: ChairRing, xy) -> tuple[RingReading, list[str], dict[int, str], dict[int, str]]:
    """(reading, warnings, faces by substituent atom, reasons by undetermined ring atom)."""
    pts = [xy[a] for a in ring.atoms]
    bond = sum(dist(pts[k], pts[k - 1]) for k in range(6)) / 6

    def unclear(why: str, tilt: float = 0.0, warnings: list[str] | None = None):
        return (
            RingReading(ring.atoms, "unclear", tilt=tilt, reason=why),
            warnings or [],
            {},
            dict.fromkeys(ring.atoms, why),
        )

    if bond < 1e-6:
        return unclear("the ring's atoms share one position")
    even, odd = centroid(pts[0::2]), centroid(pts[1::2])
    axis = (even[0] - odd[0], even[1] - odd[1])
    pucker = math.hypot(*axis) / bond
    if pucker < MIN_PUCKER:
        return RingReading(ring.atoms, "flat"), [], {}, {}
    outline = (axis[0] / (pucker * bond), axis[1] / (pucker * bond))
    if outline[1] < 0:
        outline = (-outline[0], -outline[1])
    area = signed_area(pts) / bond**2
    if abs(area) < MIN_AREA:
        return unclear("the ring is drawn (nearly) edge-on: which face the viewer sees cannot be told")
    if not opposite_bonds_parallel(pts):
        return unclear("opposite ring bonds are not parallel: the ring is not drawn as a chair")
    clockwise = area < 0  # y up, as in a molfile
    # the axis: the outline's own (exact for a projected chair), else the page's vertical, along
    # which chemists draw axial bonds (an outline with narrow tips can imply a tilted axis)
    first_problem = None
    for up in (outline, (0.0, 1.0)):
        tilt = math.degrees(math.atan2(up[0], up[1]))  # positive: turned clockwise
        if abs(tilt) > MAX_TILT:
            first_problem = (
                first_problem
                or f"the chair's axis is turned {abs(tilt):.0f}° from vertical: which way is up cannot be told"
            )
            continue
        v_up, expected = _vs(pts, up, even, odd)
        problem = _v_problem(v_up, expected)
        if problem is None:
            break
        first_problem = first_problem or problem
    else:
        return unclear(first_problem or "not drawn as a chair", math.degrees(math.atan2(outline[0], outline[1])))
    numbers = [a + 1 for a in ring.atoms]
    warnings = [
        f"ring atom {numbers[k]}: "
        + (
            "not drawn as a V (one neighbour above it, one below)"
            if v is None
            else "its V points the wrong way for a chair"
        )
        for k, v in enumerate(v_up)
        if v != expected[k]
    ]
    if up != outline:
        turned = math.degrees(math.atan2(outline[0], outline[1]))
        warnings.append(
            f"the ring's outline implies an axis turned {abs(turned):.0f}°; read with the page's vertical as the axis"
        )
    wrong_way = {k for k, v in enumerate(v_up) if v is not None and v != expected[k]}
    readings, notes = _read_bonds(mol, ring, pts, xy, up, expected, bond)
    refined = _refined_axis(readings, xy, up)
    if refined is not None:  # the axis the drawn axial bonds show, if it reads every bond the same way
        again, again_notes = _read_bonds(mol, ring, pts, xy, refined, expected, bond)
        if [r.position for r in again] == [r.position for r in readings]:
            readings, notes, up = again, again_notes, refined
    tilt = math.degrees(math.atan2(up[0], up[1]))
    if abs(tilt) > TURNED:
        warnings.append(f"the chair is turned {abs(tilt):.0f}° in the page: read, but a chair is usually drawn upright")
    warnings += notes
    faces: dict[int, str] = {}
    reasons: dict[int, str] = {}
    for k, a in enumerate(ring.atoms):
        here = [r for r in readings if r.ring_atom == a]
        problem = _atom_problem(numbers[k], here, k not in wrong_way)
        if problem:
            reasons[a] = problem
            continue
        for r in here:
            if r.side is not None:
                faces[r.atom] = TOP if (r.side == "up") == clockwise else BOTTOM
    points_up = tuple(e == clockwise for e in expected)
    return RingReading(ring.atoms, "chair", points_up, tuple(readings), tilt), warnings, faces, reasons


def _vs(pts, up, even, odd) -> tuple[list[bool | None], list[bool]]:
    """Per ring atom: its V as drawn (True up, False down, None not a V), and as a chair needs it."""
    heights = [dot(p, up) for p in pts]
    v_up: list[bool | None] = []
    for k in range(6):
        h, before, after = heights[k], heights[k - 1], heights[(k + 1) % 6]
        v_up.append(True if h > max(before, after) else False if h < min(before, after) else None)
    expected = [(k % 2 == 0) == (dot(even, up) > dot(odd, up)) for k in range(6)]
    return v_up, expected


def _v_problem(v_up: list[bool | None], expected: list[bool]) -> str | None:
    not_v = [k for k in range(6) if v_up[k] is None]
    if len(not_v) > 2 or (len(not_v) == 2 and (not_v[1] - not_v[0]) != 3):
        # a chair seen from well above loses the V at its two tips, which sit opposite each other;
        # anything else is a boat or twist-boat, or a careless drawing
        return f"{len(not_v)} ring atoms are not drawn as Vs: the ring is not drawn as a chair"
    wrong = sum(1 for k in range(6) if v_up[k] is not None and v_up[k] != expected[k])
    if wrong > 1:
        return f"{wrong} ring atoms point the wrong way: the ring is not drawn as a chair"
    return None


def _read_bonds(mol, ring: ChairRing, pts, xy, up, expected, bond) -> tuple[list[BondReading], list[str]]:
    readings: list[BondReading] = []
    notes: list[str] = []
    centre = centroid(pts)
    for k, a in enumerate(ring.atoms):
        if k in ring.trigonal or mol.GetAtomWithIdx(a).GetTotalDegree() < 4:
            continue  # no configuration: C=O, or a ring N with its lone pair (it inverts)
        for n in _exo(mol, ring, a):
            reading, note = _read_bond(a, n, k, pts, xy, up, expected[k], centre, bond)
            readings.append(reading)
            notes += note
    return readings, notes


def _refined_axis(readings: list[BondReading], xy, up) -> tuple[float, float] | None:
    """The mean direction of the bonds read as axial (two at least), when it differs from ``up``."""
    axial = [r for r in readings if r.position == AXIAL]
    if len(axial) < 2:
        return None
    sx = sy = 0.0
    for r in axial:
        v = unit(xy[r.atom], xy[r.ring_atom])
        sign = 1.0 if dot(v, up) > 0 else -1.0
        sx, sy = sx + sign * v[0], sy + sign * v[1]
    norm = math.hypot(sx, sy)
    if norm < 1e-9:
        return None
    refined = (sx / norm, sy / norm)
    # only axial bonds drawn parallel to each other say where the axis is; if they disagree, one
    # of them is skewed, and the outline's axis stays the judge (and names the skewed bond)
    spread = max(line_angle(unit(xy[r.atom], xy[r.ring_atom]), refined) for r in axial)
    return refined if spread <= 3.0 and line_angle(refined, up) > 1.0 else None


def _read_bond(ring_atom, atom, k, pts, xy, up, v_is_up, centre, bond) -> tuple[BondReading, list[str]]:
    p = pts[k]
    q = xy[atom]
    v = (q[0] - p[0], q[1] - p[1])
    length = math.hypot(*v)
    if length < 0.05 * bond:
        reading = BondReading(ring_atom, atom, UNDETERMINED, None, 90.0, 90.0, 0.0, "no length")
        return reading, [f"ring atom {ring_atom + 1}: its bond to atom {atom + 1} has no length"]
    v = (v[0] / length, v[1] / length)
    # the axial bond of a V pointing up goes up, and of one pointing down goes down: measured
    # against that ray, a steep equatorial bond going the other way is not mistaken for axial
    ray = up if v_is_up else (-up[0], -up[1])
    off_ray = math.degrees(math.acos(max(-1.0, min(1.0, dot(v, ray)))))
    off_axis = min(off_ray, 180.0 - off_ray)
    # the equatorial reference: the two ring bonds one step away, parallel in a chair drawing
    d1 = unit(pts[(k + 2) % 6], pts[(k + 1) % 6])
    d2 = unit(pts[(k - 2) % 6], pts[(k - 1) % 6])
    reference = (d1[0] + d2[0], d1[1] + d2[1])
    off_eq = line_angle(v, reference) if math.hypot(*reference) > 1e-6 else 90.0
    notes: list[str] = []
    what = f"ring atom {ring_atom + 1}: bond to atom {atom + 1}"
    side: str | None
    problem = ""
    if off_ray <= TOLERANCE and off_eq - off_ray >= MARGIN:
        position, own, other = AXIAL, off_ray, off_eq
        side = "up" if v_is_up else "down"
        if off_ray > QUALITY:
            notes.append(f"{what}: axial bond {off_ray:.0f}° off the chair's axis")
    elif off_eq <= TOLERANCE and off_ray - off_eq >= MARGIN:
        position, own, other = EQUATORIAL, off_eq, off_ray
        side = "down" if v_is_up else "up"
        if off_eq > QUALITY:
            notes.append(f"{what}: equatorial bond {off_eq:.0f}° off parallel to its ring bonds")
        if (p[0] - centre[0]) * v[0] + (p[1] - centre[1]) * v[1] < 0:
            notes.append(f"{what}: equatorial bond drawn into the ring")
            side, problem = None, "inward"
    elif off_ray >= 180.0 - TOLERANCE:
        position, own, other, side, problem = UNDETERMINED, off_axis, off_eq, None, "against"
        notes.append(f"{what} is drawn axial but points against the atom's V")
    else:
        position, own, other, side, problem = (
            UNDETERMINED,
            min(off_axis, off_eq),
            max(off_axis, off_eq),
            None,
            "between",
        )
        notes.append(f"{what} is {off_axis:.0f}° from the axis and {off_eq:.0f}° from the equatorial direction")
    if side is None:
        position = UNDETERMINED
    confidence = 0.0 if position == UNDETERMINED else max(0.0, min(1.0, (other - own) / 45.0))
    return BondReading(ring_atom, atom, position, side, off_axis, off_eq, confidence, problem), notes


def _atom_problem(number: int, here: list[BondReading], v_ok: bool) -> str | None:
    """Why a ring atom's configuration cannot be read, or None."""
    if not here:
        return None
    if not v_ok:
        return f"ring atom {number}: its V does not alternate, so its axial direction is unknown"
    unclear = [r for r in here if r.position == UNDETERMINED]
    # one clear bond settles a tetrahedral centre, when the other is merely drawn between the two
    # directions (a fused ring pulls a junction bond off its ideal line); never when it contradicts
    if unclear and not (len(here) == 2 and len(unclear) == 1 and unclear[0].problem == "between"):
        bad = unclear[0]
        if bad.problem == "against":
            return f"ring atom {number}: the bond to atom {bad.atom + 1} is drawn axial but against the atom's V"
        if bad.problem == "inward":
            return f"ring atom {number}: the bond to atom {bad.atom + 1} is drawn into the ring"
        return f"ring atom {number}: the bond to atom {bad.atom + 1} is neither clearly axial nor clearly equatorial"
    if len(here) == 2:
        if here[0].position == here[1].position:
            return f"ring atom {number}: two {here[0].position} bonds"
        if here[0].side == here[1].side:
            return f"ring atom {number}: both bonds drawn on one face"
    return None


def _conflicts(mol: Chem.Mol, ring: ChairRing, faces: dict[int, str], by_chair: set[int]) -> list[str]:
    """Faces the drawing already gives (a wedge, or a fused chair ring read before) that differ
    from this chair's."""
    tagged = {a for a in ring.atoms if mol.GetAtomWithIdx(a).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED}
    if not tagged:
        return []
    try:
        slots = ring_slots(mol, ring)
    except StereoError:
        return []
    out = []
    for s in slots:
        if s.ring_atom in tagged and s.atom in faces and s.face is not None and s.face != faces[s.atom]:
            source = "another chair ring" if s.ring_atom in by_chair else "a wedge"
            out.append(
                f"ring atom {s.ring_atom + 1}: {source} puts atom {s.atom + 1} on the other face from this chair"
            )
    return out
