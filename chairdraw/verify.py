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

import itertools
from dataclasses import dataclass

from rdkit import Chem
from rdkit.Chem import rdCIPLabeler

from . import _rdkit
from .aliases import expand_aliases
from .analyze import Analyzer
from .errors import ChairdrawError, InputError
from .faces import CCW, CW, mirror, parity
from .perceive import Perception, perceive
from .read import Structure, read
from .rings import find_rings

VERDICTS = ("match", "enantiomer", "diastereomer", "different-compound", "not-a-chair", "undetermined")
CAVEAT = (
    "chairdraw reads the drawing as a chair perspective and compares it with the registered structure; "
    "it does not replace experimental proof of configuration or an organisation's registration rules."
)


@dataclass(frozen=True)
class CentreDifference:
    """A stereocentre whose configuration in the drawing differs from the registered one."""

    registered_atom: int  # number from 1, as in the registered structure
    drawn_atom: int  # number from 1, as in the drawing
    element: str
    registered_cip: str | None  # R/S (r/s) where CIP gives one
    drawn_cip: str | None
    locant: str | None = None  # the ring locant of the centre in the registered structure (C4, 2)

    @property
    def where(self) -> str:
        """'atom 8 (C4)': the atom number with the ring locant a chemist would use."""
        if self.locant is None:
            return f"atom {self.registered_atom}"
        locant = self.locant if self.locant[:1].isalpha() else f"ring locant {self.locant}"
        return f"atom {self.registered_atom} ({locant})"

    def to_dict(self) -> dict:
        return {
            "registered_atom_number": self.registered_atom,
            "locant": self.locant,
            "drawn_atom_number": self.drawn_atom,
            "element": self.element,
            "registered_cip": self.registered_cip,
            "drawn_cip": self.drawn_cip,
        }


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
        meaning = reg.stereo_meaning if _specified_centres(_heavy(reg.mol)) or _stereo_bonds(reg.mol) else "none"
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
        d_heavy = _heavy(drawn_mol)
        r_heavy = _heavy(reg.mol)
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
        if _constitution(d_heavy) != _constitution(r_heavy):
            return result("different-compound", "the drawing and the registered structure differ in constitution")
        if seen is not None and not seen.rings:
            return result("not-a-chair", "the drawing has no six-membered ring that can take a chair")
        if seen is not None and not seen.chairs and not _has_tags(d_heavy) and _has_tags(r_heavy):
            unclear = [r.reason for r in seen.rings if r.drawn_as == "unclear"]
            if unclear:  # drawn as some chair, but not one that can be read
                return result("undetermined", "; ".join(dict.fromkeys(unclear)))
            return result(
                "not-a-chair", "no ring is drawn as a chair and there are no wedges: the drawing shows no configuration"
            )
        if seen is not None and seen.conflicts:
            return result("undetermined", "the drawing contradicts itself: " + "; ".join(seen.conflicts))
        variants = _variants(reg, r_heavy)
        matches = _matches(r_heavy, d_heavy)
        missing = _unread_centres(r_heavy, d_heavy, matches, seen, _heavy_index(drawn_mol))
        missing += _unread_bonds(r_heavy, d_heavy, matches, _heavy_index(drawn_mol))
        favored = _favored(self.analyzer, drawn_mol, seen)
        if missing:
            return result("undetermined", "; ".join(missing), favored=favored)
        restricted = _restricted(d_heavy, r_heavy, matches)
        ids = {_rdkit.standard_inchi(v) for v in variants}
        if _rdkit.standard_inchi(restricted) in ids:
            reason = "the drawing shows the registered stereoisomer"
            if meaning == "none":
                reason = "the drawing shows the registered compound (the registration has no stereo: only the constitution was compared)"
            opened = _opened(d_heavy, r_heavy, matches)
            if opened:
                reason += f" (the registration leaves {opened} centre(s) open that the drawing sets: not compared)"
            return result("match", reason, favored=favored)
        if _rdkit.standard_inchi(mirror(restricted)) in ids:
            return result(
                "enantiomer", "the drawing shows the mirror image of the registered structure", favored=favored
            )
        diffs = _differences(variants, d_heavy, matches, drawn_mol, _heavy_index(reg.mol))
        if not diffs and not matches:
            return result(
                "diastereomer", "configuration differs (the atoms could not be mapped one to one)", (), favored
            )
        if not diffs:
            bonds = _double_bond_differences(variants[0], d_heavy, matches, drawn_mol)
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


# --- helpers ------------------------------------------------------------------------------------


def _heavy(mol: Chem.Mol) -> Chem.Mol:
    heavy, _ = _rdkit.without_hs(mol)
    return heavy


def _heavy_index(mol: Chem.Mol) -> dict[int, int]:
    """heavy-atom index -> index in the drawing as read (for numbers as in the file)."""
    _, new = _rdkit.without_hs(mol)
    return {v: k for k, v in new.items()}


def _constitution(mol: Chem.Mol) -> str:
    try:
        return Chem.MolToInchi(mol, options="-SNon") or Chem.MolToSmiles(mol, isomericSmiles=False)
    except Exception:
        return Chem.MolToSmiles(mol, isomericSmiles=False)


def _has_tags(mol: Chem.Mol) -> bool:
    return any(a.GetChiralTag() in (CW, CCW) for a in mol.GetAtoms())


def _specified(mol: Chem.Mol, kind) -> list[int]:
    """Atoms (tetrahedral) or bonds (double) whose configuration the structure specifies."""
    info = Chem.FindPotentialStereo(mol)
    return [
        i.centeredOn for i in _rdkit.items(info) if i.type == kind and i.specified == Chem.StereoSpecified.Specified
    ]


def _specified_centres(mol: Chem.Mol) -> list[int]:
    return _specified(mol, Chem.StereoType.Atom_Tetrahedral)


def _stereo_bonds(mol: Chem.Mol) -> list[int]:
    return _specified(mol, Chem.StereoType.Bond_Double)


def _unread_bonds(reg: Chem.Mol, drawn: Chem.Mol, matches, index: dict[int, int]) -> list[str]:
    """Registered E/Z double bonds that the drawing leaves open (drawn crossed, or 'either')."""
    if not matches:
        return []
    drawn_set = set(_stereo_bonds(drawn))
    out = []
    for b in _stereo_bonds(reg):
        bond = reg.GetBondWithIdx(b)
        i, j = matches[0].get(bond.GetBeginAtomIdx(), -1), matches[0].get(bond.GetEndAtomIdx(), -1)
        other = drawn.GetBondBetweenAtoms(i, j) if min(i, j) >= 0 else None
        if other is not None and other.GetIdx() not in drawn_set:
            out.append(
                f"the double bond between atoms {index.get(i, i) + 1} and {index.get(j, j) + 1} is drawn without"
                " a geometry (crossed or 'either'), but the registration sets its E/Z"
            )
    return out


def _variants(reg: Structure, mol: Chem.Mol) -> list[Chem.Mol]:
    """The registered structure and every stereoisomer its registration counts as the same."""
    _, new = _rdkit.without_hs(reg.mol)
    # stereo groups hold the input's atom numbers; ``mol`` is the heavy-atom copy
    groups = [tuple(new[a] for a in g.atoms if a in new) for g in reg.stereo_groups if g.kind in ("and", "or")]
    if reg.stereo_meaning == "relative" and not groups:
        groups = [tuple(_specified_centres(mol))]  # already heavy-atom numbers
    out = []
    for flips in itertools.product((False, True), repeat=len(groups)):
        variant = Chem.Mol(mol)
        for flip, group in zip(flips, groups):
            if flip:
                for a in group:
                    atom = variant.GetAtomWithIdx(a)
                    atom.SetChiralTag(CCW if atom.GetChiralTag() == CW else CW)
        out.append(variant)
    return out


MAX_MATCHES = 20000


def _matches(reg: Chem.Mol, drawn: Chem.Mol) -> list[dict[int, int]]:
    """Every mapping of the registered structure's atoms onto the drawing's that can matter.

    End atoms that touch no stereocentre (the methyls of a TMS or tBu group, the O of a nitro
    group) are left out of the query: their permutations multiply the mappings (6^5 for a penta-
    TMS ether) without changing any centre's configuration, and a cap on the number of mappings
    would otherwise cut off the one with the fewest differences. Empty when only InChI's
    normalisation (tautomers, charges) equates the two."""
    centres = set(_specified_centres(reg))
    keep = [
        a.GetIdx() for a in reg.GetAtoms() if a.GetDegree() != 1 or any(n.GetIdx() in centres for n in a.GetNeighbors())
    ]
    query = Chem.RWMol(reg)
    for idx in sorted(set(range(reg.GetNumAtoms())) - set(keep), reverse=True):
        query.RemoveAtom(idx)
    found = drawn.GetSubstructMatches(query.GetMol(), useChirality=False, uniquify=False, maxMatches=MAX_MATCHES)
    return [dict(zip(keep, m)) for m in found]


def _unread_centres(reg, drawn, matches, seen: Perception | None, index: dict[int, int]) -> list[str]:
    """Registered stereocentres the drawing does not show, each with the reason."""
    why = dict(zip(seen.undetermined, seen.reasons)) if seen is not None else {}
    if not matches:  # no atom mapping: any undetermined atom may matter
        return list(dict.fromkeys(why.values()))
    out = []
    for c in _specified_centres(reg):
        d = matches[0][c]
        if drawn.GetAtomWithIdx(d).GetChiralTag() in (CW, CCW):
            continue
        number = index.get(d, d) + 1
        out.append(
            why.get(index.get(d, d))
            or f"atom {number}: a registered stereocentre the drawing does not show (no wedge, not on a ring drawn as a chair)"
        )
    return list(dict.fromkeys(out))


def _restricted(drawn: Chem.Mol, reg: Chem.Mol, matches) -> Chem.Mol:
    """The drawing without configuration at centres the registration leaves open."""
    open_centres = set(range(reg.GetNumAtoms())) - set(_specified_centres(reg))
    out = Chem.Mol(drawn)
    if not matches:
        return out
    for c in open_centres:
        if c in matches[0]:
            out.GetAtomWithIdx(matches[0][c]).SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    set_bonds = set(_stereo_bonds(reg))
    for bond in reg.GetBonds():  # a double bond the registration leaves open is not compared either
        if bond.GetBondType() != Chem.BondType.DOUBLE or bond.GetIdx() in set_bonds:
            continue
        ends = matches[0].get(bond.GetBeginAtomIdx()), matches[0].get(bond.GetEndAtomIdx())
        other = out.GetBondBetweenAtoms(*ends) if None not in ends else None
        if other is not None and other.GetStereo() != Chem.BondStereo.STEREONONE:
            other.SetStereo(Chem.BondStereo.STEREONONE)
            for a in (other.GetBeginAtom(), other.GetEndAtom()):
                for b in a.GetBonds():
                    b.SetBondDir(Chem.BondDir.NONE)
    return out


def _opened(drawn: Chem.Mol, reg: Chem.Mol, matches) -> int:
    """How many centres the drawing sets that the registration leaves open."""
    if not matches:
        return 0
    registered = {matches[0][c] for c in _specified_centres(reg)}
    return len(set(_specified_centres(drawn)) - registered)


def _same_configuration(reg: Chem.Mol, drawn: Chem.Mol, match: dict[int, int], centre: int) -> bool | None:
    a, b = reg.GetAtomWithIdx(centre), drawn.GetAtomWithIdx(match[centre])
    if a.GetChiralTag() not in (CW, CCW) or b.GetChiralTag() not in (CW, CCW):
        return None
    if any(n.GetIdx() not in match for n in a.GetNeighbors()):
        return None
    mapped = [match[n.GetIdx()] for n in a.GetNeighbors()] + ["H"] * a.GetTotalNumHs()
    order = [n.GetIdx() for n in b.GetNeighbors()] + ["H"] * b.GetTotalNumHs()
    if sorted(map(str, mapped)) != sorted(map(str, order)):
        return None
    same_tag = a.GetChiralTag() == b.GetChiralTag()
    return same_tag == (parity(order, mapped) == 0)


def _differences(
    variants, drawn: Chem.Mol, matches, drawn_mol: Chem.Mol, reg_index: dict[int, int]
) -> list[CentreDifference]:
    best: tuple[tuple[int, list[int]], list[int], Chem.Mol, dict[int, int]] | None = None
    for variant in variants:
        centres = _specified_centres(variant)
        for match in matches:
            diff = [c for c in centres if _same_configuration(variant, drawn, match, c) is False]
            key = (len(diff), sorted(diff))  # fewest differences; among equals the lowest atoms, whatever the drawing
            if best is None or key < best[0]:
                best = (key, diff, variant, match)
    if best is None:
        return []
    _, diff, variant, match = best
    reg_cip, drawn_cip = _cip(variant), _cip(drawn)
    locants = {a: ring.locants[k] for ring in find_rings(variant, fused=True)[0] for k, a in enumerate(ring.atoms)}
    index = _heavy_index(drawn_mol)
    return [
        CentreDifference(
            reg_index.get(c, c) + 1,
            index.get(match[c], match[c]) + 1,
            variant.GetAtomWithIdx(c).GetSymbol(),
            reg_cip.get(c),
            drawn_cip.get(match[c]),
            locants.get(c),
        )
        for c in diff
    ]


def _double_bond_differences(reg: Chem.Mol, drawn: Chem.Mol, matches, drawn_mol: Chem.Mol) -> str:
    """Double bonds whose E/Z (CIP) differs, as words; '' when none can be named."""
    if not matches:
        return ""
    index = _heavy_index(drawn_mol)
    a, b = Chem.Mol(reg), Chem.Mol(drawn)
    try:
        rdCIPLabeler.AssignCIPLabels(a)
        rdCIPLabeler.AssignCIPLabels(b)
    except (RuntimeError, ValueError):
        return ""
    out = []
    for bond in a.GetBonds():
        if not bond.HasProp("_CIPCode"):
            continue
        i, j = matches[0].get(bond.GetBeginAtomIdx(), -1), matches[0].get(bond.GetEndAtomIdx(), -1)
        other = b.GetBondBetweenAtoms(i, j) if min(i, j) >= 0 else None
        drawn_label = other.GetProp("_CIPCode") if other is not None and other.HasProp("_CIPCode") else None
        if drawn_label != bond.GetProp("_CIPCode"):
            out.append(
                f"the double bond between atoms {bond.GetBeginAtomIdx() + 1} and {bond.GetEndAtomIdx() + 1}"
                f" ({bond.GetProp('_CIPCode')} registered, {drawn_label or 'not set'} drawn;"
                f" drawn atoms {index.get(i, i) + 1}, {index.get(j, j) + 1})"
            )
    return "; ".join(out)


def _cip(mol: Chem.Mol) -> dict[int, str]:
    labelled = Chem.Mol(mol)
    try:
        rdCIPLabeler.AssignCIPLabels(labelled)
    except (RuntimeError, ValueError):
        return {}
    return {a.GetIdx(): a.GetProp("_CIPCode") for a in labelled.GetAtoms() if a.HasProp("_CIPCode")}


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
