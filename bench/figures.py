"""Benchmark: analysis plus the SVG of both chairs, against RDKit's flat SVG of the same molecules.

    python bench/figures.py [--n N] [--repeats R]

Molecules: the stereo-defined examples of bench/analyze.py plus the first N (default 100) usable
NCI-sample molecules with their stereo assigned (one configuration per ring). Per molecule, median
over R passes (default 3), measured in the same run:

* baseline: Chem.MolFromSmiles + Compute2DCoords + MolDraw2DSVG(300, 300) (RDKit's flat depiction);
* chairdraw: chairdraw.draw(smiles).svg() (parsing, analysis, layout, SVG).

Target: chairdraw / baseline <= 1.0. PNG and PDF rates (cairosvg) are printed as well.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import time

sys.path.insert(0, os.path.dirname(__file__))

import analyze as bench_analyze  # noqa: E402

import chairdraw  # noqa: E402
import chairdraw.render.export  # noqa: E402

TARGET = 1.0


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=100)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args(argv)
    molecules, _, _, _ = bench_analyze.select(args.n, chairdraw.analyze)
    smiles = bench_analyze.assigned([s for _, s in molecules])
    smiles = [s for s in smiles if chairdraw.analyze(s).rings]
    n = len(smiles)

    def figure(s):
        return chairdraw.draw(s).svg()

    for s in smiles:  # warm-up: font outlines and group look-ups are cached on first use
        figure(s)
    base, ours = [], []
    for _ in range(args.repeats):
        base.append(bench_analyze.one_pass(bench_analyze.baseline_one, smiles))
        ours.append(bench_analyze.one_pass(figure, smiles))
    b = statistics.median(base) / n * 1000
    o = statistics.median(ours) / n * 1000
    # per molecule: the mean above is dominated by a few large, crowded molecules (two linked
    # sugar rings drawn at several sizes); the median says what a typical figure costs
    per_base, per_ours = [], []
    for s in smiles:
        start = time.perf_counter()
        bench_analyze.baseline_one(s)
        per_base.append(time.perf_counter() - start)
        start = time.perf_counter()
        figure(s)
        per_ours.append(time.perf_counter() - start)
    med_b = statistics.median(per_base) * 1000
    med_o = statistics.median(per_ours) * 1000
    p90 = sorted(per_ours)[int(0.9 * n)] * 1000
    svgs = [figure(s) for s in smiles[:30]]
    start = time.perf_counter()
    for svg in svgs:
        chairdraw.render.export.render(svg, "png", 300)
    png = (time.perf_counter() - start) / len(svgs) * 1000
    start = time.perf_counter()
    for svg in svgs:
        chairdraw.render.export.render(svg, "pdf")
    pdf = (time.perf_counter() - start) / len(svgs) * 1000
    print(f"molecules: {n} (stereo assigned)")
    print(f"baseline (RDKit parse + 2D coords + flat SVG): {b:.2f} ms/molecule")
    print(f"chairdraw (analysis + layout + chair SVG):     {o:.2f} ms/molecule")
    print(
        f"per molecule, median: baseline {med_b:.2f} ms, chairdraw {med_o:.2f} ms (ratio {med_o / med_b:.1f}); chairdraw 90th percentile {p90:.1f} ms"
    )
    print(f"PNG at 300 dpi: {png:.1f} ms/figure; PDF: {pdf:.1f} ms/figure (cairosvg)")
    ratio = o / b
    print(f"ratio chairdraw/baseline: {ratio:.2f}  (target <= {TARGET}: {'met' if ratio <= TARGET else 'NOT met'})")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
