"""Structure text or file -> ``Structure``.

The single place that calls RDKit's parsers. Formats: SMILES, CXSMILES (enhanced stereo, wedges
with coordinates), MDL molfile V2000/V3000, SDF (the first record, said so in a note) and standard
InChI. The format is sniffed from the text unless the caller names it.

Atom numbering is kept exactly as in the input (hydrogens written in a molfile stay atoms), so that
every atom index in a report points at the atom the chemist drew.
"""

from __future__ import annotations

import os
import re
from dataclasses import dataclass, field
from pathlib import Path

from rdkit import Chem

from . import _rdkit, molcheck
from .errors import FormatError, InputError

FORMATS = ("smiles", "cxsmiles", "molfile", "sdf", "inchi")

_ARGUMENT = "argument"


@dataclass(frozen=True)
class StereoGroup:
    """An enhanced-stereo group: 'absolute', 'and' (racemic) or 'or' (relative, one of two)."""

    kind: str
    atoms: tuple[int, ...]

    def to_dict(self) -> dict:
        return {"kind": self.kind, "atoms": list(self.atoms)}


@dataclass(frozen=True)
class Structure:
    """A parsed structure: the RDKit molecule, where it came from and what it says about stereo."""

    mol: Chem.Mol = field(repr=False, compare=False)
    format: str
    source: str = _ARGUMENT
    record: str | None = None
    notes: tuple[str, ...] = ()
    stereo_groups: tuple[StereoGroup, ...] = ()
    chiral_flag: int | None = None  # V2000 header flag: 1 absolute, 0 relative; None when absent

    @property
    def label(self) -> str:
        return self.record or self.source

    @property
    def stereo_meaning(self) -> str:
        """What the stereo of the input claims: 'absolute', 'relative', 'racemic' or 'mixed'."""
        kinds = {g.kind for g in self.stereo_groups}
        if not kinds:
            if self.chiral_flag != 0:  # only a molfile's chiral flag 0 makes stereo relative
                return "absolute"
            return "relative" if self.chiral_flag == 0 and _tagged(self.mol) else "absolute"
        if kinds == {"and"}:
            return "racemic"
        if kinds == {"or"}:
            return "relative"
        if kinds == {"absolute"}:
            return "absolute"
        return "mixed"


def read(
    source: str | os.PathLike | Chem.Mol | Structure, format: str | None = None, record: str | None = None
) -> Structure:
    """Read a structure from text, a file path, an RDKit molecule or an existing Structure."""
    if isinstance(source, Structure):
        return source
    if isinstance(source, Chem.Mol):
        return Structure(mol=_checked_copy(source, record), format="rdkit", source="RDKit molecule", record=record)
    if format is not None and format not in FORMATS:
        raise FormatError(f"unknown format {format!r}; choose one of {', '.join(FORMATS)}", record=record)
    if isinstance(source, os.PathLike):
        return read_file(Path(source), format=format, record=record)
    text = str(source)
    if "\n" not in text and text.strip() and _looks_like_path(text.strip()):
        return read_file(Path(text.strip()), format=format, record=record)
    return read_text(text, format=format, source=_ARGUMENT, record=record)


def _checked_copy(mol: Chem.Mol, record: str | None) -> Chem.Mol:
    """A sanitized copy of a molecule handed over from RDKit: an unsanitized one has no ring
    information (every ring would be missed without a word), a query (SMARTS) one is no structure."""
    atom = mol.GetAtomWithIdx
    # R-group and '*' atoms carry queries in real structures too; a query on an element is SMARTS
    if any(atom(i).HasQuery() and atom(i).GetAtomicNum() != 0 for i in range(mol.GetNumAtoms())):
        raise InputError("the RDKit molecule is a query (SMARTS), not a structure", record=record)
    copy = Chem.Mol(mol)
    try:
        Chem.SanitizeMol(copy)
    except Exception as exc:  # RDKit's sanitization errors are several C++-wrapped types
        raise InputError(f"the RDKit molecule cannot be sanitized: {exc}", record=record) from None
    return copy


def read_file(path: Path, format: str | None = None, record: str | None = None) -> Structure:
    try:
        text = path.read_text(encoding="utf-8", errors="replace")
    except OSError as exc:
        raise InputError(f"cannot open {str(path)!r}: {exc.strerror}", record=record or str(path)) from None
    if format is None:
        format = _format_from_suffix(path)
    return read_text(text, format=format, source=str(path), record=record)


def read_text(text: str, format: str | None = None, source: str = _ARGUMENT, record: str | None = None) -> Structure:
    label = record or (source if source != _ARGUMENT else None)
    if not text.strip():
        raise InputError("the input is empty", record=label)
    try:
        text.encode("utf-8")
    except UnicodeEncodeError as exc:  # bytes that were not UTF-8, kept as surrogates by Python
        raise InputError(f"character {exc.start + 1} is not valid UTF-8 text", record=label) from None
    fmt = format or sniff(text)
    if fmt in ("smiles", "cxsmiles"):
        return _read_smiles(text, source, record, cx=fmt == "cxsmiles")
    if fmt == "inchi":
        return _read_inchi(text, source, record)
    if fmt in ("molfile", "sdf"):
        return _read_sdf_first(text, source, record)
    raise FormatError(f"unknown format {fmt!r}", record=label)


def sniff(text: str) -> str:
    """Guess the format from the text itself."""
    stripped = text.strip()
    if stripped.startswith("InChI="):
        return "inchi"
    if "M  END" in text or "V2000" in text or "V3000" in text:
        return "sdf" if "$$$$" in text else "molfile"
    first = stripped.splitlines()[0]
    if len(stripped.splitlines()) > 1:
        raise FormatError(
            "cannot tell the format: several lines, but no 'M  END' (molfile) and no 'InChI=' prefix; "
            "give one structure, or name the format"
        )
    return "cxsmiles" if re.search(r"\s\|.*\|", first) else "smiles"


_SUFFIXES = (".mol", ".sdf", ".sd", ".smi", ".inchi", ".txt", ".cxsmi")


def _looks_like_path(text: str) -> bool:
    # SMILES may hold '/' (double-bond stereo) and InChI always does: only an existing file or a
    # structure-file suffix makes a path
    if text.startswith("InChI="):
        return False
    # a directory only when written as a path: 'OC' is methanol even beside a directory named OC
    return os.path.isfile(text) or text.lower().endswith(_SUFFIXES) or (os.sep in text and os.path.isdir(text))


def _format_from_suffix(path: Path) -> str | None:
    return {".mol": "molfile", ".sdf": "sdf", ".sd": "sdf", ".inchi": "inchi"}.get(path.suffix.lower())


# --- SMILES and CXSMILES -------------------------------------------------------------------------

_CX_BLOCK = re.compile(r"^(\S+)(\s+\|[^|]*\|)?\s*(.*)$")
_POSITION = re.compile(r"around position (\d+)")


_SMILES_PARAMS = Chem.SmilesParserParams()
# the RDKit stubs type these attributes wrongly
_SMILES_PARAMS.removeHs = False  # type: ignore[assignment]
_SMILES_PARAMS.allowCXSMILES = True  # type: ignore[assignment]
_SMILES_PARAMS.strictCXSMILES = True  # type: ignore[assignment]


def _read_smiles(text: str, source: str, record: str | None, cx: bool) -> Structure:
    line = text.strip().splitlines()[0].strip()
    match = _CX_BLOCK.match(line)
    assert match is not None  # the pattern accepts any non-empty line
    smiles, extension, title = match.group(1), match.group(2) or "", match.group(3).strip()
    if title.startswith("|"):
        raise InputError(
            "CXSMILES: the extension block is not closed with '|'",
            record=record or (source if source != _ARGUMENT else None),
        )
    record = record or title or None
    params = _SMILES_PARAMS
    parse_text = smiles + extension
    mol = Chem.MolFromSmiles(parse_text, params)
    if mol is None:
        raise _smiles_error(parse_text, params, smiles, record or (source if source != _ARGUMENT else None))
    for listed in re.findall(r"(?:\ba|&\d+|\bo\d+):([\d,]+)", extension) if extension else ():
        bad = [int(a) for a in listed.split(",") if a and int(a) >= mol.GetNumAtoms()]
        if bad:
            raise InputError(
                f"CXSMILES: stereo group names atom {bad[0]}, but the SMILES has atoms 0-{mol.GetNumAtoms() - 1}",
                record=record or (source if source != _ARGUMENT else None),
            )
    notes = []
    dropped = _dropped_marks(smiles, mol)
    if dropped:
        notes.append(
            f"{dropped} stereo mark(s) of the SMILES were dropped by the reader: as written, the atom "
            "is not a stereocentre (a centre that is one only together with another, as in 1,4-disubstituted "
            "rings, needs both marked)"
        )
    if extension and "w" in extension and mol.GetNumConformers() == 0:
        notes.append("CXSMILES wedges without coordinates are ignored by the reader")
    fmt = "cxsmiles" if extension else "smiles"
    return Structure(mol=mol, format=fmt, source=source, record=record, notes=tuple(notes), stereo_groups=_groups(mol))


def _dropped_marks(smiles: str, mol: Chem.Mol) -> int:
    """How many '@'/'@@' marks of the SMILES left no tetrahedral tag (RDKit removes marks on atoms
    that are not stereocentres as written)."""
    # '@', '@@', '@TH1', '@TH2' are tetrahedral; '@SP1', '@TB5', '@OH12', '@AL1' are not
    marks = sum(1 for m in re.findall(r"@(@|TH\d|AL\d|SP\d|TB\d+|OH\d+)?", smiles) if m in ("", "@", "TH1", "TH2"))
    if not marks:
        return 0
    return max(0, marks - len(_tagged(mol)))


_TETRAHEDRAL = (Chem.ChiralType.CHI_TETRAHEDRAL_CW, Chem.ChiralType.CHI_TETRAHEDRAL_CCW)


def _tagged(mol: Chem.Mol) -> list[int]:
    """Atoms with a tetrahedral tag."""
    atom = mol.GetAtomWithIdx
    return [i for i in range(mol.GetNumAtoms()) if atom(i).GetChiralTag() in _TETRAHEDRAL]


def _smiles_error(parse_text: str, params: Chem.SmilesParserParams, smiles: str, record: str | None) -> InputError:
    _, messages = _rdkit.captured(lambda: Chem.MolFromSmiles(parse_text, params))
    sentences = [m.removeprefix("SMILES Parse Error: ") for m in messages if m.strip(" ~^") and m.strip() != smiles]
    position = None
    for m in messages:
        found = _POSITION.search(m)
        if found:
            position = int(found.group(1))
    reason = next((s for s in sentences if not s.startswith(("check for mistakes", "Failed parsing"))), None)
    reason = reason or (sentences[0] if sentences else "RDKit could not parse it")
    reason = re.sub(r"\s+for input: '.*'$", "", reason)
    # RDKit counts atoms from 0; a chemist reading the SMILES counts from 1
    reason = re.sub(r"atom # ?(\d+)", lambda m: f"atom {int(m.group(1)) + 1} of the SMILES (counting from 1)", reason)
    reason = re.sub(r"while parsing: .*$", "", reason).strip().rstrip(":")
    detail = None
    if position is not None:
        detail = f"  {smiles}\n  {' ' * (position - 1)}^"
    where = f" at position {position}" if position is not None else ""
    return InputError(f"SMILES{where}: {reason}", record=record, detail=detail)


# --- InChI ---------------------------------------------------------------------------------------


def _read_inchi(text: str, source: str, record: str | None) -> Structure:
    inchi = text.strip().split()[0]
    mol = Chem.MolFromInchi(inchi, sanitize=True, removeHs=True)
    if mol is None:
        _, messages = _rdkit.captured(lambda: Chem.MolFromInchi(inchi))
        useful = [m for m in messages if len(m.strip(" :")) > 8 and not m.strip().endswith(":")]
        reason = "; ".join(useful) or "not a valid InChI (the InChI library could not read it)"
        raise InputError(f"InChI: {reason}", record=record or (source if source != _ARGUMENT else None))
    notes = []
    if not inchi.startswith("InChI=1S/"):
        notes.append("a non-standard InChI: read as written, its options are not checked")
    # the /s layer says what the stereo means: 1 absolute, 2 relative, 3 racemic; RDKit reads the
    # centres and drops the meaning, which an enhanced-stereo group over them keeps
    meaning = re.search(r"/s([23])(?:/|$)", inchi)
    if meaning:
        tagged = _tagged(mol)
        if tagged:
            # one group per component: the InChI relates the centres of one component only
            kind = Chem.StereoGroupType.STEREO_OR if meaning.group(1) == "2" else Chem.StereoGroupType.STEREO_AND
            editable = Chem.RWMol(mol)
            pieces = Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False)
            groups = [[i for i in tagged if i in piece] for piece in pieces]
            editable.SetStereoGroups([Chem.CreateStereoGroup(kind, editable, g) for g in groups if g])
            mol = editable.GetMol()
    return Structure(
        mol=mol, format="inchi", source=source, record=record, notes=tuple(notes), stereo_groups=_groups(mol)
    )


# --- molfile and SDF -----------------------------------------------------------------------------


def split_sdf(text: str) -> list[str]:
    """Split SDF text into record texts ourselves, so a broken record keeps its title."""
    records: list[str] = []
    current: list[str] = []
    for line in text.splitlines(keepends=True):
        if line.rstrip() == "$$$$":
            records.append("".join(current))
            current = []
        else:
            current.append(line)
    if "".join(current).strip():
        records.append("".join(current))
    return records


def _read_sdf_first(text: str, source: str, record: str | None) -> Structure:
    records = split_sdf(text)
    notes = []
    if len(records) > 1:
        notes.append(f"the file holds {len(records)} records; the first was taken")
    structure = read_molblock(records[0], source=source, record=record)
    changes: dict = {}
    if "$$$$" in text:
        changes["format"] = "sdf"
    if notes:
        changes["notes"] = structure.notes + tuple(notes)
    return Structure(**{**structure.__dict__, **changes}) if changes else structure


def read_molblock(block: str, source: str = _ARGUMENT, record: str | None = None) -> Structure:
    """One molfile record (V2000 or V3000, data fields allowed after M  END)."""
    title = block.splitlines()[0].strip() if block.splitlines() else ""
    record = record or title or None
    label = record or (source if source != _ARGUMENT else None)
    molpart = block.split("M  END")[0] + "M  END\n" if "M  END" in block else block
    mol = None
    try:
        mol = Chem.MolFromMolBlock(molpart, sanitize=True, removeHs=False, strictParsing=True)
    except Exception:
        mol = None
    # RDKit accepts some broken files (bond type 99, coordinate 'abc' in V3000): always look
    problem = molcheck.diagnose(block)
    if problem is None and mol is None:
        _, messages = _rdkit.captured(lambda: Chem.MolFromMolBlock(molpart, sanitize=True, removeHs=False))
        problem = (
            "; ".join(_molfile_numbering(m, molpart) for m in messages) or "RDKit could not read the connection table"
        )
    if problem is not None:
        raise InputError(f"molfile: {problem}", record=label)
    assert mol is not None
    lines = molpart.splitlines()
    counts = lines[3] if len(lines) > 3 else ""
    if "V3000" in counts:
        flag = molcheck.v3000_chiral_flag(molpart)
    else:
        field = counts[12:15].strip()  # a short counts line has no chiral flag at all: not "relative"
        flag = None if not field else 1 if field == "1" else 0
    notes = []
    if mol.GetNumConformers() and mol.GetConformer().Is3D():
        notes.append("3D coordinates: stereo was taken from the geometry")
    return Structure(
        mol=mol,
        format="molfile",
        source=source,
        record=record,
        notes=tuple(notes),
        stereo_groups=_groups(mol),
        chiral_flag=flag,
    )


_ATOM_NO = re.compile(r"atom # (\d+)")


def _molfile_numbering(message: str, molpart: str) -> str:
    """RDKit counts atoms from 0; a molfile (and the chemist reading it) from 1."""
    v2000 = len(molpart.splitlines()) > 3 and "V3000" not in molpart.splitlines()[3]

    def one_based(m: re.Match) -> str:
        n = int(m.group(1)) + 1
        return f"atom {n} (line {n + 4} of the file)" if v2000 else f"atom {n}"

    return _ATOM_NO.sub(one_based, message)


def _groups(mol: Chem.Mol) -> tuple[StereoGroup, ...]:
    kinds = {
        Chem.StereoGroupType.STEREO_ABSOLUTE: "absolute",
        Chem.StereoGroupType.STEREO_AND: "and",
        Chem.StereoGroupType.STEREO_OR: "or",
    }
    return tuple(
        StereoGroup(kinds[g.GetGroupType()], tuple(sorted(a.GetIdx() for a in g.GetAtoms())))
        for g in _rdkit.items(mol.GetStereoGroups())
    )
