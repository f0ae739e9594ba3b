"""Benchmark: `chairdraw batch` on real-world records against RDKit's flat SVG of the same records.

    python bench/batch.py [--n 1000] [--big 5000] [--subset 200]

Records: compounds of RDKit's NCI sample (RDConfig.RDDataDir/NCI/first_5K.smi) with a saturated
six-membered ring, each with its stereoisomers enumerated (up to 64), written as a SMILES file.
Measured in the same run:

* baseline: per record, Chem.MolFromSmiles + Compute2DCoords + MolDraw2DSVG (RDKit's flat SVG),
  one process;
* chairdraw batch --jobs 1 (SVG): wall time per record, as a ratio to the baseline (target <= 1.0);
* the speed-up of --jobs 2 over --jobs 1;
* PNG and PDF: records per second on the first --subset records;
* peak memory (largest resident set of the batch and its workers) at --n and at --big records, in
  a fresh process each: it should stay flat as the input grows.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time

from rdkit import Chem, RDConfig
from rdkit.Chem import rdDepictor
from rdkit.Chem.Draw import rdMolDraw2D
from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

from chairdraw.batch import BatchOptions
from chairdraw.bulk import run_batch

RING = Chem.MolFromSmarts("[C;R;!a]1[C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a]1")


def records(n: int) -> list[str]:
    options = StereoEnumerationOptions(onlyUnassigned=True, maxIsomers=64, unique=True)
    out: list[str] = []
    with open(os.path.join(RDConfig.RDDataDir, "NCI", "first_5K.smi")) as handle:
        for line in handle:
            smiles, nsc = line.split()[:2]
            mol = Chem.MolFromSmiles(smiles)
            if mol is None or not mol.HasSubstructMatch(RING):
                continue
            for k, isomer in enumerate(EnumerateStereoisomers(mol, options=options)):
                out.append(f"{Chem.MolToSmiles(isomer)} NSC{nsc}-{k + 1}")
                if len(out) == n:
                    return out
    return out


def baseline(lines: list[str]) -> float:
    start = time.perf_counter()
    for line in lines:
        mol = Chem.MolFromSmiles(line.split()[0])
        if mol is None:
            continue
        rdDepictor.Compute2DCoords(mol)
        drawer = rdMolDraw2D.MolDraw2DSVG(300, 300)
        drawer.DrawMolecule(mol)
        drawer.FinishDrawing()
        drawer.GetDrawingText()
    return time.perf_counter() - start


def timed_batch(path: str, folder: str, formats: tuple[str, ...], jobs: int, pages: bool = True) -> float:
    start = time.perf_counter()
    run_batch(path, folder, BatchOptions(formats=formats, pages=pages), jobs=jobs)
    return time.perf_counter() - start


def peak_memory_mb(path: str, folder: str) -> float:
    """Largest resident set of `chairdraw batch --jobs 1` and its worker, in a fresh process."""
    probe = (
        "import resource, subprocess, sys; "
        "subprocess.run([sys.executable, '-m', 'chairdraw', 'batch', sys.argv[1], '--out', sys.argv[2], "
        "'--jobs', '1', '--quiet', '--fail-on', 'none'], check=True); "
        "print(resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss)"
    )
    done = subprocess.run([sys.executable, "-c", probe, path, folder], capture_output=True, text=True, check=True)
    return int(done.stdout.strip()) / 1024


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=1000)
    parser.add_argument("--big", type=int, default=5000)
    parser.add_argument("--subset", type=int, default=200)
    args = parser.parse_args(argv)
    lines = records(max(args.n, args.big))
    small = lines[: args.n]
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "records.smi")
        with open(path, "w") as handle:
            handle.write("\n".join(small) + "\n")
        base = baseline(small)
        one = timed_batch(path, os.path.join(tmp, "j1"), ("svg",), 1)
        two = timed_batch(path, os.path.join(tmp, "j2"), ("svg",), 2)
        bare = timed_batch(path, os.path.join(tmp, "j1b"), ("svg",), 1, pages=False)
        n = len(small)
        print(f"{n} records from the NCI sample (stereoisomers enumerated)")
        print(f"  RDKit flat SVG            {base / n * 1000:8.2f} ms per record")
        print(
            f"  chairdraw batch --jobs 1  {one / n * 1000:8.2f} ms per record   ratio {one / base:5.2f} x (target <= 1.0)"
        )
        print(
            f"  chairdraw batch --jobs 2  {two / n * 1000:8.2f} ms per record   speed-up {one / two:4.2f} x over --jobs 1"
        )
        print(f"  --jobs 1 --no-figures-pdf {bare / n * 1000:8.2f} ms per record   ratio {bare / base:5.2f} x")
        sub = os.path.join(tmp, "subset.smi")
        with open(sub, "w") as handle:
            handle.write("\n".join(small[: args.subset]) + "\n")
        for kind in ("png", "pdf"):
            spent = timed_batch(sub, os.path.join(tmp, kind), (kind,), 1)
            print(f"  {kind.upper()} (--jobs 1, {args.subset} records)   {args.subset / spent:8.1f} records per s")
        big = os.path.join(tmp, "big.smi")
        with open(big, "w") as handle:
            handle.write("\n".join(lines[: args.big]) + "\n")
        m_small = peak_memory_mb(path, os.path.join(tmp, "m1"))
        m_big = peak_memory_mb(big, os.path.join(tmp, "m2"))
        print(
            f"  peak memory --jobs 1: {m_small:6.0f} MB at {n} records, {m_big:6.0f} MB at {min(len(lines), args.big)} records"
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
