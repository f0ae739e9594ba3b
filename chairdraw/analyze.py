"""Structure -> Analysis: rings, faces, both chairs, energies and the equilibrium.

The pipeline stage that ties the others together. Unspecified ring stereo is never guessed: a
ring whose only stereocentre is open is analysed once (the two enantiomers have mirror-image
chairs of equal energy); a ring with several open centres is analysed once per relative
configuration, each labelled (r/c/t and SMILES).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from rdkit import Chem

from . import _rdkit
from .chairs import AXIAL
from .configurations import enumerate_faces, faces_of, stereo_units
from .conformers import ChairPair, position_key
from .energy import equilibrium, forcefield, tables
from .energy.terms import ChairModel, Key
from .errors import EnergyError, StereoError, UsageError
from .faces import CCW, TOP, Slot, forget_stereo_perception, ring_slots, tops_of
from .molgraph import MolGraph
from .read import Structure, read
from .results import Analysis, Centre, Configuration, RingResult
from .rings import ChairRing, find_rings
from .substituents import Group, hydrogen_isotope_fragment, recognise, substituent_groups

SOLVENTS = ("aprotic", "protic")
# MMFF94 comparison: 'auto' runs it where the tables fall short (a group estimated by class);
# the library default is 'never' (bulk speed), the command line's is 'auto'
FORCEFIELD_MODES = ("auto", "always", "never")
FORCEFIELD_DISAGREES_KCAL = 0.5
AUTO_FORCEFIELD_MAX_HEAVY = 40  # the automatic check embeds the molecule 16 times: keep it quick
MAX_OPEN_CENTRES = 8
ROOM_TEMPERATURE = 298.15
FAR_FROM_ROOM_K = 30.0  # beyond this the unchanged room-temperature free energies get a note
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
        try:
            kelvin = float(temperature)
        except (TypeError, ValueError, OverflowError):
            kelvin = math.nan
        # R*T must stay a positive float for the Boltzmann weights (1e-322 K rounds it to 0)
        if not (math.isfinite(kelvin) and kelvin > 0 and equilibrium.R_KCAL * kelvin > 0):
            raise UsageError(f"temperature must be a finite number of kelvin above 0, not {str(temperature)[:24]}")
        self.temperature = kelvin
        self.solvent = solvent

    def analyze(self, structure: Structure) -> Analysis:
        mol = structure.mol
        graph = MolGraph(mol)
        rings, refused = find_rings(mol, graph)
        status = _stereo_status(mol) if rings else {}
        stereo_groups = [(g.kind, g.atoms) for g in structure.stereo_groups]
        results: list[RingResult] = []
        for ring in rings:
            try:
                results.extend(self._ring(mol, graph, ring, status, stereo_groups))
            except StereoError as exc:
                # a structure given as text has no name of its own: the caller names it
                raise exc.with_record(
                    structure.record or (None if structure.source == "argument" else structure.source)
                ) from None
        notes = list(structure.notes)
        if not rings:
            notes.append("no ring that can take a chair")
        elif abs(self.temperature - ROOM_TEMPERATURE) > FAR_FROM_ROOM_K:
            notes.append(
                f"the A-values and pair terms are free energies measured near room temperature; at "
                f"{self.temperature:g} K they are used unchanged (their entropy parts are not modelled)"
            )
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

    def _ring(
        self, mol: Chem.Mol, graph: MolGraph, ring: ChairRing, status: dict[int, str], stereo_groups
    ) -> list[RingResult]:
        base_slots = ring_slots(mol, ring)
        groups = _groups(mol, graph, base_slots, ring.ammonium)
        model = ChairModel(ring, groups, self.solvent)
        return [
            self._with_forcefield(m, ring, r)
            for m, r in self._configurations(mol, ring, status, base_slots, groups, model, stereo_groups)
        ]

    def _with_forcefield(self, mol: Chem.Mol | Configuration, ring: ChairRing, result: RingResult) -> RingResult:
        estimated = any(p.estimated for p in result.chairs[0].positions)
        if self.forcefield == "never" or (self.forcefield == "auto" and not estimated):
            return result
        if isinstance(mol, Configuration):
            mol = mol.molecule
        heavy = forcefield.fragment_size(mol, ring)
        if self.forcefield == "auto" and heavy > AUTO_FORCEFIELD_MAX_HEAVY:
            skipped = (
                f"MMFF94 comparison skipped: {heavy} heavy atoms (the automatic check stops at "
                f"{AUTO_FORCEFIELD_MAX_HEAVY}; ask for it with forcefield 'always', which is not time-limited)"
            )
            return _with(result, warnings=result.warnings + (skipped,))
        try:
            energies = forcefield.chair_energies(mol, ring, time_boxed=self.forcefield == "auto")
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
        self, mol, ring, status, base_slots, groups, model, stereo_groups
    ) -> list[tuple[Chem.Mol | Configuration, RingResult]]:
        """(molecule or configuration whose stereo was analysed, result) for each configuration."""
        centres = [a for a in ring.atoms if a in status]
        open_ = [a for a in centres if status[a] != "specified"]
        units, split = stereo_units(centres, status, stereo_groups)
        loc = dict(zip(ring.atoms, ring.locants))
        chairs = ChairPair(ring, model, self.temperature, base_slots)
        if not units:
            stereo = tuple(Centre(a, loc[a], "specified") for a in centres)
            return [(mol, chairs.build(tops_of(base_slots), stereo))]
        if len(units) > MAX_OPEN_CENTRES:
            raise StereoError(
                f"{len(units)} ring stereocentres or stereo groups without a stated relation: too many to enumerate"
            )
        if len(centres) == 1:
            fixed = _with_tags(mol, {open_[0]: CCW})
            stereo = (Centre(open_[0], loc[open_[0]], f"{status[open_[0]]}, one enantiomer analysed"),)
            note = (
                f"the only stereocentre of this ring ({loc[open_[0]]}) is {status[open_[0]]}: both enantiomers "
                "have mirror-image chairs of equal energy, so one is analysed"
            )
            return [(fixed, chairs.build(tops_of(ring_slots(fixed, ring)), stereo, notes=(note,)))]
        others = any(v == "specified" for a, v in status.items() if a not in ring.atoms)
        stereo = tuple(Centre(a, loc[a], _centre_status(status[a], split.get(a))) for a in centres)
        why = []
        if open_:
            why.append(f"{len(open_)} ring stereocentres are {_words(status, open_)}")
        if split:
            why.append(
                f"the ring's specified centres are in separate stereo groups ({', '.join(dict.fromkeys(split.values()))}), "
                "which do not fix their configurations relative to each other"
            )
        reference = reference_positions(ring, base_slots, {k: g.size for k, g in groups.items()}, centres)
        out: list[tuple[Chem.Mol | Configuration, RingResult]] = []
        for tops in enumerate_faces(mol, ring, base_slots, units, mirror_ok=not others):
            label = relative_label(ring, reference, tops)
            config = Configuration.of(label, mol, ring, faces_of(base_slots, tops))
            note = f"{'; '.join(why)}: each relative configuration is analysed separately; this is {label}"
            out.append((config, chairs.build(tops, stereo, config, notes=(note,))))
        return out


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
    info = _rdkit.items(Chem.FindPotentialStereo(mol, cleanIt=False, flagPossible=True))
    tetrahedral = Chem.StereoType.Atom_Tetrahedral
    return {s.centeredOn: _STATUS.get(s.specified, "unspecified") for s in info if s.type == tetrahedral}


def _with_tags(mol: Chem.Mol, tags: dict[int, Chem.ChiralType]) -> Chem.Mol:
    out = Chem.Mol(mol)
    for idx, tag in tags.items():
        out.GetAtomWithIdx(idx).SetChiralTag(tag)
    forget_stereo_perception(out)  # the old tags' stereo perception must not outlive them
    return out


def _with(result: RingResult, **changes) -> RingResult:
    return RingResult(**{**result.__dict__, **changes})


def _centre_status(status: str, group: str | None) -> str:
    if status != "specified":
        return f"{status}, assumed"
    return "specified" if group is None else f"specified in stereo group {group}, relative to the other groups assumed"


def _words(status: dict[int, str], atoms: list[int]) -> str:
    kinds = sorted({status[a] for a in atoms})
    return " or ".join(kinds)


def reference_positions(
    ring: ChairRing, slots: tuple[Slot, ...], sizes: dict[Key, int], centres: list[int]
) -> list[tuple[int, int]]:
    """(ring index, slot number) of the group that counts for r/c/t at each stereocentre with a
    fixed face, in ring order: the largest group there (``sizes``), then the lowest atom index."""
    out = []
    for atom in centres:
        i = ring.atoms.index(atom)
        here = [j for j, s in enumerate(slots) if s.ring_index == i and s.is_group and s.face is not None]
        if here:
            here.sort(key=lambda j: (-sizes.get(position_key(slots[j]), 0), slots[j].atom or 0))
            out.append((i, here[0]))
    return sorted(out)


def relative_label(ring: ChairRing, reference: list[tuple[int, int]], tops: Sequence[bool | None]) -> str:
    """r/c/t descriptor of the ring's stereocentres for the faces ``tops``, e.g. 'r-1,c-4 (cis)'."""
    if not reference:
        return "unlabelled"
    ref_top = tops[reference[0][1]]
    parts = [f"r-{ring.locants[reference[0][0]]}"]
    for i, j in reference[1:]:
        parts.append(f"{'c' if tops[j] == ref_top else 't'}-{ring.locants[i]}")
    label = ",".join(parts)
    if len(reference) == 2:
        label += " (cis)" if parts[1].startswith("c") else " (trans)"
    return label


def _groups(
    mol: Chem.Mol, graph: MolGraph, slots: tuple[Slot, ...], ammonium: tuple[int, ...] = ()
) -> dict[Key, Group]:
    """The Group of every position that carries one (substituents, D/T, the H of a ring N-H)."""
    bonds = [(s.ring_atom, s.atom) for s in slots if s.atom is not None and s.is_group and s.element not in ("D", "T")]
    found = substituent_groups(mol, graph, bonds)  # type: ignore[arg-type]
    out: dict[Key, Group] = {}
    for s in slots:
        if s.element in ("D", "T"):
            out[position_key(s)] = recognise(hydrogen_isotope_fragment(s.element))
        elif s.is_group and s.atom is not None:
            out[position_key(s)] = found[(s.ring_atom, s.atom)]
        elif s.element == "H" and s.inverting and s.ring_index not in ammonium:
            out[position_key(s)] = _N_H  # (an ammonium N-H has no lone pair to trade places with)
    return out


__all__ = ["Analyzer", "analyze", "reference_positions", "relative_label", "AXIAL", "TOP"]
