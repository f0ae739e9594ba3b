"""A whole compound list -> a folder: figures, report.jsonl and report.csv (one row per record, in
input order), figures.pdf (every figure, one per page) and index.html (a self-contained page).

``run_batch`` streams the input through ``batch.run_rows`` and writes each row as it arrives, so
memory does not grow with the input. With ``resume=True`` a rerun keeps the rows of records whose
files are all there (written through temporary names, so a file that exists is whole) and redoes
the rest, provided the options are the same as before.
"""

from __future__ import annotations

import base64
import collections
import csv
import html
import json
import os
import time
from collections.abc import Callable, Iterator
from dataclasses import asdict, dataclass
from pathlib import Path

from .batch import MISSING, BatchOptions, Row, Task, run_rows, safe_stem
from .errors import InputError, UsageError
from .records import Registry, iter_records, kind_of
from .report import DISCLAIMER
from .verify import CAVEAT

CSV_COLUMNS = (
    "position", "line", "id", "name", "status", "stage", "message", "rings", "favored_chair",
    "delta_g_kcal_mol", "populations", "warnings", "verdict", "differing_centers", "files",
)  # fmt: skip
FAIL_ON = ("any", "error", "mismatch", "none")


@dataclass(frozen=True)
class Summary:
    rows: int
    by_status: dict
    by_verdict: dict
    seconds: float
    reused: int
    folder: str
    failed: int  # rows counted as failures under the chosen --fail-on
    registry_duplicates: tuple[str, ...] = ()  # ids registered twice (the first entry was used)
    figures_pdf: bool = False

    def to_dict(self) -> dict:
        return asdict(self)


def count_records(path, kind: str | None = None) -> int | None:
    """How many records a file holds, by a quick streaming pass (for the progress estimate)."""
    kind = kind_of(path, kind)
    try:
        with open(path, encoding="utf-8", errors="replace") as handle:
            if kind == "sdf":
                n, content = 0, False
                for line in handle:
                    if line.rstrip() == "$$$$":
                        n, content = n + 1, False
                    elif line.strip():
                        content = True
                return n + content
            lines = sum(1 for line in handle if line.strip() and not line.startswith("#"))
            return max(0, lines - (1 if kind in ("csv", "tsv") else 0))
    except OSError:
        return None


def run_batch(
    source: str | os.PathLike,
    out: str | os.PathLike,
    options: BatchOptions | None = None,
    jobs: int = 1,
    resume: bool = False,
    registry: str | os.PathLike | None = None,
    kind: str | None = None,
    id_field: str | None = None,
    structure_column: str | None = None,
    name_column: str | None = None,
    registry_kind: str | None = None,
    fail_on: str = "any",
    progress: Callable[[int, int | None, float], None] | None = None,
    registry_id_field: str | None = None,
) -> Summary:
    options = options or BatchOptions()
    if fail_on not in FAIL_ON:
        raise UsageError(f"--fail-on must be one of {', '.join(FAIL_ON)}, not {fail_on!r}")
    kind = kind_of(source, kind)
    for path in (source, registry):
        if path is not None and not os.path.isfile(path):
            raise InputError(f"cannot open {str(path)!r}: no such file")
    folder = Path(out)
    work = folder / ".work"
    try:
        work.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise UsageError(f"cannot make the output folder {str(folder)!r}: {exc.strerror}") from None
    started = time.perf_counter()
    # what the rows depend on: an edited input or registry, other columns or options: nothing kept
    fingerprint = json.dumps(
        {
            "options": repr(options),
            "source": _file_state(source),
            "registry": _file_state(registry) if registry is not None else None,
            "reading": [kind, id_field, structure_column, name_column, registry_kind, registry_id_field],
        },
        sort_keys=True,
    )
    previous = _previous_rows(folder, fingerprint) if resume else iter(())
    (work / "options.json").write_text(fingerprint, encoding="utf-8")
    for stale in ("figures.pdf", "index.html", "report.csv"):  # written anew at the end, or not at all
        (folder / stale).unlink(missing_ok=True)
    index = Registry(registry, work / "registry.sqlite", registry_kind, registry_id_field) if registry else None
    total = count_records(source, kind)
    reused = 0

    def tasks() -> Iterator[Task | Row]:
        nonlocal reused
        taken: set[str] = set(RESERVED)
        old = next(previous, None)
        for record in iter_records(source, kind, id_field, structure_column, name_column):
            stem = safe_stem(record.id, taken)
            while old is not None and old.position < record.position:  # both files are in input order
                old = next(previous, None)
            if (
                old is not None
                and old.position == record.position
                and old.id == record.id
                and _complete(old, folder, options)
            ):
                reused += 1
                yield old
                continue
            registered = None
            if index is not None:
                registered = (None if record.anonymous else index.get(record.id)) or ("", MISSING)
            yield (record, stem, registered)

    by_status: collections.Counter = collections.Counter()
    by_verdict: collections.Counter = collections.Counter()
    failed = 0
    n = 0
    try:
        with open(folder / "report.jsonl", "w", encoding="utf-8") as report:
            for row in run_rows(tasks(), str(folder), options, jobs):
                report.write(json.dumps(row.to_dict(), ensure_ascii=False) + "\n")
                report.flush()
                n += 1
                by_status[row.status] += 1
                if row.verdict is not None:
                    by_verdict[row.verdict] += 1
                failed += _failed(row, fail_on, index is not None)
                if progress is not None:
                    progress(n, total, started)
    finally:
        duplicates = index.duplicates if index is not None else ()
        if index is not None:
            index.close()
        (work / "previous.jsonl").unlink(missing_ok=True)
    write_csv(folder)
    if options.pages:
        write_pdf(folder)
    write_index(folder)
    return Summary(
        n, dict(by_status), dict(by_verdict), time.perf_counter() - started, reused, str(folder), failed,
        tuple(duplicates), (folder / "figures.pdf").exists(),
    )  # fmt: skip


RESERVED = {
    "figures", "report", "index", "con", "prn", "aux", "nul",
    *(f"com{k}" for k in range(1, 10)), *(f"lpt{k}" for k in range(1, 10)),
}  # fmt: skip  # our own outputs, and names Windows refuses


def _file_state(path) -> list:
    stat = os.stat(path)
    return [os.path.abspath(path), stat.st_size, stat.st_mtime_ns]


def _failed(row: Row, fail_on: str, checking: bool) -> int:
    if fail_on == "none":
        return 0
    bad_row = row.status != "ok"
    # in a check run, a record that could not be checked (no registered structure) is a mismatch
    mismatch = checking and ((row.status != "error" and row.verdict != "match") or row.stage == "registry")
    if fail_on == "error":
        return int(row.status == "error")
    if fail_on == "mismatch":
        return int(mismatch)
    return int(bad_row or mismatch)


def _previous_rows(folder: Path, fingerprint: str) -> Iterator[Row]:
    """Rows of an earlier run with the same options and input, in input order, read one at a time
    (the old report is moved aside first, since the new one is written in its place)."""
    try:
        if (folder / ".work" / "options.json").read_text(encoding="utf-8") != fingerprint:
            return iter(())
        os.replace(folder / "report.jsonl", folder / ".work" / "previous.jsonl")
    except OSError:
        return iter(())
    return _read_rows(folder / ".work" / "previous.jsonl")


def _read_rows(path: Path) -> Iterator[Row]:
    with open(path, encoding="utf-8") as handle:
        for line in handle:
            try:
                yield Row.from_dict(json.loads(line))
            except (ValueError, KeyError, TypeError):
                return  # a line cut short by the interruption: everything after it is redone


def _complete(row: Row, folder: Path, options: BatchOptions) -> bool:
    if row.status == "error" and row.stage in ("timeout", "worker"):
        return False  # these may go through another time
    files = dict(row.files)
    if row.status == "ok" and not set(options.formats) <= files.keys():
        return False
    return all((folder / name).is_file() for name in files.values())


def rows_of(folder: str | os.PathLike) -> Iterator[Row]:
    return _read_rows(Path(folder) / "report.jsonl")


def csv_cells(row: Row) -> dict:
    first = row.rings[0] if row.rings else {}
    return {
        "position": row.position,
        "line": row.line,
        "id": row.id,
        "name": row.name or "",
        "status": row.status,
        "stage": row.stage,
        "message": row.message,
        "rings": len(row.rings),
        "favored_chair": first.get("favored_chair") or "",
        "delta_g_kcal_mol": first.get("delta_g_kcal_mol", ""),
        "populations": " / ".join(first.get("populations", [])),
        "warnings": "; ".join(row.warnings),
        "verdict": row.verdict or "",
        "differing_centers": "; ".join(row.differing_centers),
        "files": " ".join(name for kind, name in row.files if kind != "page"),
    }


def write_csv(folder: str | os.PathLike) -> None:
    path = Path(folder) / "report.csv"
    with open(path.with_name("report.csv.part"), "w", encoding="utf-8", newline="") as handle:
        writer = csv.DictWriter(handle, fieldnames=CSV_COLUMNS)
        writer.writeheader()
        for row in rows_of(folder):
            writer.writerow({k: v if k == "files" else _no_formula(v) for k, v in csv_cells(row).items()})
    os.replace(path.with_name("report.csv.part"), path)


def _no_formula(value):
    """A spreadsheet runs a cell starting with = + - @ as a formula: an id from the input must not."""
    if isinstance(value, str) and value[:1] in ("=", "+", "-", "@"):
        return "'" + value
    return value


def write_pdf(folder: str | os.PathLike) -> None:
    """figures.pdf: the figure of every ok record, one per page, in input order (written page by
    page: render/pdfset.py)."""
    from .render.pdfset import write_pdf_set

    folder = Path(folder)

    def pages() -> Iterator[Path]:
        for row in rows_of(folder):
            page = dict(row.files).get("page")
            if page and (folder / page).is_file():
                yield folder / page

    part = folder / "figures.pdf.part"
    if write_pdf_set(pages(), part):
        os.replace(part, folder / "figures.pdf")
    else:
        part.unlink()


def write_index(folder: str | os.PathLike) -> None:
    """index.html: every record with its figure (embedded) and key numbers. Everything that comes
    from the input is escaped, so an id or a label holding markup stays text."""
    folder = Path(folder)
    part = folder / "index.html.part"

    def e(text: str) -> str:  # escaped, and control characters (NUL ...) shown as U+FFFD
        return html.escape("".join(c if c >= " " or c in "\n\t" else "\ufffd" for c in str(text)))

    with open(part, "w", encoding="utf-8") as out:
        out.write(_HEAD)
        for row in rows_of(folder):
            files = dict(row.files)
            out.write(f'<section class="{e(row.status)}"><h2>{e(row.id)}</h2>\n')
            if row.name:
                out.write(f"<p>{e(row.name)}</p>\n")
            facts = [f"record {row.position} (line {row.line})", row.status]
            for ring in row.rings:
                pops = " / ".join(ring.get("populations", []))
                facts.append(f"{ring['kind']}: {ring.get('favored_chair') or 'no preference'}, "
                             f"ΔG {ring['delta_g_kcal_mol']} kcal/mol ({pops} %)")  # fmt: skip
            if row.verdict:
                facts.append(
                    f"check: {row.verdict}"
                    + (f" at {', '.join(row.differing_centers)}" if row.differing_centers else "")
                )
            if row.status == "error":
                facts.append(f"{row.stage}: {row.message}")
            elif row.status == "no-chair-ring":
                facts.append(row.message)
            out.write("<ul>" + "".join(f"<li>{e(f)}</li>" for f in facts) + "</ul>\n")
            image = _embedded(folder, files)
            if image:
                out.write(f'<img alt="chairs of {e(row.id)}" src="{image}">\n')
            for w in row.warnings:
                out.write(f'<p class="warning">{e(w)}</p>\n')
            out.write("</section>\n")
        out.write(f"<footer><p>{e(DISCLAIMER)}</p><p>{e(CAVEAT)}</p></footer>\n</body></html>\n")
    os.replace(part, folder / "index.html")


def _embedded(folder: Path, files: dict) -> str | None:
    for kind, mime in (("svg", "image/svg+xml"), ("png", "image/png")):
        name = files.get(kind)
        if name and (folder / name).is_file():
            return f"data:{mime};base64," + base64.b64encode((folder / name).read_bytes()).decode("ascii")
    return None


_HEAD = """<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>chairdraw figures</title>
<style>
body { font-family: sans-serif; margin: 2em; max-width: 60em; }
section { border-top: 1px solid #999; padding: 0.5em 0; }
section.error h2::after { content: " (error)"; font-weight: normal; }
img { max-width: 100%; }
.warning { font-size: 0.9em; }
</style></head><body>
<h1>chairdraw figures</h1>
"""


def summary_lines(summary: Summary) -> list[str]:
    from .batch import elapsed_text

    lines = [
        f"{summary.rows} records in {elapsed_text(summary.seconds)}"
        + (f" ({summary.reused} kept from the earlier run)" if summary.reused else "")
        + f"; report{', figures.pdf' if summary.figures_pdf else ''} and index.html in {summary.folder}",
        "  status: " + ", ".join(f"{k} {v}" for k, v in sorted(summary.by_status.items())),
    ]
    if summary.by_verdict:
        lines.append("  verdicts: " + ", ".join(f"{k} {v}" for k, v in sorted(summary.by_verdict.items())))
    if summary.registry_duplicates:
        shown = ", ".join(summary.registry_duplicates[:5]) + (" ..." if len(summary.registry_duplicates) > 5 else "")
        lines.append(
            f"  registry: {len(summary.registry_duplicates)} id(s) registered twice, the first entry used: {shown}"
        )
    return lines
