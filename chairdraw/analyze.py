"""Structure -> Analysis: rings, faces, both chairs, energies and the equilibrium.

The pipeline stage that ties the others together. Unspecified ring stereo is never guessed: a
ring whose only stereocentre is open is analysed once (the two enantiomers have mirror-image
chairs of equal energy); a ring with several open centres is analysed once per relative
configuration, each labelled (r/c/t and SMILES).
"""

from __future__ import annotations

from rdkit import Chem

from .chairs import AXIAL, EQUATORIAL, chair_name, inverting_choices, points_up
from .configurations import enumerate_faces, faces_of
from .energy import equilibrium, forcefield, tables
from .energy.terms import NO_POSITION_VALUE, ChairModel, Key
from .errors import EnergyError, StereoError, UsageError
from .faces import BOTTOM, CCW, TOP, Slot, ring_slots
from .molgraph import MolGraph
from .read import Structure, read
from .results import Analysis, Centre, Chair, Configuration, Position, RingResult
from .rings import ChairRing, find_rings
from .substituents import Group, hydrogen_isotope_fragment, recognise, substituent_groups

SOLVENTS = ("aprotic", "protic")
# MMFF94 comparison: 'auto' runs it where the tables fall short (a group estimated by class);
# the library default is 'never' (bulk speed), the command line's is 'auto'
FORCEFIELD_MODES = ("auto", "always", "never")
FORCEFIELD_DISAGREES_KCAL = 0.5
MAX_OPEN_CENTRES = 8
TWIST_WARNING_KCAL = 4.5  # about A(tBu): axial t-Bu-cyclohexane and its twist-boat are close (Wiberg 1999)
_N_H = Group("H", "*[H]", "H", tuple(r for r in tables.avalues() if r.label == "H"))
_STATUS = {
    Chem.StereoSpecified.Specified: "specified",
    Chem.StereoSpecified.Unspecified: "unspecified",
    Chem.StereoSpecified.Unknown: "unknown",
}


class Analyzer:
    """Analyses structures at one temperature and solvent."""

    def __init__(self, temperature: float = 298.15, solvent: str = "aprotic", forcefield: str = "never"):
        if forcefield not in FORCEFIELD_MODES:
            raise UsageError(f"forcefield must be one of {', '.join(FORCEFIELD_MODES)}, not {forcefield!r}")
        self.forcefield = forcefield
        if solvent not in SOLVENTS:
            raise UsageError(f"solvent must be one of {', '.join(SOLVENTS)}, not {solvent!r}")
        if not temperature > 0:
            raise UsageError(f"temperature must be above 0 K, not {temperature}")
        self.temperature = float(temperature)
        self.solvent = solvent

    def analyze(self, structure: Structure) -> Analysis:
        mol = structure.mol
        graph = MolGraph(mol)
        rings, refused = find_rings(mol, graph)
        status = _stereo_status(mol) if rings else {}
        results: list[RingResult] = []
        for ring in rings:
            try:
                results.extend(self._ring(mol, graph, ring, status))
            except StereoError as exc:
                raise exc.with_record(structure.label) from None
        notes = list(structure.notes)
        if not rings:
            notes.append("no ring that can take a chair")
        return Analysis(
            record=structure.record,
            source=structure.source,
            format=structure.format,
            mol=mol,
            temperature_K=self.temperature,
            solvent=self.solvent,
            stereo_meaning=structure.stereo_meaning,
            rings=tuple(results),
            refused=tuple(refused),
            notes=tuple(notes),
        )

    # --- one ring ---------------------------------------------------------------------------

    def _ring(self, mol: Chem.Mol, graph: MolGraph, ring: ChairRing, status: dict[int, str]) -> list[RingResult]:
        base_slots = ring_slots(mol, ring)
        groups = _groups(mol, graph, base_slots)
        model = ChairModel(ring, groups, self.solvent, {_key(s): s.ring_index for s in base_slots if _key(s) in groups})
        return [
            self._with_forcefield(m, ring, r)
            for m, r in self._configurations(mol, ring, status, base_slots, groups, model)
        ]

    def _with_forcefield(self, mol: Chem.Mol | Configuration, ring: ChairRing, result: RingResult) -> RingResult:
        estimated = any(p.estimated for p in result.chairs[0].positions)
        if self.forcefield == "never" or (self.forcefield == "auto" and not estimated):
            return result
        if isinstance(mol, Configuration):
            mol = mol.molecule
        try:
            energies = forcefield.chair_energies(mol, ring)
        except EnergyError as exc:
            return _with(result, warnings=result.warnings + (f"MMFF94 comparison failed: {exc.message}",))
        warnings = result.warnings
        table_low = 0 if result.chairs[0].energy_kcal_mol <= result.chairs[1].energy_kcal_mol else 1
        ff_low = 0 if energies[0] <= energies[1] else 1
        if ff_low != table_low and abs(energies[0] - energies[1]) > FORCEFIELD_DISAGREES_KCAL:
            warnings += (
                f"MMFF94 favours the other chair ({result.chairs[ff_low].name}) by "
                f"{abs(energies[0] - energies[1]):.2f} kcal/mol (force-field energy, not a free energy)",
            )
        return _with(result, forcefield_kcal_mol=energies, warnings=warnings)

    def _configurations(
        self, mol, ring, status, base_slots, groups, model
    ) -> list[tuple[Chem.Mol | Configuration, RingResult]]:
        """(molecule or configuration whose stereo was analysed, result) for each configuration."""
        centres = [a for a in ring.atoms if a in status]
        open_ = [a for a in centres if status[a] != "specified"]
        loc = dict(zip(ring.atoms, ring.locants))
        chairs = _ChairBuilder(ring, model, self.temperature, base_slots)
        if not open_:
            stereo = tuple(Centre(a, loc[a], "specified") for a in centres)
            return [(mol, chairs.build(base_slots, stereo))]
        if len(open_) > MAX_OPEN_CENTRES:
            raise StereoError(f"{len(open_)} unspecified centres in one ring: too many to enumerate")
        if len(centres) == 1:
            fixed = _with_tags(mol, {open_[0]: CCW})
            stereo = (Centre(open_[0], loc[open_[0]], f"{status[open_[0]]}, one enantiomer analysed"),)
            note = (
                f"the only stereocentre of this ring ({loc[open_[0]]}) is {status[open_[0]]}: both enantiomers "
                "have mirror-image chairs of equal energy, so one is analysed"
            )
            return [(fixed, chairs.build(ring_slots(fixed, ring), stereo, notes=(note,)))]
        others = any(v == "specified" for a, v in status.items() if a not in ring.atoms)
        stereo = tuple(
            Centre(a, loc[a], "specified" if status[a] == "specified" else f"{status[a]}, assumed") for a in centres
        )
        sizes = {k: _size(g) for k, g in groups.items()}
        out: list[tuple[Chem.Mol | Configuration, RingResult]] = []
        for slots in enumerate_faces(mol, ring, base_slots, open_, mirror_ok=not others):
            label = relative_label(ring, slots, sizes, centres)
            config = Configuration.of(label, mol, ring, faces_of(slots))
            note = (
                f"{len(open_)} ring stereocentres are {_words(status, open_)}: each relative configuration "
                f"is analysed separately; this is {label}"
            )
            out.append((config, chairs.build(slots, stereo, config, notes=(note,))))
        return out


class _ChairBuilder:
    """Both chairs of one ring for a face assignment, with the ring's energy model.

    Slots come in the same order for every configuration of a ring (only faces change), so
    positions are made once per (slot, face, orientation) and reused."""

    def __init__(self, ring: ChairRing, model: ChairModel, temperature: float, slots: tuple[Slot, ...]):
        self.ring = ring
        self.model = model
        self.temperature = temperature
        number = {e.key: n for n, e in enumerate(model.entries)}
        self.entry_at = [number.get(_key(s)) for s in slots]
        self.labels = {e.key: (e.group.label, bool(e.group.estimated_as)) for e in model.entries}
        self.ring_warnings = model.ring_warnings()
        self.names = (chair_name(ring, 0), chair_name(ring, 1))
        self.up = tuple(tuple(points_up(chair, k) for k in range(6)) for chair in (0, 1))
        self.up_atoms = tuple(tuple(a for k, a in enumerate(ring.atoms) if self.up[chair][k]) for chair in (0, 1))
        # one dict per way of putting the inverting ring atoms' positions axial: ring index -> slot number
        self.choices = [
            {i: slots.index(s) for i, s in choice.items()} for choice in inverting_choices(slots)
        ]
        self._positions: dict[tuple[int, bool, bool], Position] = {}

    def build(self, slots, stereo, config: Configuration | None = None, notes: tuple[str, ...] = ()) -> RingResult:
        ring, model = self.ring, self.model
        built = []
        warnings: list[str] = []
        for chair in (0, 1):
            up = self.up[chair]
            best = None
            for choice in self.choices:
                axial = [False] * len(model.entries)
                positions = []
                for j, s in enumerate(slots):
                    if s.face is not None:
                        top = s.face == TOP
                        ax = top == up[s.ring_index]
                    else:
                        ax = choice[s.ring_index] == j
                        top = ax == up[s.ring_index]
                    n = self.entry_at[j]
                    if n is not None:
                        axial[n] = ax
                    positions.append(self._positions.get((j, top, ax)) or self._position(j, s, top, ax))
                energy, terms, warn = model.evaluate(axial)
                if best is None or energy < best[0] - 1e-9:
                    best = (energy, positions, terms, warn)
            assert best is not None
            built.append(best)
            warnings.extend(w for w in best[3] if w not in warnings)
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

    def _position(self, j: int, s: Slot, top: bool, axial: bool) -> Position:
        label, estimated = self.labels.get(_key(s), (s.element, False))
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


def analyze(
    structure,
    temperature: float = 298.15,
    solvent: str = "aprotic",
    format: str | None = None,
    forcefield: str = "never",
) -> Analysis:
    """Analyse a structure (text, path, RDKit molecule or Structure) at T and in a solvent class.

    ``forcefield``: 'auto' adds an MMFF94 comparison of the two chairs where a group had to be
    estimated by class, 'always' for every ring, 'never' (the default: it costs 20-1000 ms a ring)."""
    return Analyzer(temperature, solvent, forcefield).analyze(read(structure, format=format))


# --- helpers ---------------------------------------------------------------------------------


def _stereo_status(mol: Chem.Mol) -> dict[int, str]:
    info = Chem.FindPotentialStereo(mol, cleanIt=False, flagPossible=True)
    return {
        s.centeredOn: _STATUS.get(s.specified, "unspecified")
        for s in info
        if s.type == Chem.StereoType.Atom_Tetrahedral
    }


def _with_tags(mol: Chem.Mol, tags: dict[int, Chem.ChiralType]) -> Chem.Mol:
    out = Chem.Mol(mol)
    for idx, tag in tags.items():
        out.GetAtomWithIdx(idx).SetChiralTag(tag)
    return out


def _with(result: RingResult, **changes) -> RingResult:
    return RingResult(**{**result.__dict__, **changes})


def _words(status: dict[int, str], atoms: list[int]) -> str:
    kinds = sorted({status[a] for a in atoms})
    return " or ".join(kinds)


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


def relative_label(ring: ChairRing, slots: tuple[Slot, ...], sizes: dict[Key, int], centres: list[int]) -> str:
    """r/c/t descriptor of the ring's stereocentres, e.g. 'r-1,c-4 (cis)'; ``sizes`` ranks the
    groups of one ring atom (the largest is the reference group there)."""
    principal: list[tuple[int, Slot]] = []
    for atom in centres:
        i = ring.atoms.index(atom)
        here = [s for s in slots if s.ring_index == i and s.is_group and s.face is not None]
        if not here:
            continue
        here.sort(key=lambda s: (-sizes.get(_key(s), 0), s.atom or 0))
        principal.append((i, here[0]))
    if not principal:
        return "unlabelled"
    principal.sort()
    ref_face = principal[0][1].face
    parts = [f"r-{ring.locants[principal[0][0]]}"]
    for i, s in principal[1:]:
        parts.append(f"{'c' if s.face == ref_face else 't'}-{ring.locants[i]}")
    label = ",".join(parts)
    if len(principal) == 2:
        label += " (cis)" if parts[1].startswith("c") else " (trans)"
    return label


def _size(group: Group) -> int:
    return group.size


def _key(slot: Slot) -> Key:
    return (slot.ring_atom, slot.atom, slot.element)


def _groups(mol: Chem.Mol, graph: MolGraph, slots: tuple[Slot, ...]) -> dict[Key, Group]:
    """The Group of every position that carries one (substituents, D/T, the H of a ring N-H)."""
    bonds = [(s.ring_atom, s.atom) for s in slots if s.atom is not None and s.is_group and s.element not in ("D", "T")]
    found = substituent_groups(mol, graph, bonds)  # type: ignore[arg-type]
    out: dict[Key, Group] = {}
    for s in slots:
        if s.element in ("D", "T"):
            out[_key(s)] = recognise(hydrogen_isotope_fragment(s.element))
        elif s.is_group and s.atom is not None:
            out[_key(s)] = found[(s.ring_atom, s.atom)]
        elif s.element == "H" and s.inverting:
            out[_key(s)] = _N_H
    return out


__all__ = ["Analyzer", "analyze", "relative_label", "AXIAL", "TOP"]
