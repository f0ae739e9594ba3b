"""Does a chair drawing show the registered stereoisomer? Drawing + registered structure -> verdict.

Identity is standard InChI. The drawing's stereo comes from ``perceive`` (the chair geometry, and
wedges where a ring is drawn flat); the registered structure is read as any input. A relative or
racemic registration matches a drawing of either enantiomer: every 'and'/'or' stereo group (or,
for a molfile with chiral flag 0, all its centres together) may be inverted. Where the two are
diastereomers, the centres that differ are found by mapping the registered structure onto the
drawing and comparing each centre's configuration through the mapping (the mapping with the
fewest differences is kept, so symmetric molecules are not over-reported).

Verdicts: match, enantiomer, diastereomer, different-compound, not-a-chair, undetermined.
Atom numbers count from 1: for a molfile as in the file, for SMILES the n-th atom written.
"""

from __future__ import annotations

from dataclasses import dataclass

from rdkit import Chem

from . import _rdkit
from . import stereodiff as sd
from .aliases import expand_aliases
from .analyze import Analyzer
from .errors import ChairdrawError, InputError
from .faces import mirror
from .perceive import Perception, perceive
from .read import Structure, read
from .stereodiff import CentreDifference

VERDICTS = ("match", "enantiomer", "diastereomer", "different-compound", "not-a-chair", "undetermined")
CAVEAT = (
    "chairdraw reads the drawing as a chair perspective and compares it with the registered structure; "
    "it does not replace experimental proof of configuration or an organisation's registration rules."
)


@dataclass(frozen=True)
class CheckResult:
    """The verdict on one drawing, with everything it rests on."""

    verdict: str
    reason: str
    differing_centers: tuple[CentreDifference, ...]
    drawn_chair_favored: bool | None  # None: no chair drawn, or no preference known
    warnings: tuple[str, ...]
    registered_stereo: str  # absolute, relative, racemic or mixed
    drawing_inchi: str
    registered_inchi: str
    perception: Perception | None = None
    record: str | None = None

    @property
    def ok(self) -> bool:
        return self.verdict == "match"

    def to_dict(self) -> dict:
        return {
            "schema_version": "1",
            "record": self.record,
            "verdict": self.verdict,
            "reason": self.reason,
            "differing_centers": [c.to_dict() for c in self.differing_centers],
            "drawn_chair_favored": self.drawn_chair_favored,
            "warnings": list(self.warnings),
            "registered_stereo": self.registered_stereo,
            "drawing_inchi": self.drawing_inchi,
            "registered_inchi": self.registered_inchi,
            "rings": [r.to_dict() for r in self.perception.rings] if self.perception else [],
            "caveat": CAVEAT,
        }


class Checker:
    """Checks drawings against registered structures; holds the analyser used for the favoured chair."""

    def __init__(self, analyzer: Analyzer | None = None):
        self.analyzer = analyzer or Analyzer()

    def check(self, drawing, registered) -> CheckResult:
        drawn = read(drawing)
        reg = read(registered)
        record = drawn.record
        try:
            return self._check(drawn, reg)
        except ChairdrawError as exc:
            raise exc.with_record(record) from None

    def _check(self, drawn: Structure, reg: Structure) -> CheckResult:
        if drawn.mol.GetNumAtoms() == 0:
            raise InputError("the drawing has no atoms", record=drawn.label)
        mol = expand_aliases(drawn.mol, drawn.label)
        meaning = reg.stereo_meaning if sd.specified_centres(sd.heavy(reg.mol)) or sd.stereo_bonds(reg.mol) else "none"
        if not mol.GetNumConformers():
            raise InputError("the drawing has no coordinates: give a molfile or SDF record", record=drawn.label)
        if mol.GetConformer().Is3D():
            seen = None  # 3D coordinates: RDKit already took the stereo from the geometry
            drawn_mol = Chem.Mol(mol)
            drawn_mol.RemoveAllConformers()  # else InChI reads the geometry again and ignores any change of tags
        else:
            seen = perceive(mol)
            drawn_mol = seen.mol
        warnings = (
            tuple(seen.warnings if seen else ())
            + drawn.notes
            + tuple(f"registered structure: {note}" for note in reg.notes)
        )
        d_heavy = sd.heavy(drawn_mol)
        r_heavy = sd.heavy(reg.mol)
        r_heavy.RemoveAllConformers()
        d_inchi = _rdkit.standard_inchi(d_heavy)
        r_inchi = _rdkit.standard_inchi(r_heavy)

        def result(verdict: str, reason: str, diffs=(), favored=None) -> CheckResult:
            return CheckResult(
                verdict, reason, tuple(diffs), favored, warnings, meaning, d_inchi, r_inchi, seen, drawn.record
            )

        if not d_inchi or not r_inchi:
            which = "the drawing" if not d_inchi else "the registered structure"
            return result(
                "undetermined",
                f"InChI cannot represent {which} (an R group, a dummy atom or an odd valence): no identity to compare",
            )
        if sd.constitution(d_heavy) != sd.constitution(r_heavy):
            return result("different-compound", "the drawing and the registered structure differ in constitution")
        if seen is not None and not seen.rings:
            return result("not-a-chair", "the drawing has no six-membered ring that can take a chair")
        if seen is not None and not seen.chairs and not sd.has_tags(d_heavy) and sd.has_tags(r_heavy):
            unclear = [r.reason for r in seen.rings if r.drawn_as == "unclear"]
            if unclear:  # drawn as some chair, but not one that can be read
                return result("undetermined", "; ".join(dict.fromkeys(unclear)))
            return result(
                "not-a-chair", "no ring is drawn as a chair and there are no wedges: the drawing shows no configuration"
            )
        if seen is not None and seen.conflicts:
            return result("undetermined", "the drawing contradicts itself: " + "; ".join(seen.conflicts))
        variants = sd.variants(reg, r_heavy)
        matches = sd.matches(r_heavy, d_heavy)
        missing = sd.unread_centres(r_heavy, d_heavy, matches, seen, sd.heavy_index(drawn_mol))
        missing += sd.unread_bonds(r_heavy, d_heavy, matches, sd.heavy_index(drawn_mol))
        favored = _favored(self.analyzer, drawn_mol, seen)
        if missing:
            return result("undetermined", "; ".join(missing), favored=favored)
        restricted = sd.restricted(d_heavy, r_heavy, matches)
        ids = {_rdkit.standard_inchi(v) for v in variants}
        if _rdkit.standard_inchi(restricted) in ids:
            reason = "the drawing shows the registered stereoisomer"
            if meaning == "none":
                reason = "the drawing shows the registered compound (the registration has no stereo: only the constitution was compared)"
            opened = sd.opened(d_heavy, r_heavy, matches)
            if opened:
                reason += f" (the registration leaves {opened} centre(s) open that the drawing sets: not compared)"
            return result("match", reason, favored=favored)
        if _rdkit.standard_inchi(mirror(restricted)) in ids:
            return result(
                "enantiomer", "the drawing shows the mirror image of the registered structure", favored=favored
            )
        diffs = sd.differences(variants, d_heavy, matches, drawn_mol, sd.heavy_index(reg.mol))
        if not diffs and not matches:
            return result(
                "diastereomer", "configuration differs (the atoms could not be mapped one to one)", (), favored
            )
        if not diffs:
            bonds = sd.double_bond_differences(variants[0], d_heavy, matches, drawn_mol)
            return result(
                "diastereomer",
                "configuration differs at " + (bonds or "no single centre that can be named"),
                (),
                favored,
            )
        where = ", ".join(
            f"{c.where}: {c.registered_cip or 'no CIP label'} registered, {c.drawn_cip or 'no CIP label'} drawn"
            for c in diffs
        )
        return result("diastereomer", f"configuration differs at {where or 'a double bond'}", diffs, favored)


def check(drawing, registered, analyzer: Analyzer | None = None) -> CheckResult:
    """Check a chair drawing (molfile path or text) against a registered structure (any format)."""
    return Checker(analyzer).check(drawing, registered)


def _favored(analyzer: Analyzer, mol: Chem.Mol, seen: Perception | None) -> bool | None:
    """Is the chair drawn the favoured one? None when no chair is drawn or none is favoured."""
    if seen is None or not seen.chairs:
        return None
    try:
        analysis = analyzer.analyze(read(mol))
    except ChairdrawError:
        return None
    answers = []
    for drawn in seen.chairs:
        ring = next((r for r in analysis.rings if set(r.atoms) == set(drawn.atoms)), None)
        if ring is None or ring.favored is None:
            continue
        up = set(drawn.up_atoms)
        chair = next((c for c in ring.chairs if set(c.up_atoms) == up), None)
        if chair is None:
            continue
        answers.append(chair.favored)
    return all(answers) if answers else None
