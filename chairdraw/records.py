"""Records of a compound list, streamed: SDF, SMILES files (SMILES and id per line), CSV and TSV.

Nothing is read whole into memory. Every record keeps its position in the file (from 1) and the
line it starts on, and gets an id even when its structure is broken: the SDF is split here, by
its '$$$$' lines, so a record whose connection table is garbage still has its title (RDKit's
supplier would hand back None and lose it). Parsing the structure is left to ``read.py`` in the
worker, so that a bad record becomes an error row with its id, not a stopped run.
"""

from __future__ import annotations

import csv
import os
import sqlite3
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

from .errors import InputError, UsageError

KINDS = ("sdf", "smiles", "csv", "tsv")
_SUFFIXES = {
    ".sdf": "sdf",
    ".sd": "sdf",
    ".mol": "sdf",
    ".smi": "smiles",
    ".smiles": "smiles",
    ".csv": "csv",
    ".tsv": "tsv",
}
_STRUCTURE_COLUMNS = ("smiles", "structure", "molfile", "inchi", "cxsmiles")
_NAME_COLUMNS = ("name", "caption")


@dataclass(frozen=True)
class Record:
    """One input record: where it is, what it is called, and its structure as text."""

    position: int  # from 1, in input order
    line: int  # the line of the file it starts on, from 1
    id: str
    text: str  # a molfile block, a SMILES, an InChI ... ('' when the record has none)
    format: str | None  # 'molfile' for an SDF record; None: let read.py sniff it
    name: str | None = None  # a name or caption given with the record
    problem: str | None = None  # a record that could not be cut out of the file, and why
    anonymous: bool = False  # the id is made up ('record N'): it names nothing in another file


def kind_of(path: str | os.PathLike, kind: str | None = None) -> str:
    if kind is not None:
        if kind not in KINDS:
            raise UsageError(f"unknown input kind {kind!r}; one of {', '.join(KINDS)}")
        return kind
    found = _SUFFIXES.get(Path(path).suffix.lower())
    if found is None:
        raise UsageError(f"cannot tell the kind of {str(path)!r} from its name: give --input-kind ({', '.join(KINDS)})")
    return found


def iter_records(
    path: str | os.PathLike,
    kind: str | None = None,
    id_field: str | None = None,
    structure_column: str | None = None,
    name_column: str | None = None,
) -> Iterator[Record]:
    """The records of a file, one at a time, in file order."""
    kind = kind_of(path, kind)
    try:
        # utf-8-sig: a byte-order mark (as spreadsheet programs save) is not part of the first line
        handle = open(path, encoding="utf-8-sig", errors="replace", newline="")
    except OSError as exc:
        raise InputError(f"cannot open {str(path)!r}: {exc.strerror}") from None
    with handle:
        if kind == "sdf":
            yield from _sdf(handle, id_field)
        elif kind == "smiles":
            yield from _smiles(handle)
        else:
            yield from _table(handle, "\t" if kind == "tsv" else ",", id_field, structure_column, name_column)


def _sdf(handle, id_field: str | None) -> Iterator[Record]:
    lines: list[str] = []
    start = 1
    position = 0
    for number, line in enumerate(handle, start=1):
        if line.rstrip() == "$$$$":
            position += 1
            yield _sdf_record(lines, position, start, id_field)
            lines = []
            start = number + 1
        else:
            lines.append(line)
    if "".join(lines).strip():
        position += 1
        yield _sdf_record(lines, position, start, id_field)


def _sdf_record(lines: list[str], position: int, start: int, id_field: str | None) -> Record:
    text = "".join(lines)
    title = lines[0].strip() if lines else ""
    fields = _data_fields(lines)
    record_id = (fields.get(id_field) if id_field else None) or title
    name = fields.get("name") or fields.get("caption")
    problem = None if "M  END" in text else "no 'M  END' line: the molfile block is truncated"
    return Record(position, start, record_id or f"record {position}", text, "molfile", name, problem, not record_id)


def _data_fields(lines: list[str]) -> dict[str, str]:
    """SDF data items: '> <name>' (or '>  <name>') and the value lines after it."""
    out: dict[str, str] = {}
    key = None
    for line in lines:
        stripped = line.rstrip("\r\n")
        if stripped.startswith(">") and "<" in stripped and ">" in stripped[stripped.index("<") :]:
            key = stripped[stripped.index("<") + 1 : stripped.index(">", stripped.index("<"))]
            out[key] = ""
        elif key is not None:
            if not stripped:
                key = None
            else:
                out[key] = (out[key] + "\n" + stripped) if out[key] else stripped
    return out


def _smiles(handle) -> Iterator[Record]:
    """'SMILES id [name]' per line: tab-separated fields when the line has tabs (an id may then
    hold spaces), else words. A CXSMILES block (|...|) after the SMILES belongs to it."""
    position = 0
    for number, line in enumerate(handle, start=1):
        text = line.strip()
        if not text or text.startswith("#"):
            continue
        if "\t" in text:
            fields = [f.strip() for f in text.split("\t")]
        else:
            fields = text.split()
        structure, rest = fields[0], fields[1:]
        if rest and rest[0].startswith("|"):  # CXSMILES extensions, perhaps with spaces inside
            words = text.split(None, 1)[1]
            close = words.find("|", 1)
            structure = f"{structure} {words[: close + 1]}" if close > 0 else structure
            rest = words[close + 1 :].split("\t" if "\t" in text else None) if close > 0 else []
            rest = [r.strip() for r in rest if r.strip()]
        if position == 0 and structure.lower() in ("smiles", "structure"):
            continue  # a header line
        position += 1
        record_id = rest[0] if rest else ""
        name = " ".join(rest[1:]) or None
        yield Record(position, number, record_id or f"record {position}", structure, None, name, None, not record_id)


def _table(handle, delimiter: str, id_column, structure_column, name_column) -> Iterator[Record]:
    csv.field_size_limit(2**31 - 1)  # a molfile in a cell is longer than the default 128 kB
    reader = csv.reader(handle, delimiter=delimiter)
    try:
        header = next(reader)
    except StopIteration:
        return
    columns = {h.strip().lower(): i for i, h in enumerate(header)}

    def find(wanted: str | None, guesses: tuple[str, ...], what: str, required: bool) -> int | None:
        if wanted is not None:
            if wanted.lower() not in columns:
                raise UsageError(f"no column {wanted!r} for the {what}; the columns are {', '.join(header)}")
            return columns[wanted.lower()]
        for guess in guesses:
            if guess in columns:
                return columns[guess]
        if required:
            raise UsageError(
                f"no column for the {what} (tried {', '.join(guesses)}); the columns are {', '.join(header)}"
            )
        return None

    s = find(structure_column, _STRUCTURE_COLUMNS, "structure", True)
    i = find(id_column, ("id", "compound_id", "registry_id", "regno"), "id", False)
    n = find(name_column, _NAME_COLUMNS, "name", False)
    position = 0
    start = reader.line_num + 1
    for row in reader:
        first_line, start = start, reader.line_num + 1  # a quoted cell may span lines
        if not any(cell.strip() for cell in row):
            continue
        position += 1

        def cell(k: int | None, row: list[str] = row) -> str:
            return row[k].strip() if k is not None and k < len(row) else ""

        record_id = cell(i)
        problem = (
            None
            if s is not None and s < len(row)
            else f"the row has {len(row)} cells; the structure is in column {s + 1 if s is not None else '?'}"
        )
        yield Record(position, first_line, record_id or f"record {position}", cell(s), None, cell(n) or None, problem,
                     not record_id)  # fmt: skip


class Registry:
    """Registered structures keyed by id, for checking drawings against them. Indexed once in an
    SQLite file (not held in memory), so a registry of millions costs disk, not memory."""

    def __init__(self, path: str | os.PathLike, index: str | os.PathLike, kind: str | None = None, id_field=None):
        index = Path(index)
        index.unlink(missing_ok=True)
        self.path = str(path)
        self._db = sqlite3.connect(str(index))
        self._db.execute("DROP TABLE IF EXISTS registry")
        self._db.execute("CREATE TABLE registry (id TEXT PRIMARY KEY, text TEXT, format TEXT, position INTEGER)")
        duplicates: list[str] = []
        with self._db:
            for record in iter_records(path, kind, id_field):
                if record.anonymous:
                    continue  # a made-up id ('record N') must not meet another file's made-up id
                try:
                    self._db.execute(
                        "INSERT INTO registry VALUES (?, ?, ?, ?)",
                        (record.id, record.text, record.format, record.position),
                    )
                except sqlite3.IntegrityError:
                    duplicates.append(record.id)
        self.duplicates = tuple(duplicates)  # ids registered twice: the first entry is used

    def get(self, record_id: str) -> tuple[str, str | None] | None:
        row = self._db.execute("SELECT text, format FROM registry WHERE id = ?", (record_id,)).fetchone()
        return None if row is None else (row[0], row[1])

    def close(self) -> None:
        self._db.close()
