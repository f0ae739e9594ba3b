"""Structure -> Analysis: rings, faces, both chairs, energies and the equilibrium.

The pipeline stage that ties the others together. Unspecified ring stereo is never guessed: a
ring whose only stereocentre is open is analysed once (the two enantiomers have mirror-image
chairs of equal energy); a ring with several open centres is analysed once per relative
configuration, each labelled (r/c/t and SMILES).
"""

from __future__ import annotations

from rdkit import Chem

from . import _rdkit
from .chairs import AXIAL, chair_name, inverting_choices, place, points_up
from .configurations import enumerate_faces, faces_of
from .energy import equilibrium, forcefield, tables
from .energy.terms import NO_POSITION_VALUE, chair_terms
from .errors import EnergyError, StereoError, UsageError
from .faces import CCW, TOP, Slot, ring_slots, set_faces
from .read import Structure, read
from .results import Analysis, Centre, Chair, Configuration, Position, RingResult
from .rings import ChairRing, find_rings
from .substituents import Group, fragments, hydrogen_isotope_fragment, recognise

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
        rings, refused = find_rings(mol)
        status = _stereo_status(mol)
        results: list[RingResult] = []
        for ring in rings:
            try:
                results.extend(self._ring(mol, ring, status))
            except StereoError as exc:
                raise exc.with_record(structure.label) from None
        notes = list(structure.notes)
        if not rings:
            notes.append("no ring that can take a chair")
        heavy = Chem.RemoveHs(mol, sanitize=False) if _has_h_atoms(mol) else mol
        return Analysis(
            record=structure.record,
            source=structure.source,
            format=structure.format,
            smiles=Chem.MolToSmiles(heavy),
            inchi=_rdkit.standard_inchi(mol),
            temperature_K=self.temperature,
            solvent=self.solvent,
            stereo_meaning=structure.stereo_meaning,
            rings=tuple(results),
            refused=tuple(refused),
            notes=tuple(notes),
        )

    # --- one ring ---------------------------------------------------------------------------

    def _ring(self, mol: Chem.Mol, ring: ChairRing, status: dict[int, str]) -> list[RingResult]:
        base_slots = ring_slots(mol, ring)
        groups = self._groups(mol, base_slots)
        return [
            self._with_forcefield(m, ring, r) for m, r in self._configurations(mol, ring, status, base_slots, groups)
        ]

    def _with_forcefield(self, mol: Chem.Mol, ring: ChairRing, result: RingResult) -> RingResult:
        estimated = any(p.estimated for p in result.chairs[0].positions)
        if self.forcefield == "never" or (self.forcefield == "auto" and not estimated):
            return result
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

    def _configurations(self, mol, ring, status, base_slots, groups) -> list[tuple[Chem.Mol, RingResult]]:
        """(molecule with the ring's stereo as analysed, result) for each configuration."""
        centres = [a for a in ring.atoms if a in status]
        open_ = [a for a in centres if status[a] != "specified"]
        loc = dict(zip(ring.atoms, ring.locants))
        if not open_:
            stereo = tuple(Centre(a, loc[a], "specified") for a in centres)
            return [(mol, self._chairs(ring, base_slots, groups, stereo))]
        if len(open_) > MAX_OPEN_CENTRES:
            raise StereoError(f"{len(open_)} unspecified centres in one ring: too many to enumerate")
        if len(centres) == 1:
            fixed = _with_tags(mol, {open_[0]: CCW})
            stereo = (Centre(open_[0], loc[open_[0]], f"{status[open_[0]]}, one enantiomer analysed"),)
            note = (
                f"the only stereocentre of this ring ({loc[open_[0]]}) is {status[open_[0]]}: both enantiomers "
                "have mirror-image chairs of equal energy, so one is analysed"
            )
            result = self._chairs(ring, ring_slots(fixed, ring), groups, stereo)
            return [(fixed, _with(result, notes=result.notes + (note,)))]
        others = any(v == "specified" for a, v in status.items() if a not in ring.atoms)
        out = []
        for slots in enumerate_faces(mol, ring, base_slots, open_, mirror_ok=not others):
            candidate = set_faces(mol, ring, faces_of(slots))
            label = relative_label(ring, slots, groups, centres)
            stereo = tuple(
                Centre(a, loc[a], "specified" if status[a] == "specified" else f"{status[a]}, assumed") for a in centres
            )
            config = Configuration(label, Chem.MolToSmiles(candidate))
            result = self._chairs(ring, slots, groups, stereo, config)
            note = (
                f"{len(open_)} ring stereocentres are {_words(status, open_)}: each relative configuration "
                f"is analysed separately; this is {label}"
            )
            out.append((candidate, _with(result, notes=result.notes + (note,))))
        return out

    def _groups(self, mol: Chem.Mol, slots: tuple[Slot, ...]) -> dict[tuple[int, int | None, str], Group]:
        bonds = [
            (s.ring_atom, s.atom) for s in slots if s.atom is not None and s.is_group and s.element not in ("D", "T")
        ]
        smiles = fragments(mol, bonds)  # type: ignore[arg-type]
        out: dict[tuple[int, int | None, str], Group] = {}
        for s in slots:
            if s.element in ("D", "T"):
                out[(s.ring_atom, s.atom, s.element)] = recognise(hydrogen_isotope_fragment(s.element))
            elif s.is_group and s.atom is not None:
                out[(s.ring_atom, s.atom, s.element)] = recognise(smiles[(s.ring_atom, s.atom)])
            elif s.element == "H" and s.inverting:
                out[(s.ring_atom, s.atom, "H")] = _N_H
        return out

    def _chairs(self, ring, slots, groups, stereo, config=None) -> RingResult:
        by_slot = {
            s: groups[(s.ring_atom, s.atom, s.element)] for s in slots if (s.ring_atom, s.atom, s.element) in groups
        }
        built = []
        warnings: list[str] = []
        for chair in (0, 1):
            best = None
            for choice in inverting_choices(slots):
                placements = place(chair, slots, choice)
                terms, warn = chair_terms(ring, placements, by_slot, self.solvent)
                energy = sum(t.value for t in terms)
                if best is None or energy < best[0] - 1e-9:
                    best = (energy, placements, terms, warn)
            assert best is not None
            built.append(best)
            warnings.extend(w for w in best[3] if w not in warnings)
        energies = [b[0] for b in built]
        pops = equilibrium.populations(energies, self.temperature)
        low = min(energies)
        degenerate = abs(energies[0] - energies[1]) < equilibrium.DEGENERATE_KCAL
        chairs = []
        for chair, (energy, placements, terms, _) in enumerate(built):
            positions = tuple(_position(ring, p, by_slot) for p in placements)
            chairs.append(
                Chair(
                    name=chair_name(ring, chair),
                    up_atoms=tuple(a for k, a in enumerate(ring.atoms) if points_up(chair, k)),
                    energy_kcal_mol=energy - low,
                    population=pops[chair],
                    favored=(not degenerate) and energy == low,
                    terms=tuple(terms),
                    positions=positions,
                )
            )
        warnings = _group_warnings(ring, by_slot) + _merge_position_warnings(warnings)
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
        )


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


def _has_h_atoms(mol: Chem.Mol) -> bool:
    return any(a.GetAtomicNum() == 1 for a in mol.GetAtoms())


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


def _position(ring: ChairRing, p, by_slot) -> Position:
    s = p.slot
    g = by_slot.get(s)
    label = "lone pair" if s.element == "LP" else ("H" if s.element == "H" else (g.label if g else s.element))
    return Position(
        ring_atom=s.ring_atom,
        locant=ring.locants[s.ring_index],
        atom=s.atom,
        label=label,
        face=p.face,
        orientation=p.orientation,
        inverting=s.inverting,
        estimated=bool(g and g.estimated_as and s.element != "H"),
    )


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


def _group_warnings(ring: ChairRing, by_slot: dict[Slot, Group]) -> list[str]:
    out = []
    per_atom: dict[int, list[Group]] = {}
    for s, g in by_slot.items():
        if s.is_group:
            per_atom.setdefault(s.ring_index, []).append(g)
    for i, gs in sorted(per_atom.items()):
        where = ring.locants[i]
        for g in gs:
            if g.estimated_as:
                value = g.rows[0].aprotic
                if g.estimated_as == "unclassified":
                    out.append(
                        f"{g.label} at {where}: no A-value and no class; a placeholder of {value:g} kcal/mol is used"
                    )
                else:
                    out.append(
                        f"{g.label} at {where} is not in the A-value table: estimated as {g.estimated_as} "
                        f"(value of {g.rows[0].label}, {value:g} kcal/mol)"
                    )
        if len(gs) == 2 and ring.elements[i] == "C":
            out.append(
                f"geminal {gs[0].label}/{gs[1].label} at {where}: A-values are not additive for geminal pairs "
                "(1-methyl-1-phenylcyclohexane prefers axial phenyl, Eliel & Manoharan 1981)"
            )
    return out


def relative_label(ring: ChairRing, slots: tuple[Slot, ...], groups, centres: list[int]) -> str:
    """r/c/t descriptor of the ring's stereocentres, e.g. 'r-1,c-4 (cis)'."""
    principal: list[tuple[int, Slot]] = []
    for atom in centres:
        i = ring.atoms.index(atom)
        here = [s for s in slots if s.ring_index == i and s.is_group and s.face is not None]
        if not here:
            continue
        here.sort(key=lambda s: (-_size(groups.get((s.ring_atom, s.atom, s.element))), s.atom or 0))
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


def _size(group: Group | None) -> int:
    if group is None:
        return 0
    return sum(1 for ch in group.fragment if ch.isalpha() and ch.isupper())


__all__ = ["Analyzer", "analyze", "relative_label", "AXIAL", "TOP"]
