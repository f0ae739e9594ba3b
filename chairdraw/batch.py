"""Many records -> one row each, whatever happens, in input order; figures written as it goes.

``process_record`` is the whole work for one record and a pure function of the record and the
options (it reads nothing else and writes only that record's own files), so it can run in any
worker: here a pool of processes (``run``), elsewhere a distributed engine (DEVELOPERS.md).

A record that fails becomes an error row naming the stage and the problem; a worker that crashes
or hangs costs only the records it held: the run goes on with a fresh pool, and each record of the
broken batch is retried alone so that the one that crashed is named.
"""

from __future__ import annotations

import collections
import os
import signal
import time
import unicodedata
from collections.abc import Iterator
from concurrent.futures import Future, ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass, field
from pathlib import Path

from .analyze import Analyzer
from .errors import ChairdrawError, UsageError
from .records import Record
from .render.style import Style

STATUSES = ("ok", "no-chair-ring", "error")
MISSING = "missing"  # the format given for a registered structure the registry does not hold
MAX_STEM = 80


@dataclass(frozen=True)
class BatchOptions:
    """Everything the per-record work depends on (besides the record itself)."""

    formats: tuple[str, ...] = ("svg",)
    temperature: float = 298.15
    solvent: str = "aprotic"
    forcefield: str = "never"
    style: Style = field(default_factory=Style)
    dpi: float = 300.0
    timeout: float = 120.0  # seconds per record
    pages: bool = True  # also a PDF page per record for figures.pdf
    chairs: str = "both"
    show_flat: bool = False


@dataclass(frozen=True)
class Row:
    """The outcome of one record: exactly one per input record."""

    position: int
    line: int
    id: str
    status: str  # ok, no-chair-ring, error
    stage: str = ""  # for errors: read, rings, faces, energy, figure, check, worker, timeout ...
    message: str = ""
    rings: tuple[dict, ...] = ()  # per ring: kind, favoured chair, ΔG, populations
    warnings: tuple[str, ...] = ()
    verdict: str | None = None
    differing_centers: tuple[str, ...] = ()
    files: tuple[tuple[str, str], ...] = ()  # (format, file name in the output folder)
    name: str | None = None

    def to_dict(self) -> dict:
        return {
            "position": self.position,
            "line": self.line,
            "id": self.id,
            "name": self.name,
            "status": self.status,
            "stage": self.stage,
            "message": self.message,
            "rings": list(self.rings),
            "warnings": list(self.warnings),
            "verdict": self.verdict,
            "differing_centers": list(self.differing_centers),
            "files": dict(self.files),
        }

    @classmethod
    def from_dict(cls, d: dict) -> Row:
        return cls(
            d["position"], d["line"], d["id"], d["status"], d["stage"], d["message"], tuple(d["rings"]),
            tuple(d["warnings"]), d["verdict"], tuple(d["differing_centers"]), tuple(d["files"].items()), d["name"],
        )  # fmt: skip


def safe_stem(record_id: str, taken: set[str]) -> str:
    """A file name for an id: letters, digits, '-', '_' and '.' only, no leading dot, at most
    MAX_STEM characters, unique (case-insensitively, for case-blind file systems) among ``taken``."""
    text = unicodedata.normalize("NFKD", record_id).encode("ascii", "ignore").decode("ascii")
    stem = "".join(c if c.isalnum() or c in "-_." else "_" for c in text).strip("._-") or "record"
    stem = stem[:MAX_STEM]
    candidate, n = stem, 1
    while candidate.lower() in taken:
        n += 1
        candidate = f"{stem}-{n}"
    taken.add(candidate.lower())
    return candidate


class _Timeout(Exception):
    pass


def _alarm(signum, frame):
    raise _Timeout()


def process_record(
    record: Record, stem: str, folder: str, options: BatchOptions, registered: tuple[str, str | None] | None
) -> Row:
    """Everything for one record: read, analyse, draw, check. Never raises."""
    use_alarm = options.timeout > 0 and hasattr(signal, "SIGALRM")
    if use_alarm:
        previous = signal.signal(signal.SIGALRM, _alarm)
        signal.setitimer(signal.ITIMER_REAL, options.timeout)
    try:
        return _work(record, stem, folder, options, registered)
    except _Timeout:
        return _error(record, "timeout", f"took longer than {options.timeout:g} s")
    except ChairdrawError as exc:
        return _error(record, exc.stage, exc.message + (f" ({exc.detail.strip()})" if exc.detail else ""))
    except Exception as exc:  # a bug of ours or RDKit's: still one row, and the run goes on
        return _error(record, "internal", f"{type(exc).__name__}: {exc}")
    finally:
        if use_alarm:
            signal.setitimer(signal.ITIMER_REAL, 0)
            signal.signal(signal.SIGALRM, previous)


def _error(record: Record, stage: str, message: str) -> Row:
    return Row(record.position, record.line, record.id, "error", stage, " ".join(message.split()), name=record.name)


def _work(record: Record, stem: str, folder: str, options: BatchOptions, registered) -> Row:
    from .figure import draw_analysis
    from .read import read_molblock, read_text
    from .render.export import render
    from .report import percent

    if record.problem:
        return _error(record, "read", record.problem)
    if not record.text.strip():
        return _error(record, "read", "the record has no structure")
    structure = (
        read_molblock(record.text, record=record.id)
        if record.format == "molfile"
        else read_text(record.text, record.format, record=record.id)
    )
    analysis = Analyzer(options.temperature, options.solvent, options.forcefield).analyze(structure)
    verdict: str | None = None
    centres: tuple[str, ...] = ()
    warnings: list[str] = list(analysis.notes)
    if registered is not None:
        from .verify import check

        text, kind = registered
        if kind == MISSING:
            return _error(record, "registry", f"no registered structure with the id {record.id!r}")
        try:
            reg = read_molblock(text) if kind == "molfile" else read_text(text, kind)
        except ChairdrawError as exc:
            return _error(record, "registry", f"the registered structure cannot be read: {exc.message}")
        result = check(structure, reg)
        verdict = result.verdict
        centres = tuple(c.where for c in result.differing_centers)
        warnings += list(result.warnings)
    rings = tuple(
        {
            "kind": r.kind,
            "configuration": r.configuration.label if r.configuration is not None else None,
            "atoms": list(r.atoms),
            "favored_chair": r.favored.name if r.favored else None,
            "delta_g_kcal_mol": round(r.delta_g_kcal_mol, 2),
            "populations": [percent(c.population) for c in r.chairs],
        }
        for r in analysis.rings
    )
    for r in analysis.rings:
        warnings += list(r.warnings)
    if not analysis.rings:
        reasons = "; ".join(dict.fromkeys(f.reason for f in analysis.refused)) or "no six-membered ring"
        return Row(record.position, record.line, record.id, "no-chair-ring", "rings", reasons, (), tuple(warnings),
                   verdict, centres, name=record.name)  # fmt: skip
    caption = f"{record.id} {record.name}" if record.name else record.id
    figure = draw_analysis(analysis, options.style, options.chairs, caption=caption, show_flat=options.show_flat)
    svg = figure.svg()
    files = []
    for kind in options.formats:
        name = f"{stem}.{kind}"
        _atomic_write(Path(folder) / name, render(svg, kind, options.dpi, (figure.width, figure.height)))
        files.append((kind, name))
    if options.pages:
        page = Path(folder) / ".work" / "pages" / f"{stem}.pdf"
        if "pdf" in options.formats:
            page = Path(folder) / f"{stem}.pdf"
        else:
            _atomic_write(page, render(svg, "pdf"))
        files.append(("page", str(page.relative_to(folder))))
    return Row(record.position, record.line, record.id, "ok", "", "", rings, tuple(dict.fromkeys(warnings)), verdict,
               centres, tuple(files), record.name)  # fmt: skip


def _atomic_write(path: Path, data: bytes) -> None:
    """Write through a temporary name, so that a file that exists is whole (``--resume`` trusts it)."""
    path.parent.mkdir(parents=True, exist_ok=True)
    temp = path.with_name(path.name + ".part")
    temp.write_bytes(data)
    os.replace(temp, path)


# --- running many ---------------------------------------------------------------------------------


Task = tuple[Record, str, tuple[str, str | None] | None]  # record, stem, registered structure


def run_rows(tasks: Iterator[Task | Row], folder: str, options: BatchOptions, jobs: int = 1) -> Iterator[Row]:
    """Rows of ``tasks`` in input order, from ``jobs`` worker processes (jobs=0: in this process).
    A finished Row among the tasks (kept by ``--resume``) passes through in its place."""
    if jobs < 0:
        raise UsageError(f"--jobs must be 0 or more, not {jobs}")
    if jobs == 0:
        for item in tasks:
            yield item if isinstance(item, Row) else process_record(item[0], item[1], folder, options, item[2])
        return
    window = max(2, jobs * 4)
    pending: collections.deque[tuple[Task | Row, Future]] = collections.deque()
    pool = ProcessPoolExecutor(max_workers=jobs, initializer=_worker_start)
    try:
        source = iter(tasks)
        exhausted = False
        while True:
            while not exhausted and len(pending) < window:
                task = next(source, None)
                if task is None:
                    exhausted = True
                    break
                if isinstance(task, Row):
                    done: Future = Future()
                    done.set_result(task)
                    pending.append((task, done))
                else:
                    pending.append((task, pool.submit(process_record, task[0], task[1], folder, options, task[2])))
            if not pending:
                break
            task, future = pending[0]
            try:
                row = future.result(timeout=options.timeout + 60 if options.timeout > 0 else None)
            except (BrokenProcessPool, TimeoutError) as exc:
                _stop(pool)
                stuck = [t for t, _ in pending]
                pending.clear()
                for t in stuck:  # alone, each in a fresh worker: the one that breaks it is named
                    yield t if isinstance(t, Row) else _alone(t, folder, options, exc)
                pool = ProcessPoolExecutor(max_workers=jobs, initializer=_worker_start)
                continue
            pending.popleft()
            yield row
    finally:
        _stop(pool)


def _worker_start() -> None:
    """Ctrl-C is the main process's to handle: it stops the pool; a worker would only print."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _alone(task: Task, folder: str, options: BatchOptions, cause: BaseException) -> Row:
    record, stem, registered = task
    single = ProcessPoolExecutor(max_workers=1, initializer=_worker_start)
    try:
        return single.submit(process_record, record, stem, folder, options, registered).result(
            timeout=options.timeout + 60 if options.timeout > 0 else None
        )
    except BrokenProcessPool:
        return _error(record, "worker", "the worker process died while handling this record (a crash in a library)")
    except TimeoutError:
        return _error(record, "timeout", f"no answer from the worker after {options.timeout + 60:g} s")
    finally:
        _stop(single)


def _stop(pool: ProcessPoolExecutor) -> None:
    """Shut a pool down without waiting for a worker that hangs."""
    processes = list(getattr(pool, "_processes", {}).values())
    pool.shutdown(wait=False, cancel_futures=True)
    for p in processes:
        if p.is_alive():
            p.kill()
    for p in processes:
        p.join(timeout=5)


def elapsed_text(seconds: float) -> str:
    seconds = int(round(seconds))
    if seconds < 60:
        return f"{seconds}s"
    if seconds < 3600:
        return f"{seconds // 60}m{seconds % 60:02d}s"
    return f"{seconds // 3600}h{seconds % 3600 // 60:02d}m"


def rate_text(done: int, started: float) -> str:
    spent = max(time.perf_counter() - started, 1e-9)
    return f"{done / spent:.1f}/s"
