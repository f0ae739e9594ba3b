"""The two chairs of a ring: which atoms point up, and axial or equatorial for every position.

Chair 0 has ring indices 0, 2, 4 pointing up (towards the top face) and 1, 3, 5 down; chair 1 is
the reverse. A position is axial when its face is the direction its atom points, so a ring flip
swaps axial and equatorial everywhere and keeps every face: cis/trans cannot change.

Chairs are named with the IUPAC descriptor: the reference plane leaves out the lowest-numbered
ring carbon and the atom opposite it, the one above the plane is written first (4C1, 1C4).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from functools import cache

from .faces import BOTTOM, TOP, Slot
from .rings import ChairRing

AXIAL, EQUATORIAL = "axial", "equatorial"


@dataclass(frozen=True)
class Placement:
    """A slot in one chair: its orientation and (for inverting nitrogens, chosen) face."""

    slot: Slot
    orientation: str
    face: str


def points_up(chair: int, ring_index: int) -> bool:
    return (ring_index % 2 == 0) == (chair == 0)


def axial_and_top(chair: int, slot: Slot, chosen_axial: bool = False) -> tuple[bool, bool]:
    """(axial, on the top face) of a position in ``chair``. A fixed face is axial where its atom
    points that way; an inverting position's face follows from whether it was chosen axial."""
    return position_rule(chair, slot.ring_index, slot.face, chosen_axial)


def position_rule(chair: int, ring_index: int, face: str | None, chosen_axial: bool = False) -> tuple[bool, bool]:
    """``axial_and_top`` for a ring index and a face (None: inverting) instead of a slot."""
    up = points_up(chair, ring_index)
    if face is not None:
        top = face == TOP
        return top == up, top
    return chosen_axial, chosen_axial == up


def orientation(chair: int, slot: Slot) -> str:
    if slot.face is None:
        raise ValueError("an inverting position has no fixed orientation; use place()")
    return AXIAL if axial_and_top(chair, slot)[0] else EQUATORIAL


def place(chair: int, slots: tuple[Slot, ...], axial_choice: Mapping[int, Slot] | None = None) -> tuple[Placement, ...]:
    """Placements of every slot in ``chair``. For inverting ring atoms, ``axial_choice`` names
    the slot that is axial (by ring index); by default the lone pair (or H) is axial."""
    out = []
    for slot in slots:
        chosen = False
        if slot.face is None:
            pick = (axial_choice or {}).get(slot.ring_index) or _default_axial(slots, slot.ring_index)
            chosen = pick == slot
        axial, top = axial_and_top(chair, slot, chosen)
        out.append(Placement(slot, AXIAL if axial else EQUATORIAL, TOP if top else BOTTOM))
    return tuple(out)


def _default_axial(slots: tuple[Slot, ...], ring_index: int) -> Slot:
    here = [s for s in slots if s.ring_index == ring_index]
    for element in ("LP", "H"):
        for s in here:
            if s.element == element:
                return s
    return here[-1]


def inverting_choices(slots: tuple[Slot, ...]) -> list[dict[int, Slot]]:
    """Every way of putting one slot of each inverting ring atom axial."""
    by_atom: dict[int, list[Slot]] = {}
    for s in slots:
        if s.inverting:
            by_atom.setdefault(s.ring_index, []).append(s)
    choices: list[dict[int, Slot]] = [{}]
    for i, here in sorted(by_atom.items()):
        choices = [{**c, i: s} for c in choices for s in here]
    return choices


def chair_name(ring: ChairRing, chair: int) -> str:
    """IUPAC-style descriptor, e.g. '4C1' (superscript first, subscript last), ASCII."""
    return _chair_name(ring.elements, ring.locants, chair)


@cache  # few distinct (elements, locants) pairs exist: ring kinds times two numbering styles
def _chair_name(elements: tuple[str, ...], locants: tuple[str, ...], chair: int) -> str:
    # the reference plane leaves out the lowest-numbered carbon (a ring of S or N only: the
    # lowest-numbered atom) and the atom opposite it
    carbons = [k for k, e in enumerate(elements) if e == "C"] or list(range(6))
    low = min(carbons, key=lambda k: _locant_number(locants[k]))
    high = (low + 3) % 6
    up, down = (low, high) if points_up(chair, low) else (high, low)
    return f"{_locant_number(locants[up])}C{_locant_number(locants[down])}"


def _locant_number(locant: str) -> int:
    return int("".join(ch for ch in locant if ch.isdigit()))
