"""Frozen result objects of an analysis, each with ``to_dict()`` for JSON (see schema/)."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import cached_property

from rdkit import Chem

from . import _rdkit
from .energy.terms import Term
from .faces import set_faces
from .rings import ChairRing, RefusedRing

SCHEMA_VERSION = "1"


def _r(x: float, digits: int = 4) -> float:
    return round(x, digits)


@dataclass(frozen=True)
class Position:
    ring_atom: int
    locant: str
    atom: int | None
    label: str
    face: str
    orientation: str
    inverting: bool = False
    estimated: bool = False

    def to_dict(self) -> dict:
        return {
            "ring_atom": self.ring_atom,
            "locant": self.locant,
            "atom": self.atom,
            "label": self.label,
            "face": self.face,
            "orientation": self.orientation,
            "inverting": self.inverting,
            "estimated": self.estimated,
        }


@dataclass(frozen=True)
class Chair:
    name: str
    up_atoms: tuple[int, ...]
    energy_kcal_mol: float
    population: float
    favored: bool
    terms: tuple[Term, ...]
    positions: tuple[Position, ...]

    def axial(self) -> tuple[Position, ...]:
        return tuple(p for p in self.positions if p.orientation == "axial" and p.label not in ("H", "lone pair"))

    def to_dict(self) -> dict:
        return {
            "name": self.name,
            "up_atoms": list(self.up_atoms),
            "energy_kcal_mol": _r(self.energy_kcal_mol),
            "population": _r(self.population, 6),
            "favored": self.favored,
            "terms": [t.to_dict() for t in self.terms],
            "positions": [p.to_dict() for p in self.positions],
        }


@dataclass(frozen=True)
class Centre:
    atom: int
    locant: str
    status: str  # specified, unspecified, unknown, assumed (unspecified, value chosen for analysis)

    def to_dict(self) -> dict:
        return {"atom": self.atom, "locant": self.locant, "status": self.status}


@dataclass(frozen=True)
class Configuration:
    """A relative configuration chosen for analysis because the input left it open.

    Its SMILES and InChI are computed on first use (an enumerated sugar ring has 16
    configurations, and most callers look at the chairs only)."""

    label: str
    faces: tuple[tuple[int, str], ...]  # (substituent atom, face) that fix this configuration
    mol: Chem.Mol = field(repr=False, compare=False)  # the molecule the faces apply to
    ring: ChairRing = field(repr=False, compare=False)

    @classmethod
    def of(cls, label: str, mol: Chem.Mol, ring: ChairRing, faces: Mapping[int, str]) -> Configuration:
        return cls(label, tuple(sorted(faces.items())), mol, ring)

    @cached_property
    def molecule(self) -> Chem.Mol:
        """The input molecule with this configuration's chiral tags."""
        return set_faces(self.mol, self.ring, dict(self.faces))

    @cached_property
    def smiles(self) -> str:
        return Chem.MolToSmiles(self.molecule)

    @cached_property
    def inchi(self) -> str:
        return _rdkit.standard_inchi(self.molecule)

    def to_dict(self) -> dict:
        return {"label": self.label, "smiles": self.smiles, "inchi": self.inchi}


@dataclass(frozen=True)
class RingResult:
    atoms: tuple[int, ...]
    locants: tuple[str, ...]
    kind: str
    chairs: tuple[Chair, Chair]
    delta_g_kcal_mol: float
    degenerate: bool
    stereo: tuple[Centre, ...]
    configuration: Configuration | None = None
    trigonal_atoms: tuple[int, ...] = ()
    warnings: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()
    forcefield_kcal_mol: tuple[float, float] | None = None  # MMFF94, chair order as in chairs

    @property
    def favored(self) -> Chair | None:
        return next((c for c in self.chairs if c.favored), None)

    def to_dict(self) -> dict:
        return {
            "atoms": list(self.atoms),
            "locants": list(self.locants),
            "kind": self.kind,
            "delta_g_kcal_mol": _r(self.delta_g_kcal_mol),
            "degenerate": self.degenerate,
            "favored_chair": self.favored.name if self.favored else None,
            "stereo": [c.to_dict() for c in self.stereo],
            "configuration": self.configuration.to_dict() if self.configuration else None,
            "trigonal_atoms": list(self.trigonal_atoms),
            "warnings": list(self.warnings),
            "notes": list(self.notes),
            "forcefield_kcal_mol": None
            if self.forcefield_kcal_mol is None
            else [_r(e) for e in self.forcefield_kcal_mol],
            "chairs": [c.to_dict() for c in self.chairs],
        }


@dataclass(frozen=True)
class Analysis:
    """The analysis of one structure. ``smiles`` and ``inchi`` (identity strings of the input as
    read) are computed on first use."""

    record: str | None
    source: str
    format: str
    mol: Chem.Mol = field(repr=False, compare=False)
    temperature_K: float
    solvent: str
    stereo_meaning: str
    rings: tuple[RingResult, ...]
    refused: tuple[RefusedRing, ...] = ()
    notes: tuple[str, ...] = ()
    model: str = "additive"
    disclaimer: str = field(
        default=(
            "A conformational model from tabulated energies: it does not replace experimental proof "
            "of configuration or an organisation's registration rules."
        )
    )

    @cached_property
    def smiles(self) -> str:
        """Canonical SMILES of the input; a CXSMILES with its enhanced-stereo groups where it has
        any, so that 'racemic' or 'one of two' is not lost."""
        heavy = Chem.RemoveHs(self.mol, sanitize=False) if _has_h_atoms(self.mol) else self.mol
        if len(heavy.GetStereoGroups()):
            return Chem.MolToCXSmiles(heavy, Chem.SmilesWriteParams(), Chem.CXSmilesFields.CX_ENHANCEDSTEREO)
        return Chem.MolToSmiles(heavy)

    @cached_property
    def inchi(self) -> str:
        return _rdkit.standard_inchi(self.mol)

    def _repr_svg_(self) -> str | None:
        """Jupyter shows an analysis as its chair figure (nothing, if there is no ring to draw)."""
        from .errors import ChairdrawError
        from .figure import draw_analysis

        try:
            return draw_analysis(self).svg()
        except ChairdrawError:
            return None

    def to_dict(self) -> dict:
        return {
            "schema_version": SCHEMA_VERSION,
            "record": self.record,
            "source": self.source,
            "format": self.format,
            "smiles": self.smiles,
            "inchi": self.inchi,
            "temperature_K": self.temperature_K,
            "solvent": self.solvent,
            "model": self.model,
            "stereo_meaning": self.stereo_meaning,
            "rings": [r.to_dict() for r in self.rings],
            "refused_rings": [r.to_dict() for r in self.refused],
            "notes": list(self.notes),
            "disclaimer": self.disclaimer,
        }


def _has_h_atoms(mol: Chem.Mol) -> bool:
    return any(a.GetAtomicNum() == 1 for a in mol.GetAtoms())
