"""Benchmark: chairdraw.analyze against drawing the molecule with RDKit.

    python bench/analyze.py [--n N] [--repeats R] [--profile] [--forcefield auto|always|never]

Molecules: the first N molecules (default 300) of RDKit's shipped NCI sample
(RDConfig.RDDataDir/NCI/first_5K.smi) that have a saturated six-membered ring and that chairdraw
analyses without error, plus a fixed list of stereo-defined examples.

Measured in the same run, per molecule, median over R passes (default 3) after the selection pass,
which runs every molecule through both once and so doubles as the warm-up (chairdraw caches its
group look-ups, as a batch run over many molecules would):

* baseline: Chem.MolFromSmiles + rdDepictor.Compute2DCoords + rdMolDraw2D.MolDraw2DSVG(300, 300)
  DrawMolecule / FinishDrawing / GetDrawingText (what any depiction of the molecule costs);
* analysis: chairdraw.analyze(smiles), parsing included, library defaults (``--forcefield`` passes
  that option on, for versions of chairdraw that have it). The identity strings (InChI and SMILES
  of the input and of each enumerated configuration) are computed on first use, so a second line
  times analyze(smiles).to_dict() as well, which computes them and builds the JSON;
* the same two, on the same molecules with their stereo assigned (the first stereoisomer RDKit's
  EnumerateStereoisomers gives, as a registry holds compounds): one configuration per ring
  instead of every relative configuration of the open centres.

Target: analysis / baseline <= 0.5 (on the molecules as shipped). With --profile, the top 10 functions of one analysis pass by
cumulative time (cProfile).
"""

from __future__ import annotations

import argparse
import cProfile
import io
import os
import pstats
import statistics
import sys
import time

from rdkit import Chem, RDConfig
from rdkit.Chem import rdDepictor
from rdkit.Chem.Draw import rdMolDraw2D
from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

import chairdraw
from chairdraw import ChairdrawError

NCI = os.path.join(RDConfig.RDDataDir, "NCI", "first_5K.smi")
TARGET = 0.5

# stereo-defined examples (ring stereo fully specified)
FIXED = [
    ("beta-D-glucopyranose", "OC[C@H]1O[C@@H](O)[C@H](O)[C@@H](O)[C@@H]1O"),
    ("alpha-D-glucopyranose", "OC[C@H]1O[C@H](O)[C@H](O)[C@@H](O)[C@@H]1O"),
    ("cis-1,2-dimethylcyclohexane", "C[C@H]1CCCC[C@H]1C"),
    ("trans-1,2-dimethylcyclohexane", "C[C@H]1CCCC[C@@H]1C"),
    ("cis-1,3-dimethylcyclohexane", "C[C@H]1CCC[C@@H](C)C1"),
    ("trans-1,4-dimethylcyclohexane", "C[C@H]1CC[C@H](C)CC1"),
    ("trans-4-methylcyclohexanol", "C[C@H]1CC[C@H](O)CC1"),
    ("cis-4-tert-butylcyclohexanol", "CC(C)(C)[C@H]1CC[C@@H](O)CC1"),
    ("(-)-menthol", "CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O"),
    ("cis-1,4-di-tert-butylcyclohexane", "CC(C)(C)[C@H]1CC[C@@H](C(C)(C)C)CC1"),
    ("trans-4-aminocyclohexanecarboxylic acid", "N[C@H]1CC[C@H](C(=O)O)CC1"),
    ("methyl beta-D-glucopyranoside", "CO[C@@H]1O[C@H](CO)[C@@H](O)[C@H](O)[C@H]1O"),
]


def has_saturated_six_ring(mol: Chem.Mol) -> bool:
    for ring in mol.GetRingInfo().AtomRings():
        if len(ring) != 6:
            continue
        if any(mol.GetAtomWithIdx(a).GetIsAromatic() for a in ring):
            continue
        bonds = [mol.GetBondBetweenAtoms(ring[k], ring[(k + 1) % 6]) for k in range(6)]
        if all(b.GetBondType() == Chem.BondType.SINGLE for b in bonds):
            return True
    return False


def select(n: int, analyse) -> tuple[list[tuple[str, str]], dict[str, int], list[tuple[float, str, str]], list[str]]:
    """First n usable NCI molecules plus the fixed list.

    Returns the molecules, counts of what was skipped and why, (seconds, name, SMILES) of the
    selection-pass analysis of every kept molecule, and the crashes (exceptions that are not
    ChairdrawError: library bugs)."""
    if not os.path.exists(NCI):
        sys.exit(f"bench: RDKit data file not found: {NCI}")
    counts = {
        "read": 0,
        "unparsable": 0,
        "no saturated 6-ring": 0,
        "chairdraw error": 0,
        "chairdraw crash": 0,
        "no ring analysed": 0,
    }
    chosen: list[tuple[str, str]] = []
    seconds: list[tuple[float, str, str]] = []
    crashes: list[str] = []
    with open(NCI, encoding="utf-8") as handle:
        for line in handle:
            if len(chosen) >= n:
                break
            parts = line.split()
            if not parts:
                continue
            counts["read"] += 1
            smiles = parts[0]
            name = f"NCI {parts[1]}" if len(parts) > 1 else f"NCI line {counts['read']}"
            mol = Chem.MolFromSmiles(smiles)
            if mol is None:
                counts["unparsable"] += 1
                continue
            if not has_saturated_six_ring(mol):
                counts["no saturated 6-ring"] += 1
                continue
            start = time.perf_counter()
            try:
                result = analyse(smiles)
            except ChairdrawError:
                counts["chairdraw error"] += 1
                continue
            except Exception as exc:  # not one of chairdraw's errors: a bug, reported below
                counts["chairdraw crash"] += 1
                crashes.append(f"{name} {smiles}: {type(exc).__name__}: {exc}")
                continue
            elapsed = time.perf_counter() - start
            if not result.rings:
                counts["no ring analysed"] += 1
                continue
            chosen.append((name, smiles))
            seconds.append((elapsed, name, smiles))
            if len(chosen) % 50 == 0:
                print(
                    f"  selected {len(chosen)}/{n} ({sum(t for t, _, _ in seconds):.1f} s of analysis)",
                    file=sys.stderr,
                    flush=True,
                )
    counts["kept from NCI"] = len(chosen)
    for name, smiles in FIXED:
        start = time.perf_counter()
        analyse(smiles)  # must work: these are the project's own examples
        seconds.append((time.perf_counter() - start, name, smiles))
    for _, smiles in chosen + FIXED:
        baseline_one(smiles)
    return chosen + FIXED, counts, seconds, crashes


def baseline_one(smiles: str) -> str:
    mol = Chem.MolFromSmiles(smiles)
    rdDepictor.Compute2DCoords(mol)
    drawer = rdMolDraw2D.MolDraw2DSVG(300, 300)
    drawer.DrawMolecule(mol)
    drawer.FinishDrawing()
    return drawer.GetDrawingText()


def assigned(smiles_list: list[str]) -> list[str]:
    """Each molecule with its open stereo assigned: RDKit's first enumerated stereoisomer."""
    options = StereoEnumerationOptions(onlyUnassigned=True, maxIsomers=1, unique=True)
    out = []
    for smiles in smiles_list:
        mol = Chem.MolFromSmiles(smiles)
        first = next(iter(EnumerateStereoisomers(mol, options=options)), mol)
        out.append(Chem.MolToSmiles(first))
    return out


def one_pass(func, smiles_list: list[str]) -> float:
    start = time.perf_counter()
    for smiles in smiles_list:
        func(smiles)
    return time.perf_counter() - start


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=300, help="molecules from the NCI sample (300)")
    parser.add_argument("--repeats", type=int, default=3, help="timed passes per measurement (3)")
    parser.add_argument("--profile", action="store_true", help="cProfile top 10 (cumulative) of one analysis pass")
    parser.add_argument("--forcefield", help="pass forcefield=... to chairdraw.analyze (default: library default)")
    parser.add_argument("--slowest", type=int, default=5, help="list the slowest molecules (5)")
    args = parser.parse_args(argv)

    options = {} if args.forcefield is None else {"forcefield": args.forcefield}

    def analyse(smiles: str):
        return chairdraw.analyze(smiles, **options)

    molecules, counts, seconds, crashes = select(args.n, analyse)
    smiles_list = [s for _, s in molecules]
    n = len(smiles_list)
    print(f"data: {NCI}")
    print("selection: " + ", ".join(f"{k} {v}" for k, v in counts.items()) + f"; fixed examples {len(FIXED)}")
    print(
        f"molecules timed: {n}; RDKit {Chem.rdBase.rdkitVersion}; chairdraw {chairdraw.__version__}; options {options}"
    )
    for line in crashes:
        print(f"CRASH (not a ChairdrawError): {line}")

    def with_json(smiles: str):
        return analyse(smiles).to_dict()

    def spread(times: list[float]) -> str:
        return f"{min(times) / n * 1000:.3f}-{max(times) / n * 1000:.3f}"

    ratio = 0.0
    for title, data in (("as shipped", smiles_list), ("stereo assigned", assigned(smiles_list))):
        base_times, ana_times, json_times = [], [], []
        for _ in range(args.repeats):  # interleaved, so that drift affects all alike
            base_times.append(one_pass(baseline_one, data))
            ana_times.append(one_pass(analyse, data))
            json_times.append(one_pass(with_json, data))
        base = statistics.median(base_times) / n * 1000
        ana = statistics.median(ana_times) / n * 1000
        full = statistics.median(json_times) / n * 1000
        configurations = sum(len(analyse(smiles).rings) for smiles in data)
        print(
            f"\nmolecules {title} ({configurations} ring configurations analysed, {configurations / n:.1f} per molecule):"
        )
        print(f"  baseline (parse + 2D coords + SVG 300x300): {base:.3f} ms/molecule (range {spread(base_times)})")
        print(f"  chairdraw.analyze (incl. parsing):          {ana:.3f} ms/molecule (range {spread(ana_times)})")
        print(f"  analyze + to_dict (identities, JSON):       {full:.3f} ms/molecule (range {spread(json_times)})")
        print(f"  ratios: analysis/baseline {ana / base:.2f}, with identities and JSON {full / base:.2f}")
        if title == "as shipped":
            ratio = ana / base
    print(
        f"\nratio analysis/baseline (as shipped): {ratio:.2f}  (target <= {TARGET}: {'met' if ratio <= TARGET else 'NOT met'})"
    )
    per_molecule = sorted(t for t, _, _ in seconds)
    print(
        f"selection pass, analysis per molecule: median {statistics.median(per_molecule) * 1000:.2f} ms, "
        f"max {per_molecule[-1] * 1000:.1f} ms; total {sum(per_molecule):.2f} s"
    )
    if args.slowest:
        print(f"slowest {args.slowest} (selection pass):")
        for t, name, smiles in sorted(seconds, reverse=True)[: args.slowest]:
            print(f"  {t * 1000:9.1f} ms  {name}  {smiles}")

    if args.profile:
        profiler = cProfile.Profile()
        profiler.enable()
        one_pass(analyse, smiles_list)
        profiler.disable()
        out = io.StringIO()
        pstats.Stats(profiler, stream=out).sort_stats("cumulative").print_stats(10)
        print(f"\ncProfile, one analysis pass over {n} molecules, top 10 by cumulative time:")
        print(out.getvalue())
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
