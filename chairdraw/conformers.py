"""The two chairs of one ring for one face assignment: positions, energies, populations.

Built once per ring and reused for each relative configuration of it: slots come in the same
order for every configuration (only faces change), so positions are made once per
(slot, face, orientation), and the ring's energy model makes each term once.
"""

from __future__ import annotations

from .chairs import AXIAL, EQUATORIAL, axial_and_top, chair_name, inverting_choices, points_up
from .energy import equilibrium
from .energy.terms import NO_POSITION_VALUE, ChairModel, Key
from .faces import BOTTOM, TOP, Slot
from .results import Chair, Configuration, Position, RingResult
from .rings import ChairRing

TWIST_WARNING_KCAL = 4.5  # about A(tBu): axial t-Bu-cyclohexane and its twist-boat are close (Wiberg 1999)


def position_key(slot: Slot) -> Key:
    """The key of a position in the energy model: the same in both chairs and every configuration."""
    return (slot.ring_atom, slot.atom, slot.element)


class ChairPair:
    """Both chairs of one ring for a face assignment, with the ring's energy model.

    Slots come in the same order for every configuration of a ring (only faces change), so
    positions are made once per (slot, face, orientation) and reused."""

    def __init__(self, ring: ChairRing, model: ChairModel, temperature: float, slots: tuple[Slot, ...]):
        self.ring = ring
        self.model = model
        self.temperature = temperature
        number = {e.key: n for n, e in enumerate(model.entries)}
        self.entry_at = [number.get(position_key(s)) for s in slots]
        self.labels = {e.key: (e.group.label, bool(e.group.estimated_as)) for e in model.entries}
        self.ring_warnings = model.ring_warnings()
        self.names = (chair_name(ring, 0), chair_name(ring, 1))
        self.up_atoms = tuple(tuple(a for k, a in enumerate(ring.atoms) if points_up(chair, k)) for chair in (0, 1))
        # one dict per way of putting the inverting ring atoms' positions axial: ring index -> slot number
        self.choices = [{i: slots.index(s) for i, s in choice.items()} for choice in inverting_choices(slots)]
        self._positions: dict[tuple[int, bool, bool], Position] = {}

    def build(self, slots, stereo, config: Configuration | None = None, notes: tuple[str, ...] = ()) -> RingResult:
        ring = self.ring
        built = self._both(slots)
        warnings: list[str] = []
        for b in built:
            warnings.extend(w for w in b[3] if w not in warnings)
        energies = [b[0] for b in built]
        pops = equilibrium.populations(energies, self.temperature)
        low = min(energies)
        degenerate = abs(energies[0] - energies[1]) < equilibrium.DEGENERATE_KCAL
        chairs = [
            Chair(
                name=self.names[chair],
                up_atoms=self.up_atoms[chair],
                energy_kcal_mol=energy - low,
                population=pops[chair],
                favored=(not degenerate) and energy == low,
                terms=tuple(terms),
                positions=tuple(positions),
            )
            for chair, (energy, positions, terms, _) in enumerate(built)
        ]
        warnings = self.ring_warnings + _merge_position_warnings(warnings)
        if low >= TWIST_WARNING_KCAL:
            warnings.append(
                f"both chairs carry at least {low:.1f} kcal/mol of strain: a twist-boat probably competes "
                "(axial t-Bu-cyclohexane and its twist-boat are about equal, Wiberg 1999); the chair model does not cover it"
            )
        if ring.trigonal:
            warnings.append(
                "trigonal ring atom at "
                + ", ".join(ring.locants[k] for k in ring.trigonal)
                + ": cyclohexane A-values are used beside it (alkyl-ketone effects are not modelled)"
            )
        return RingResult(
            atoms=ring.atoms,
            locants=ring.locants,
            kind=ring.kind,
            chairs=(chairs[0], chairs[1]),
            delta_g_kcal_mol=abs(energies[0] - energies[1]),
            degenerate=degenerate,
            stereo=stereo,
            configuration=config,
            trigonal_atoms=tuple(ring.atoms[k] for k in ring.trigonal),
            warnings=tuple(warnings),
            notes=notes,
        )

    def _both(self, slots) -> list[tuple[float, list[Position], list, list[str]]]:
        """Each chair's (energy, positions, terms, warnings); with inverting ring nitrogens, the
        better of the ways of putting one position of each such nitrogen axial."""
        built = []
        for chair in (0, 1):
            best = None
            for choice in self.choices:
                axial = [False] * len(self.model.entries)
                positions = []
                for j, s in enumerate(slots):
                    ax, top = axial_and_top(chair, s, choice.get(s.ring_index) == j)
                    n = self.entry_at[j]
                    if n is not None:
                        axial[n] = ax
                    positions.append(self._positions.get((j, top, ax)) or self._position(j, s, top, ax))
                energy, terms, warn = self.model.evaluate(axial)
                if best is None or energy < best[0] - 1e-9:
                    best = (energy, positions, terms, warn)
            assert best is not None
            built.append(best)
        return built

    def _position(self, j: int, s: Slot, top: bool, axial: bool) -> Position:
        label, estimated = self.labels.get(position_key(s), (s.element, False))
        if s.element == "LP":
            label = "lone pair"
        elif s.element == "H":
            label, estimated = "H", False
        found = Position(
            ring_atom=s.ring_atom,
            locant=self.ring.locants[s.ring_index],
            atom=s.atom,
            label=label,
            face=TOP if top else BOTTOM,
            orientation=AXIAL if axial else EQUATORIAL,
            inverting=s.inverting,
            estimated=estimated,
        )
        self._positions[(j, top, axial)] = found
        return found


def _merge_position_warnings(warnings: list[str]) -> list[str]:
    """One line for all groups that got the cyclohexane value in a heterocycle."""
    where = [w[len(NO_POSITION_VALUE) :] for w in warnings if w.startswith(NO_POSITION_VALUE)]
    rest = [w for w in warnings if not w.startswith(NO_POSITION_VALUE)]
    if where:
        rest.insert(
            0,
            "ring-position A-values are tabulated only for methyl in oxanes, 1,3-dioxanes and piperidines; "
            "cyclohexane values are used for " + ", ".join(where),
        )
    return rest
