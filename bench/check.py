"""Benchmark: checking chair drawings against their registered structures.

    python bench/check.py [--n N] [--repeats R]

Drawings: for the stereo-defined examples of bench/analyze.py and the first N (default 150)
usable NCI-sample molecules with their stereo assigned, the chair molfile of each chair of the
first ring (so a few hundred drawings), each checked against the molecule's SMILES. Measured in
the same run, median over R passes (default 3):

* baseline: Chem.MolFromMolBlock of the same drawings (RDKit parsing alone);
* chairdraw: chairdraw.check(drawing, smiles) (parsing both, perception, verdict, favoured chair).

Printed: checks per second, and the ratio chairdraw / baseline per drawing. The verdict counts are
printed too: every drawing here is of its own registered structure, so all should be 'match'.
"""

from __future__ import annotations

import argparse
import collections
import os
import statistics
import sys
import time

sys.path.insert(0, os.path.dirname(__file__))

import analyze as bench_analyze  # noqa: E402
from rdkit import Chem  # noqa: E402

import chairdraw  # noqa: E402
from chairdraw.chairmol import chair_molblock  # noqa: E402


def drawings(n: int) -> list[tuple[str, str]]:
    """(molfile of a chair drawing, SMILES it should match)."""
    molecules, _, _, _ = bench_analyze.select(n, chairdraw.analyze)
    out = []
    for smiles in bench_analyze.assigned([s for _, s in molecules]):
        analysis = chairdraw.analyze(smiles)
        if not analysis.rings or analysis.rings[0].configuration is not None:
            continue
        for which in ("favored", "flip"):
            out.append((chair_molblock(analysis, chair=which), smiles))
    return out


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=150)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args(argv)
    cases = drawings(args.n)
    n = len(cases)
    checker = chairdraw.Checker()
    verdicts = collections.Counter(checker.check(block, smiles).verdict for block, smiles in cases)  # warm-up

    def baseline() -> float:
        start = time.perf_counter()
        for block, _ in cases:
            Chem.MolFromMolBlock(block, removeHs=False)
        return time.perf_counter() - start

    def ours() -> float:
        start = time.perf_counter()
        for block, smiles in cases:
            checker.check(block, smiles)
        return time.perf_counter() - start

    base = statistics.median(baseline() for _ in range(args.repeats))
    mine = statistics.median(ours() for _ in range(args.repeats))
    print(f"{n} drawings ({args.repeats} passes, median)")
    print(f"  RDKit MolFromMolBlock   {base / n * 1000:8.3f} ms per drawing  ({n / base:8.0f} per s)")
    print(f"  chairdraw check         {mine / n * 1000:8.3f} ms per drawing  ({n / mine:8.0f} per s)")
    print(f"  ratio chairdraw / RDKit parsing: {mine / base:.1f} x")
    print("  verdicts: " + ", ".join(f"{k} {v}" for k, v in sorted(verdicts.items())))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
