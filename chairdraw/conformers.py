"""The two chairs of one ring for one face assignment: positions, energies, populations.

Built once per ring and reused for each relative configuration of it: slots come in the same
order for every configuration (only faces change), so positions are made once per
(slot, face, orientation), and the ring's energy model makes each term once.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import cast

from .chairs import AXIAL, EQUATORIAL, chair_name, inverting_choices, points_up, position_rule
from .energy import equilibrium
from .energy.terms import NO_POSITION_VALUE, ChairModel, Key, Term
from .faces import BOTTOM, TOP, Slot, Tops
from .results import Centre, Chair, Configuration, Position, RingResult
from .rings import ChairRing

# a single interaction this large in both chairs (an axial t-Bu-size group, a syn-diaxial pair of
# two groups larger than H/Me) makes a twist-boat compete: axial t-Bu-cyclohexane and its twist-boat
# are close (Wiberg 1999); cis-1,4-di-t-Bu-cyclohexane is mostly twist-boat (Gill 2005); anti-1,3-diol
# acetonides (2,4-diaxial Me/Me in one chair, 4.7 kcal/mol, Pihlaja 2020) are twist-boats, their syn
# isomers (only the 2-Me axial, 3.98) chairs (common practice in acetonide analysis)
TWIST_WARNING_KCAL = 4.5


def position_key(slot: Slot) -> Key:
    """The key of a position in the energy model: the same in both chairs and every configuration."""
    return (slot.ring_atom, slot.atom, slot.element)


class ChairPair:
    """Both chairs of one ring, for any face assignment of its slots, with the ring's energy model.

    A face assignment is given as ``tops``: per slot (in the order of the ring's slots), True for
    the top face, False for the bottom, None for an inverting position (``tops_of``). Slots come
    in the same order for every configuration of a ring (only faces change), so a position is
    made once per (chair, slot, face) and reused."""

    def __init__(self, ring: ChairRing, model: ChairModel, temperature: float, slots: tuple[Slot, ...]):
        self.ring = ring
        self.model = model
        self.temperature = temperature
        self.slots = slots
        number = {e.key: n for n, e in enumerate(model.entries)}
        at = {number[k]: j for j, s in enumerate(slots) if (k := position_key(s)) in number}
        self.entry_slot = [at[n] for n in range(len(model.entries))]
        self.labels = {e.key: (e.group.label, bool(e.group.estimated_as)) for e in model.entries}
        self.ring_warnings = model.ring_warnings()
        self.trigonal_warnings = _trigonal_warnings(ring, {e.index for e in model.entries if e.group.pair_class != "H"})
        self.names = (chair_name(ring, 0), chair_name(ring, 1))
        self.up_atoms = tuple(tuple(a for k, a in enumerate(ring.atoms) if points_up(chair, k)) for chair in (0, 1))
        self.trigonal_atoms = tuple(ring.atoms[k] for k in ring.trigonal)
        # the axial/face rule (chairs.position_rule, which chairs.place uses too), read once per ring for every slot, chair and
        # face: whether the slot is axial with its group on the [bottom, top] face, and for an
        # inverting slot the face it takes when [not chosen, chosen] axial
        self.axial_at = [
            [tuple(position_rule(chair, s.ring_index, face)[0] for face in (BOTTOM, TOP)) for s in slots]
            for chair in (0, 1)
        ]
        self.top_when = [
            [tuple(position_rule(chair, s.ring_index, None, chosen)[1] for chosen in (False, True)) for s in slots]
            for chair in (0, 1)
        ]
        # the ways of putting one position of each inverting ring atom axial, as slot numbers
        self.choices = [frozenset(slots.index(s) for s in choice.values()) for choice in inverting_choices(slots)]
        self.inverting = [j for j, s in enumerate(slots) if s.face is None]
        # positions made so far, per chair and slot: [bottom face, top face]
        self._made: list[list[list[Position | None]]] = [[[None, None] for _ in slots] for _ in (0, 1)]

    def build(
        self, tops: Tops, stereo: tuple[Centre, ...], config: Configuration | None = None, notes: tuple[str, ...] = ()
    ) -> RingResult:
        """Both chairs, their energies and populations for the faces ``tops``."""
        ring = self.ring
        built = (self._chair(0, tops), self._chair(1, tops))
        energies = [built[0][0], built[1][0]]
        pops = equilibrium.populations(energies, self.temperature)
        low = min(energies)
        # compared as reported (rounded), so that 0.0499999 is not called degenerate beside a printed 0.05
        degenerate = round(abs(energies[0] - energies[1]), 6) < equilibrium.DEGENERATE_KCAL
        chairs = [
            Chair(
                name=self.names[chair],
                up_atoms=self.up_atoms[chair],
                energy_kcal_mol=energy - low,
                population=pops[chair],
                favored=(not degenerate) and energy == low,
                terms=tuple(terms),
                positions=positions,
            )
            for chair, (energy, positions, terms, _, _) in enumerate(built)
        ]
        warnings = list(self.ring_warnings)
        if built[0][3] or built[1][3]:
            warnings += _merge_position_warnings(list(dict.fromkeys(built[0][3] + built[1][3])))
        unavoidable = min(built[0][4], built[1][4])
        if unavoidable >= TWIST_WARNING_KCAL:
            warnings.append(
                f"both chairs carry a single interaction of at least {unavoidable:.1f} kcal/mol (an axial "
                "t-Bu-size group or a large syn-1,3-diaxial pair): a twist-boat probably competes (axial "
                "t-Bu-cyclohexane and its twist-boat are about equal, Wiberg 1999); the chair model does not cover it"
            )
        warnings += self.trigonal_warnings
        return RingResult(
            atoms=ring.atoms,
            locants=ring.locants,
            kind=ring.kind,
            chairs=(chairs[0], chairs[1]),
            delta_g_kcal_mol=abs(energies[0] - energies[1]),
            degenerate=degenerate,
            stereo=stereo,
            configuration=config,
            trigonal_atoms=self.trigonal_atoms,
            warnings=tuple(warnings),
            notes=notes,
        )

    def _chair(self, chair: int, tops: Tops) -> tuple[float, tuple[Position, ...], list[Term], list[str], float]:
        """(energy, positions, terms, warnings) of one chair; with inverting ring nitrogens, the
        best of the ways of putting one position of each such nitrogen axial."""
        axial_at, top_when = self.axial_at[chair], self.top_when[chair]
        best: tuple[float, Sequence[bool], list[Term], list[str], float] | None = None
        for chosen in self.choices:
            faces = cast("Sequence[bool]", tops)  # None only at inverting positions, set here
            if self.inverting:  # an inverting position's face follows from whether it is axial
                faces = [top_when[j][j in chosen] if t is None else t for j, t in enumerate(tops)]
            energy, terms, warnings, largest = self.model.evaluate([axial_at[j][faces[j]] for j in self.entry_slot])
            if best is None or energy < best[0] - 1e-9:
                best = (energy, faces, terms, warnings, largest)
        assert best is not None
        energy, faces, terms, warnings, largest = best
        made = self._made[chair]
        positions = tuple([row[top] or self._position(chair, j, top) for j, (row, top) in enumerate(zip(made, faces))])
        return energy, positions, terms, warnings, largest

    def _position(self, chair: int, j: int, top: bool) -> Position:
        s = self.slots[j]
        label, estimated = self.labels.get(position_key(s), (s.element, False))
        if s.element == "LP":
            label = "lone pair"
        elif s.element == "H":
            label, estimated = "H", False
        made = Position(
            ring_atom=s.ring_atom,
            locant=self.ring.locants[s.ring_index],
            atom=s.atom,
            label=label,
            face=TOP if top else BOTTOM,
            orientation=AXIAL if self.axial_at[chair][j][top] else EQUATORIAL,
            inverting=s.inverting,
            estimated=estimated,
        )
        self._made[chair][j][top] = made
        return made


def _trigonal_warnings(ring: ChairRing, substituted: set[int]) -> list[str]:
    """What the model leaves out next to flat ring atoms: a C=X carbon, or a ring N/O/S that is
    planar (amide, carbamate, N-aryl) with a group on a neighbouring ring atom (``substituted``:
    ring indices that carry one)."""
    out = []
    carbons = [ring.locants[k] for k in ring.trigonal if ring.elements[k] == "C"]
    planar = [
        ring.locants[k] for k in ring.trigonal if ring.elements[k] != "C" and {(k - 1) % 6, (k + 1) % 6} & substituted
    ]
    if carbons:
        out.append(
            f"trigonal ring atom at {', '.join(carbons)}: cyclohexane A-values are used beside it "
            "(the effects of the trigonal atom, e.g. alkyl-ketone effects, are not modelled)"
        )
    if planar:
        out.append(
            f"planar ring heteroatom at {', '.join(planar)} (amide, carbamate or N-aryl): a group on a "
            "neighbouring carbon often prefers axial there (A(1,3) strain, Johnson 1968), which the model "
            "does not include"
        )
    return out


def _merge_position_warnings(warnings: list[str]) -> list[str]:
    """One line for all groups that got the cyclohexane value in a heterocycle."""
    where = [w[len(NO_POSITION_VALUE) :] for w in warnings if w.startswith(NO_POSITION_VALUE)]
    rest = [w for w in warnings if not w.startswith(NO_POSITION_VALUE)]
    if where:
        rest.insert(
            0,
            "ring-position A-values are tabulated only for methyl in oxanes, 1,3-dioxanes and piperidines, "
            "5-alkyl groups in 1,3-dioxanes, and "
            "for OH and CH2OH in pyranoses in water; "
            "cyclohexane values are used for " + ", ".join(where),
        )
    return rest
