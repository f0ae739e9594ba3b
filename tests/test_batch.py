"""Bulk runs: one row per input record whatever happens, safe file names, resume, workers."""

from __future__ import annotations

import csv
import json
import os
import xml.etree.ElementTree as ET

import jsonschema
import pytest
from pypdf import PdfReader
from rdkit import Chem, RDConfig
from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

import chairdraw.batch
from chairdraw.batch import BatchOptions, safe_stem
from chairdraw.bulk import run_batch
from chairdraw.chairmol import chair_molblock
from chairdraw.cli import main
from chairdraw.records import iter_records
from chairdraw.schema import load

GOOD = "C[C@H]1CC[C@@H](O)CC1"


def _block(smiles: str, title: str) -> str:
    mol = Chem.MolFromSmiles(smiles)
    Chem.rdDepictor.Compute2DCoords(mol)
    mol.SetProp("_Name", title)
    return Chem.MolToMolBlock(mol)


def _mixed_sdf(path) -> list[str]:
    """Good, broken and ringless records; returns their titles in order."""
    good = _block(GOOD, "CPD-1")
    unknown = _block("C1CCCCC1C", "CPD-2 unknown element").replace(" C   0", " Xx  0", 1)
    truncated = _block("C1CCCCC1O", "CPD-3 truncated").split("M  END")[0][:120]
    lines = _block("C1CCCCC1N", "CPD-4 bad bond line").splitlines()
    counts = lines[3]
    first_bond = 4 + int(counts[:3])
    lines[first_bond] = "  1 99  1  0"  # a bond to atom 99 that does not exist
    bad_bond = "\n".join(lines) + "\n"
    ringless = _block("CCCCO", "CPD-5 no ring")
    chair = chair_molblock(chairdraw.analyze(chairdraw.read("CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O", record="CPD-6")))
    records = [good, unknown, truncated, bad_bond, ringless, chair]
    path.write_text("".join(r if r.endswith("\n") else r + "\n" for r in [records[0]]) + "$$$$\n"
                    + "$$$$\n".join(r if r.endswith("\n") else r + "\n" for r in records[1:]) + "$$$$\n")  # fmt: skip
    return ["CPD-1", "CPD-2 unknown element", "CPD-3 truncated", "CPD-4 bad bond line", "CPD-5 no ring", "CPD-6"]


def _rows(folder) -> list[dict]:
    with open(folder / "report.jsonl", encoding="utf-8") as handle:
        return [json.loads(line) for line in handle]


def test_every_record_gives_one_row_even_broken_ones(tmp_path):
    sdf = tmp_path / "mixed.sdf"
    titles = _mixed_sdf(sdf)
    summary = run_batch(sdf, tmp_path / "out", BatchOptions(formats=("svg", "pdf")), jobs=1)
    rows = _rows(tmp_path / "out")
    assert [r["id"] for r in rows] == titles
    assert [r["position"] for r in rows] == list(range(1, 7))
    status = {r["id"]: (r["status"], r["stage"]) for r in rows}
    assert status["CPD-1"] == ("ok", "")
    assert status["CPD-2 unknown element"] == ("error", "read")
    assert status["CPD-3 truncated"] == ("error", "read")
    assert status["CPD-4 bad bond line"] == ("error", "read")
    assert status["CPD-5 no ring"][0] == "no-chair-ring"
    assert status["CPD-6"] == ("ok", "")
    assert "Xx" in rows[1]["message"] and "99" in rows[3]["message"]
    schema = load("batch-row")
    for row in rows:
        jsonschema.validate(row, schema)
    with open(tmp_path / "out" / "report.csv", encoding="utf-8", newline="") as handle:
        assert [r["id"] for r in csv.DictReader(handle)] == titles
    assert len(PdfReader(str(tmp_path / "out" / "figures.pdf")).pages) == 2
    assert summary.rows == 6 and summary.by_status == {"ok": 2, "error": 3, "no-chair-ring": 1}
    assert summary.failed == 4


HOSTILE = ["../x", "<script>alert(1)</script>", "a" * 300, "α-D-Glc/1 \u2013 é", "CON", "dup", "DUP", ".hidden", ""]


def test_hostile_ids_are_safe_in_files_svg_and_html(tmp_path):
    smi = tmp_path / "hostile.smi"
    smi.write_text("smiles id\n" + "".join(f"{GOOD} {i}\n" if i else f"{GOOD}\n" for i in HOSTILE), encoding="utf-8")
    run_batch(smi, tmp_path / "out", BatchOptions(formats=("svg",)), jobs=1)
    out = tmp_path / "out"
    rows = _rows(out)
    assert len(rows) == len(HOSTILE)
    names = [r["files"]["svg"] for r in rows]
    assert len({n.lower() for n in names}) == len(names)  # unique, also on case-blind file systems
    for name in names:
        assert "/" not in name and "\\" not in name and not name.startswith(".") and len(name) <= 90
        assert (out / name).resolve().parent == out.resolve()
        ET.parse(out / name)  # still valid XML with the id in its title
    assert not (tmp_path / "x.svg").exists()
    page = (out / "index.html").read_text(encoding="utf-8")
    assert "<script>" not in page and "&lt;script&gt;" in page
    assert [r["id"] for r in rows][1] == "<script>alert(1)</script>"


def test_safe_stem_rules():
    taken: set[str] = set()
    assert safe_stem("../../etc/passwd", taken) == "etc_passwd"
    assert safe_stem("WLW-0101", taken) == "WLW-0101"
    assert safe_stem("wlw-0101", taken) == "wlw-0101-2"
    assert safe_stem("", taken) == "record"


def test_formula_like_ids_are_not_formulas_in_the_csv(tmp_path):
    smi = tmp_path / "f.smi"
    smi.write_text(f"{GOOD} =HYPERLINK(1)\n", encoding="utf-8")
    run_batch(smi, tmp_path / "out", jobs=1)
    text = (tmp_path / "out" / "report.csv").read_text(encoding="utf-8")
    assert "'=HYPERLINK(1)" in text
    assert _rows(tmp_path / "out")[0]["id"] == "=HYPERLINK(1)"  # the JSON keeps it as it is


def _nci(n: int) -> list[str]:
    """SMILES of NCI sample compounds with a saturated six-membered ring, stereo enumerated
    (two isomers each at most): real-world input shipped inside RDKit's wheel."""
    options = StereoEnumerationOptions(onlyUnassigned=True, maxIsomers=2, unique=True)
    ring = Chem.MolFromSmarts("[C;R;!a]1[C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a][C,N,O;R;!a]1")
    out = []
    with open(os.path.join(RDConfig.RDDataDir, "NCI", "first_5K.smi")) as handle:
        for line in handle:
            mol = Chem.MolFromSmiles(line.split()[0])
            if mol is None or not mol.HasSubstructMatch(ring):
                continue
            for k, isomer in enumerate(EnumerateStereoisomers(mol, options=options)):
                out.append(f"{Chem.MolToSmiles(isomer)} NSC{line.split()[1]}-{k + 1}")
            if len(out) >= n:
                return out[:n]
    return out


def test_real_world_records_run_end_to_end_and_jobs_do_not_change_the_report(tmp_path):
    smi = tmp_path / "nci.smi"
    smi.write_text("\n".join(_nci(40)) + "\n")
    a = run_batch(smi, tmp_path / "one", BatchOptions(formats=("svg",)), jobs=1)
    b = run_batch(smi, tmp_path / "two", BatchOptions(formats=("svg",)), jobs=2)
    assert a.rows == b.rows == 40
    assert (tmp_path / "one" / "report.jsonl").read_bytes() == (tmp_path / "two" / "report.jsonl").read_bytes()
    assert a.by_status.get("ok", 0) >= 20, a.by_status


class _Stop(Exception):
    pass


def test_interrupted_and_resumed_run_gives_the_same_report(tmp_path):
    smi = tmp_path / "nci.smi"
    smi.write_text("\n".join(_nci(24)) + "\n")
    whole = tmp_path / "whole"
    run_batch(smi, whole, BatchOptions(formats=("svg", "png")), jobs=1)

    def stop_after(done, total, started):
        if done == 10:
            raise _Stop

    part = tmp_path / "part"
    with pytest.raises(_Stop):
        run_batch(smi, part, BatchOptions(formats=("svg", "png")), jobs=2, progress=stop_after)
    assert len(_rows(part)) == 10
    resumed = run_batch(smi, part, BatchOptions(formats=("svg", "png")), jobs=2, resume=True)
    assert resumed.reused >= 9  # the rows written before the stop, with their files
    assert (part / "report.jsonl").read_bytes() == (whole / "report.jsonl").read_bytes()
    assert (part / "report.csv").read_bytes() == (whole / "report.csv").read_bytes()
    pages = len(PdfReader(str(whole / "figures.pdf")).pages)
    assert len(PdfReader(str(part / "figures.pdf")).pages) == pages
    # other options: nothing is kept
    again = run_batch(smi, part, BatchOptions(formats=("svg",), temperature=250.0), jobs=1, resume=True)
    assert again.reused == 0


def _crashing_work(record, stem, folder, options, registered):
    if record.id == "boom":
        os._exit(3)  # a crash inside a library, as a worker would die
    if record.id == "slow":
        import time

        time.sleep(30)
    return _real_work(record, stem, folder, options, registered)


_real_work = chairdraw.batch._work


def test_a_crash_or_a_hang_costs_only_its_own_record(tmp_path, monkeypatch):
    # the workers are forked from this process, so they see the patched function
    monkeypatch.setattr(chairdraw.batch, "_work", _crashing_work)
    smi = tmp_path / "c.smi"
    smi.write_text(f"{GOOD} a\n{GOOD} boom\n{GOOD} b\n{GOOD} slow\n{GOOD} c\n")
    run_batch(smi, tmp_path / "out", BatchOptions(formats=("svg",), timeout=1.0), jobs=2)
    rows = {r["id"]: r for r in _rows(tmp_path / "out")}
    assert list(rows) == ["a", "boom", "b", "slow", "c"]
    assert rows["boom"]["status"] == "error" and rows["boom"]["stage"] == "worker"
    assert rows["slow"]["status"] == "error" and rows["slow"]["stage"] == "timeout"
    assert all(rows[k]["status"] == "ok" for k in "abc")


def test_checking_against_a_registry(tmp_path):
    from chairdraw.demo import demo_drawings, demo_registry

    sdf = tmp_path / "drawings.sdf"
    sdf.write_text(
        "".join(block + ("" if block.endswith("\n") else "\n") + "$$$$\n" for _, block, _ in demo_drawings())
    )
    registry = tmp_path / "registry.csv"
    entries = {k: v for k, v in demo_registry().items() if k != "WLW-0152"}  # one drawing left unregistered
    registry.write_text("id,smiles\n" + "".join(f"{k},{v}\n" for k, v in entries.items()))
    summary = run_batch(sdf, tmp_path / "out", BatchOptions(formats=("svg",)), jobs=1, registry=registry)
    rows = {r["id"]: r for r in _rows(tmp_path / "out")}
    assert rows["WLW-0101"]["verdict"] == "match"
    assert rows["WLW-0133"]["verdict"] == "diastereomer" and rows["WLW-0133"]["differing_centers"] == ["atom 8 (C4)"]
    assert rows["WLW-0161"]["verdict"] == "enantiomer"
    assert rows["WLW-0152"]["status"] == "error" and rows["WLW-0152"]["stage"] == "registry"
    assert summary.by_verdict["match"] >= 4
    assert summary.failed == 3  # diastereomer, enantiomer, unregistered


def test_csv_input_with_named_columns(tmp_path):
    table = tmp_path / "list.tsv"
    table.write_text("Compound_ID\tSMILES\tName\nX-1\t" + GOOD + "\tcis alcohol\nX-2\tC1CC\tbroken\n")
    records = list(iter_records(table))
    assert [(r.id, r.name) for r in records] == [("X-1", "cis alcohol"), ("X-2", "broken")]
    run_batch(table, tmp_path / "out", jobs=1)
    rows = _rows(tmp_path / "out")
    assert [r["status"] for r in rows] == ["ok", "error"]
    assert rows[1]["stage"] == "read"


def test_cli_batch(tmp_path, capsys):
    smi = tmp_path / "two.smi"
    smi.write_text(f"{GOOD} P-1\nCCCC P-2\n")
    assert main(["batch", str(smi), "--out", str(tmp_path / "o"), "--jobs", "1"]) == 1  # P-2 has no ring
    err = capsys.readouterr().err
    assert "2 records" in err and "no-chair-ring 1" in err and "ok 1" in err
    assert main(["batch", str(smi), "--out", str(tmp_path / "o"), "--jobs", "1", "--fail-on", "error", "--quiet"]) == 0
    assert capsys.readouterr().err == ""
    assert main(["batch", str(smi), "--out", str(tmp_path / "p"), "--jobs", "1", "--no-figures-pdf", "--quiet"]) == 1
    assert not (tmp_path / "p" / "figures.pdf").exists() and (tmp_path / "p" / "index.html").exists()
    assert main(["batch", str(smi), "--out", str(tmp_path / "o"), "--formats", "svg,gif"]) == 2
    assert "--formats" in capsys.readouterr().err
    assert main(["batch", str(tmp_path / "missing.smi"), "--out", str(tmp_path / "o")]) == 2
    assert main(["batch", str(tmp_path / "two.txt"), "--out", str(tmp_path / "o")]) == 2
    assert "kind" in capsys.readouterr().err


def test_the_figure_set_renders_each_page_as_its_own_pdf(tmp_path):
    """figures.pdf is written by our page copier: PDFium (an independent renderer) must draw
    every page exactly as it draws the record's own PDF."""
    import pypdfium2 as pdfium

    from chairdraw.render.pdfset import write_pdf_set

    smi = tmp_path / "nci.smi"
    smi.write_text("\n".join(_nci(12)) + "\n")
    run_batch(smi, tmp_path / "out", BatchOptions(formats=("pdf",)), jobs=1)
    pages = [tmp_path / "out" / r["files"]["pdf"] for r in _rows(tmp_path / "out") if r["status"] == "ok"]
    assert len(pages) >= 6
    merged = pdfium.PdfDocument(str(tmp_path / "out" / "figures.pdf"))
    assert len(merged) == len(pages) == len(PdfReader(str(tmp_path / "out" / "figures.pdf"), strict=True).pages)
    for k, page in enumerate(pages):
        own = pdfium.PdfDocument(str(page))[0].render(scale=1).to_pil()
        assert merged[k].render(scale=1).to_pil().tobytes() == own.tobytes(), page.name
    assert write_pdf_set([], tmp_path / "empty.pdf") == 0


def test_awkward_files_still_give_one_row_per_record(tmp_path):
    """Found in review: '$$$$ ' with a trailing blank, a byte-order mark, tab-separated ids with
    spaces and a CXSMILES block, a 200,000-character CSV cell."""
    block = _block(GOOD, "T1")
    sdf = tmp_path / "ws.sdf"
    sdf.write_text(
        block + "$$$$ \n" + block.replace("T1", "T2", 1) + "$$$$\t\n" + block.replace("T1", "T3", 1) + "$$$$\n"
    )
    assert [r.id for r in iter_records(sdf)] == ["T1", "T2", "T3"]
    table = tmp_path / "bom.csv"
    table.write_bytes("\ufeffsmiles,id\n".encode() + f"{GOOD},B1\n".encode())
    assert [(r.id, r.text) for r in iter_records(table)] == [("B1", GOOD)]
    smi = tmp_path / "tabs.smi"
    smi.write_text(f"{GOOD}\tCompound 1\tcis alcohol\n{GOOD} |&1:1,4| CX1 racemic\n")
    got = [(r.id, r.text, r.name) for r in iter_records(smi)]
    assert got == [("Compound 1", GOOD, "cis alcohol"), ("CX1", f"{GOOD} |&1:1,4|", "racemic")]
    huge = tmp_path / "huge.csv"
    huge.write_text("smiles,id\n" + "C" * 200_000 + ",H1\n" + f"{GOOD},H2\n")
    run_batch(huge, tmp_path / "h", jobs=1)
    assert [r["id"] for r in _rows(tmp_path / "h")] == ["H1", "H2"]


def test_output_names_and_stale_outputs(tmp_path):
    smi = tmp_path / "n.smi"
    smi.write_text(f"{GOOD} figures\n{GOOD} CON\n{GOOD} -1\n")
    run_batch(smi, tmp_path / "o", BatchOptions(formats=("svg", "pdf")), jobs=1)
    names = [r["files"]["pdf"] for r in _rows(tmp_path / "o")]
    assert names == ["figures-2.pdf", "CON-2.pdf", "1.pdf"]
    assert len(PdfReader(str(tmp_path / "o" / "figures.pdf")).pages) == 3
    bad = tmp_path / "bad.smi"
    bad.write_text("C1CC( X\n")
    run_batch(bad, tmp_path / "o", jobs=1)  # no ok record now: the old figure set must go
    assert not (tmp_path / "o" / "figures.pdf").exists()


def test_resume_redoes_records_after_the_input_changed(tmp_path):
    smi = tmp_path / "e.smi"
    smi.write_text(f"{GOOD} E1\nC1CC( E2\n")
    run_batch(smi, tmp_path / "o", jobs=1)
    assert [r["status"] for r in _rows(tmp_path / "o")] == ["ok", "error"]
    smi.write_text(f"{GOOD} E1\n{GOOD} E2\n")
    again = run_batch(smi, tmp_path / "o", jobs=1, resume=True)
    assert again.reused == 0 and [r["status"] for r in _rows(tmp_path / "o")] == ["ok", "ok"]


def test_registry_keys_made_up_ids_and_duplicates(tmp_path):
    drawing = chair_molblock(chairdraw.analyze(GOOD))
    lines = drawing.splitlines()
    untitled = "\n".join([""] + lines[1:]) + "\n"
    sdf = tmp_path / "d.sdf"
    sdf.write_text(untitled + "$$$$\n" + drawing.replace("chair", "R-7", 1) + "$$$$\n")
    reg = tmp_path / "reg.smi"
    reg.write_text(f"{GOOD}\nC[C@H]1CC[C@H](O)CC1 R-7\n{GOOD} R-7\n")  # an untitled line; R-7 twice
    summary = run_batch(sdf, tmp_path / "o", jobs=1, registry=reg, fail_on="mismatch")
    rows = _rows(tmp_path / "o")
    assert rows[0]["stage"] == "registry"  # 'record 1' is not the registry's untitled line 1
    assert rows[1]["verdict"] == "diastereomer"  # the first R-7 entry is the one used
    assert summary.registry_duplicates == ("R-7",)
    assert summary.failed == 2  # the unregistered record counts as a mismatch too
    fielded = tmp_path / "f.sdf"
    fielded.write_text(drawing.replace("M  END", "M  END\n>  <REGNO>\nQ-1\n", 1) + "$$$$\n")
    reg2 = tmp_path / "reg2.sdf"
    reg2.write_text(_block(GOOD, "whatever") + ">  <REGNO>\nQ-1\n\n$$$$\n")
    run_batch(fielded, tmp_path / "p", jobs=1, registry=reg2, id_field="REGNO", registry_id_field="REGNO")
    assert _rows(tmp_path / "p")[0]["verdict"] == "match"
