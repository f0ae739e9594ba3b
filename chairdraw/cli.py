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
from .demo import demo_records
from .errors import ChairdrawError
from .read import FORMATS, read, read_text
from .report import DISCLAIMER, format_analysis, summary_line

OK, MISMATCH, BAD_INPUT = 0, 1, 2


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
        q.add_argument("--units", choices=("kcal", "kJ"), default="kcal", help="energy units of the text report")
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

    d = sub.add_parser("demo", help="analyse the built-in demo set")
    d.add_argument("--full", action="store_true", help="full report for every record, not one line each")
    energy_options(d)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        analyzer = Analyzer(args.temperature, args.solvent, args.forcefield)
        if args.command == "analyze":
            return _analyze(args, analyzer)
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


def _analyze(args, analyzer: Analyzer) -> int:
    try:
        if args.input == "-":
            structure = read_text(sys.stdin.read(), format=args.format, source="stdin")
        else:
            structure = read(args.input, format=args.format)
        result = analyzer.analyze(structure)
    except ChairdrawError as exc:
        raise exc.with_record(_quoted(args.input)) from None
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
    else:
        print(format_analysis(result, args.units))
        print()
        print(DISCLAIMER)
    return OK


def _demo(args, analyzer: Analyzer) -> int:
    rows = []
    for smiles, record in demo_records():
        result = analyzer.analyze(read(smiles, record=record))
        if args.json:
            rows.append(result.to_dict())
        elif args.full:
            print(format_analysis(result, args.units))
            print()
        else:
            print(summary_line(result, args.units))
    if args.json:
        print(json.dumps(rows, indent=2, ensure_ascii=False))
    else:
        print()
        print(DISCLAIMER)
    return OK


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
