"""Command line: argument parsing and printing only.

Exit codes: 0 ok, 1 a check found a mismatch (later commands), 2 bad input or usage.
"""

from __future__ import annotations

import argparse
import io
import json
import os
import sys
from collections.abc import Sequence

from . import __version__
from .analyze import FORCEFIELD_MODES, SOLVENTS, Analyzer
from .batch import BatchOptions, elapsed_text
from .bulk import FAIL_ON, run_batch, summary_lines
from .chairmol import chair_molblock
from .demo import demo_drawings, demo_records, demo_registry
from .errors import ChairdrawError, FigureError, UsageError
from .figure import draw_analysis
from .read import FORMATS, read, read_text
from .records import KINDS
from .render.export import TYPES, check_dpi, output_type
from .render.style import CHAIRS, HYDROGENS, Style, load_style
from .report import DISCLAIMER, check_line, format_analysis, format_check, summary_line
from .verify import CAVEAT, Checker

OK, MISMATCH, BAD_INPUT = 0, 1, 2
INTERRUPTED = 130  # the shell's code for a run stopped by Ctrl-C


class _Parser(argparse.ArgumentParser):
    def error(self, message: str):  # argparse exits with 2 too; we keep it to one line
        print(f"chairdraw: usage: {message} (see '{self.prog} --help')", file=sys.stderr)
        raise SystemExit(BAD_INPUT)


def _parser() -> argparse.ArgumentParser:
    p = _Parser(prog="chairdraw", description="Chair conformations of six-membered rings from flat structures.")
    p.add_argument("--version", action="version", version=f"chairdraw {__version__}")
    sub = p.add_subparsers(dest="command", required=True, parser_class=_Parser)

    def energy_options(q: argparse.ArgumentParser) -> None:
        q.add_argument("--temperature", type=float, default=298.15, metavar="K", help="temperature in K (298.15)")
        q.add_argument("--solvent", choices=SOLVENTS, default="aprotic", help="solvent class for A-values")
        q.add_argument("--units", choices=("kcal", "kJ"), default=None, help="energy units (kcal)")
        q.add_argument("--json", action="store_true", help="print one JSON object per structure")
        q.add_argument(
            "--forcefield",
            choices=FORCEFIELD_MODES,
            default="auto",
            help="MMFF94 comparison of the two chairs: auto (where a group is estimated), always, never",
        )

    a = sub.add_parser("analyze", help="analyse one structure: both chairs, energies, populations")
    a.add_argument("input", help="SMILES, CXSMILES, InChI, a molfile/SDF path, or - for standard input")
    a.add_argument("--format", choices=FORMATS, help="override format sniffing")
    energy_options(a)

    def figure_options(q: argparse.ArgumentParser) -> None:
        q.add_argument("--dpi", type=float, default=300.0, help="PNG resolution (300)")
        q.add_argument(
            "--chair", choices=CHAIRS, default="both", help="both chairs, the favoured one, or the other one"
        )
        q.add_argument(
            "--hydrogens", choices=HYDROGENS, default=None, help="H atoms drawn: none, on stereocentres, all"
        )
        q.add_argument("--numbering", action="store_true", help="ring locants beside their atoms")
        q.add_argument("--show-flat", action="store_true", help="the flat input (wedges, hashes) beside the chairs")
        q.add_argument("--style", metavar="FILE.toml", help="style settings (sizes in pt) from a TOML file")
        q.add_argument("--bond-length", type=float, metavar="PT", help="bond length in pt (14.4)")
        q.add_argument("--line-width", type=float, metavar="PT", help="line width in pt (0.6)")
        q.add_argument("--font-size", type=float, metavar="PT", help="label font size in pt (10)")
        q.add_argument(
            "--font",
            metavar="FILE.ttf",
            help="a TrueType/OpenType font file for all text (default: the shipped Liberation Sans)",
        )

    w = sub.add_parser("draw", help="draw both chairs of each ring as SVG, PNG or PDF")
    w.add_argument("input", help="SMILES, CXSMILES, InChI, a molfile/SDF path, or - for standard input")
    w.add_argument("-o", "--output", required=True, metavar="FILE", help="figure file: .svg, .png or .pdf")
    w.add_argument("--format", choices=FORMATS, help="override format sniffing")
    w.add_argument("--ring", type=int, metavar="N", help="draw only ring result N (0-based, in report order)")
    w.add_argument("--caption", help="text under the figure")
    w.add_argument(
        "--molfile",
        metavar="CHAIR.mol",
        help="also write the chair as drawn (favoured, or --chair flip) as a 2D molfile",
    )
    figure_options(w)
    energy_options(w)

    c = sub.add_parser("check", help="does a chair drawing show the registered stereoisomer?")
    c.add_argument("drawing", help="the chair drawing: a molfile or SDF path (first record), or - for standard input")
    c.add_argument(
        "--against",
        required=True,
        metavar="REGISTERED",
        help="the registered structure: SMILES, CXSMILES, InChI, or a molfile/SDF path",
    )
    energy_options(c)

    b = sub.add_parser("batch", help="figures and reports for a whole compound list (SDF, SMILES file, CSV/TSV)")
    b.add_argument("input", help="an SDF, a SMILES file (SMILES and id per line), or a CSV/TSV with named columns")
    b.add_argument("--out", required=True, metavar="DIR", help="output folder (made if missing)")
    b.add_argument("--formats", default="svg", metavar="LIST", help="figure types, comma-separated: svg,png,pdf (svg)")
    b.add_argument("--jobs", type=int, default=os.cpu_count() or 1, metavar="N", help="worker processes (all cores)")
    b.add_argument(
        "--against", metavar="REGISTRY", help="check each record's drawing against this registry (SDF/CSV/SMILES by id)"
    )
    b.add_argument("--resume", action="store_true", help="keep the finished records of an interrupted run")
    b.add_argument("--quiet", action="store_true", help="no progress and no summary")
    b.add_argument("--fail-on", choices=FAIL_ON, default="any", help="what makes the exit code 1 (any)")
    b.add_argument("--input-kind", choices=KINDS, help="the input's kind, when its name does not say")
    b.add_argument("--registry-kind", choices=KINDS, help="the registry's kind, when its name does not say")
    b.add_argument("--id-field", metavar="NAME", help="SDF data field or CSV column holding the id (title line / 'id')")
    b.add_argument(
        "--structure-column", metavar="NAME", help="CSV column holding the structure (smiles/structure/molfile)"
    )
    b.add_argument("--name-column", metavar="NAME", help="CSV column with a name or caption (name/caption)")
    b.add_argument(
        "--timeout", type=float, default=120.0, metavar="S", help="seconds per record before it is an error (120)"
    )
    b.add_argument(
        "--registry-id-field", metavar="NAME", help="SDF data field or CSV column holding the registry's ids"
    )
    b.add_argument(
        "--no-figures-pdf",
        action="store_true",
        help="skip figures.pdf (each record's PDF page costs about as much as the rest of its work)",
    )
    figure_options(b)
    energy_options(b)

    d = sub.add_parser("demo", help="analyse the built-in demo set")
    d.add_argument("--full", action="store_true", help="full report for every record, not one line each")
    d.add_argument("--out", metavar="DIR", help="also write each record's figure (SVG and PNG) into DIR")
    figure_options(d)
    energy_options(d)
    return p


def _style(args) -> Style:
    style = load_style(args.style) if args.style else Style()
    return style.replace(
        bond_length=args.bond_length,
        line_width=args.line_width,
        font_size=args.font_size,
        font_file=args.font,
        hydrogens=args.hydrogens,
        units=args.units,
        numbering=args.numbering or None,
    )


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        analyzer = Analyzer(args.temperature, args.solvent, args.forcefield)
        if args.command == "analyze":
            return _analyze(args, analyzer)
        if args.command == "draw":
            return _draw(args, analyzer)
        if args.command == "check":
            return _check(args, analyzer)
        if args.command == "batch":
            return _batch(args)
        return _demo(args, analyzer)
    except ChairdrawError as exc:
        print(f"chairdraw: {exc}", file=sys.stderr)
        return BAD_INPUT
    except BrokenPipeError:
        # the reader went away (`chairdraw demo | head -3`): stop quietly, and keep Python from
        # complaining again when it flushes stdout at exit
        try:
            os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        except (OSError, ValueError, io.UnsupportedOperation):
            pass
        return OK


def _quoted(text: str, width: int = 40) -> str:
    """A structure given on the command line, as an error message names it."""
    text = " ".join(text.encode("utf-8", "surrogateescape").decode("utf-8", "replace").split())
    return repr(text if len(text) <= width else text[: width - 1] + "…")


def _read_and_analyze(args, analyzer: Analyzer):
    try:
        if args.input == "-":
            structure = read_text(sys.stdin.read(), format=args.format, source="stdin")
        else:
            structure = read(args.input, format=args.format)
        return analyzer.analyze(structure)
    except ChairdrawError as exc:
        raise exc.with_record(_quoted(args.input)) from None


def _draw(args, analyzer: Analyzer) -> int:
    style = _style(args)
    output_type(args.output)  # a bad file name or dpi is a usage error before any work
    check_dpi(args.dpi)
    result = _read_and_analyze(args, analyzer)
    try:
        figure = draw_analysis(result, style, args.chair, args.ring, args.caption, args.show_flat)
        figure.save(args.output, dpi=args.dpi)
        if args.molfile:
            block = chair_molblock(result, args.ring or 0, "flip" if args.chair == "flip" else "favored", style)
            _write_text(args.molfile, block)
    except ChairdrawError as exc:
        raise exc.with_record(_quoted(args.input)) from None
    print(f"wrote {args.output} ({figure.width:.0f} x {figure.height:.0f} pt)", file=sys.stderr)
    print(DISCLAIMER, file=sys.stderr)
    return OK


def _write_text(path: str, text: str) -> None:
    try:
        with open(path, "w", encoding="utf-8") as handle:
            handle.write(text)
    except OSError as exc:
        raise FigureError(f"cannot write {path!r}: {exc.strerror}") from None


def _analyze(args, analyzer: Analyzer) -> int:
    result = _read_and_analyze(args, analyzer)
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
    else:
        print(format_analysis(result, args.units or "kcal"))
        print()
        print(DISCLAIMER)
    return OK


def _check(args, analyzer: Analyzer) -> int:
    try:
        drawing = read_text(sys.stdin.read(), source="stdin") if args.drawing == "-" else read(args.drawing)
    except ChairdrawError as exc:
        raise exc.with_record(_quoted(args.drawing)) from None
    try:
        registered = read(args.against)
    except ChairdrawError as exc:
        raise exc.with_record(_quoted(args.against)) from None
    result = Checker(analyzer).check(drawing, registered)
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
    else:
        print(format_check(result))
        print()
        print(CAVEAT)
    return OK if result.ok else MISMATCH


def _batch(args) -> int:
    formats = tuple(dict.fromkeys(f.strip().lower() for f in args.formats.split(",") if f.strip()))
    unknown = [f for f in formats if f not in TYPES]
    if unknown or not formats:
        raise UsageError(f"--formats takes svg, png and pdf, comma-separated; not {args.formats!r}")
    if args.jobs < 1:
        raise UsageError(f"--jobs must be 1 or more, not {args.jobs}")
    if not 0 < args.timeout <= 86400:
        raise UsageError(f"--timeout must be more than 0 and at most 86400 seconds, not {args.timeout:g}")
    options = BatchOptions(
        formats=formats,
        temperature=args.temperature,
        solvent=args.solvent,
        forcefield="never" if args.forcefield == "auto" else args.forcefield,
        style=_style(args),
        dpi=check_dpi(args.dpi),
        timeout=args.timeout,
        chairs=args.chair,
        show_flat=args.show_flat,
        pages=not args.no_figures_pdf,
    )
    progress = None if args.quiet else _Progress(sys.stderr)
    try:
        summary = run_batch(
            args.input, args.out, options, args.jobs, args.resume, args.against, args.input_kind, args.id_field,
            args.structure_column, args.name_column, args.registry_kind, args.fail_on, progress,
            args.registry_id_field,
        )  # fmt: skip
    except KeyboardInterrupt:
        if progress is not None:
            progress.finish()
        print(f"chairdraw: batch interrupted; rerun with --resume to keep what {args.out} holds", file=sys.stderr)
        return INTERRUPTED
    if progress is not None:
        progress.finish()
        for line in summary_lines(summary):
            print(line, file=sys.stderr)
        print(DISCLAIMER, file=sys.stderr)
    return MISMATCH if summary.failed else OK


class _Progress:
    """A bar with rate and ETA on a terminal; a plain line every few seconds otherwise."""

    EVERY = 5.0

    def __init__(self, stream):
        self.stream = stream
        self.tty = stream.isatty()
        self.last = 0.0

    def __call__(self, done: int, total: int | None, started: float) -> None:
        import time

        now = time.perf_counter()
        spent = max(now - started, 1e-9)
        rate = done / spent
        left = f", ETA {elapsed_text((total - done) / rate)}" if total and rate > 0 and total >= done else ""
        of = f"/{total}" if total else ""
        if self.tty:
            share = done / total if total else 0.0
            bar = "#" * int(30 * share) + "-" * (30 - int(30 * share))
            self.stream.write(f"\r[{bar}] {done}{of} {rate:.1f}/s{left} ")
            self.stream.flush()
        elif now - self.last >= self.EVERY or (total and done == total):
            self.last = now
            print(f"{done}{of} records, {rate:.1f}/s{left}", file=self.stream)

    def finish(self) -> None:
        if self.tty:
            self.stream.write("\n")


def _demo(args, analyzer: Analyzer) -> int:
    rows = []
    style = _style(args)
    check_dpi(args.dpi)
    if args.out:
        try:
            os.makedirs(args.out, exist_ok=True)
        except OSError as exc:
            raise FigureError(f"cannot make the gallery directory {args.out!r}: {exc.strerror}") from None
    for smiles, record in demo_records():
        result = analyzer.analyze(read(smiles, record=record))
        if args.out and result.rings:
            figure = draw_analysis(result, style, args.chair, caption=record, show_flat=args.show_flat)
            stem = "".join(c if c.isalnum() or c in "-_" else "_" for c in record.split()[0])
            for kind in ("svg", "png"):
                figure.save(os.path.join(args.out, f"{stem}.{kind}"), dpi=args.dpi)
        if args.json:
            rows.append(result.to_dict())
        elif args.full:
            print(format_analysis(result, args.units or "kcal"))
            print()
        else:
            print(summary_line(result, args.units or "kcal"))
    if args.json:  # the analyses only: one schema per JSON output (`chairdraw check --json` has its own)
        print(json.dumps(rows, indent=2, ensure_ascii=False))
    else:
        checker = Checker(analyzer)
        registry = demo_registry()
        print()
        print("Chair drawings from the group's figure drafts, checked against the registry:")
        for record, block, drawn in demo_drawings():
            print(check_line(checker.check(block, registry[record]), drawn))
        print()
        print(DISCLAIMER)
        print(CAVEAT)
    return OK


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
