"""The command line: exit codes, output channels, JSON validity against the shipped schema."""

from __future__ import annotations

import io
import json

import jsonschema
import pytest

from chairdraw.cli import main
from chairdraw.demo import demo_records
from chairdraw.schema import load


def test_analyze_text_report(capsys):
    assert main(["analyze", "C[C@H]1CC[C@@H](O)CC1"]) == 0
    out = capsys.readouterr().out
    assert "favoured chair" in out
    assert "does not replace experimental" in out


def test_analyze_json_validates_and_names_the_favoured_chair(capsys):
    # methylcyclohexane: Me equatorial favoured, A = 1.74 (Booth & Everett 1980)
    assert main(["analyze", "CC1CCCCC1", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    jsonschema.validate(data, load())
    ring = data["rings"][0]
    fav = [c for c in ring["chairs"] if c["favored"]]
    assert len(fav) == 1
    me = [p for p in fav[0]["positions"] if p["label"] == "Me"]
    assert me and me[0]["orientation"] == "equatorial"
    assert ring["delta_g_kcal_mol"] == pytest.approx(1.74, abs=1e-6)


def test_kj_units(capsys):
    assert main(["analyze", "CC1CCCCC1", "--units", "kJ"]) == 0
    out = capsys.readouterr().out
    assert "7.28 kJ/mol" in out  # 1.74 kcal/mol x 4.184


def test_temperature_and_solvent_reach_the_result(capsys):
    assert main(["analyze", "OC1CCCCC1", "--json", "--temperature", "200", "--solvent", "protic"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["temperature_K"] == 200
    assert data["rings"][0]["delta_g_kcal_mol"] == pytest.approx(1.0)  # OH in isopropanol (Eliel & Wilen)


def test_stdin(monkeypatch, capsys):
    monkeypatch.setattr("sys.stdin", io.StringIO("CC1CCCCC1\n"))
    assert main(["analyze", "-", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["source"] == "stdin"


@pytest.mark.parametrize(
    "argv, first_line",
    [
        (["analyze", "C1CC("], "chairdraw: 'C1CC(': read: SMILES at position 5: syntax error"),
        (["analyze", "/no/such/file.mol"], "chairdraw: /no/such/file.mol: read: cannot open '/no/such/file.mol'"),
        (["analyze", "CC1CCCCC1", "--temperature", "-5"], "chairdraw: usage: temperature must be a finite number"),
        (["analyze", "CC1CCCCC1", "--temperature", "inf"], "chairdraw: usage: temperature must be a finite number"),
        (["analyze", "InChI=1S/garbage"], "chairdraw: 'InChI=1S/garbage': read: InChI: not a valid InChI"),
        (
            ["analyze", "CN(C)(C)(C)C1CCCCC1"],
            "read: SMILES: Explicit valence for atom 2 of the SMILES (counting from 1)",
        ),
        (["analyze", "C1CC\udcffCCC1"], "read: character 5 is not valid UTF-8 text"),
        (["analyze", "C" * 60 + "("], "chairdraw: '" + "C" * 39 + "…': read: SMILES"),
        (["analyze", "CC1CCCCC1", "--temperature", "1e-322"], "chairdraw: usage: temperature must be a finite"),
    ],
)
def test_bad_input_exits_2_with_one_clear_message(argv, first_line, capsys):
    # the first line names the input, the stage and the problem; a caret display may follow
    assert main(argv) == 2
    captured = capsys.readouterr()
    assert captured.out == ""
    assert first_line in captured.err.splitlines()[0]
    assert "Traceback" not in captured.err


def test_usage_error_exits_2(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["analyze"])
    assert exc.value.code == 2
    assert "usage" in capsys.readouterr().err


def test_demo_runs_every_record(capsys):
    assert main(["demo"]) == 0
    out = capsys.readouterr().out
    for _, record in demo_records():
        assert record in out


def test_demo_json_validates(capsys):
    assert main(["demo", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert len(rows) == len(demo_records())
    schema = load()
    for row in rows:
        jsonschema.validate(row, schema)


def test_no_ring_is_not_an_error(capsys):
    assert main(["analyze", "CCO", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["rings"] == [] and "no ring that can take a chair" in data["notes"]


def test_output_into_a_closed_pipe_is_quiet():
    # `chairdraw demo --json | head -c 10`: the reader closes the pipe early; no traceback, exit 0.
    # The JSON (about 160 kB) is larger than a pipe buffer, so the writer does meet the closed pipe
    import subprocess
    import sys

    reader = subprocess.Popen(["head", "-c", "10"], stdin=subprocess.PIPE, stdout=subprocess.DEVNULL)
    writer = subprocess.run(
        [sys.executable, "-m", "chairdraw", "demo", "--json"],
        stdout=reader.stdin,
        stderr=subprocess.PIPE,
        text=True,
        timeout=120,
    )
    reader.stdin.close()
    reader.wait(timeout=30)
    assert "Traceback" not in writer.stderr, writer.stderr
    assert writer.returncode == 0


def test_scarce_chair_population_is_not_rounded_to_zero(capsys):
    # trans-4-tert-butylcyclohexanol: tBu > 99.9 % equatorial (fact of the trade);
    # the report must not claim 100.0 % / 0.0 %
    assert main(["analyze", "CC(C)(C)[C@H]1CC[C@H](O)CC1"]) == 0
    out = capsys.readouterr().out
    assert ">99.9" in out and "<0.1" in out
    assert "100.0" not in out
    assert main(["demo"]) == 0
    assert "(100.0 %)" not in capsys.readouterr().out


def test_percent_boundaries():
    from chairdraw.report import percent

    assert percent(0.95) == "95.0"
    assert percent(0.99949) == "99.9"
    assert percent(0.9996) == ">99.9"
    assert percent(0.0004) == "<0.1"
    assert percent(0.5) == "50.0"


def test_usage_errors_are_one_line(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["analyze", "CC1CCCCC1", "--format", "pdb"])
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and err.startswith("chairdraw: usage: ")


def test_a_directory_is_not_read_as_smiles(tmp_path, capsys):
    assert main(["analyze", str(tmp_path)]) == 2
    assert "Is a directory" in capsys.readouterr().err


def test_a_smiles_beside_a_directory_of_that_name_is_still_a_smiles(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "OC").mkdir()
    assert main(["analyze", "OC", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["smiles"] == "CO"


def test_summary_line_carries_the_warnings_that_can_reverse_the_answer():
    # anti-1,3-diol acetonides are twist-boats; N-acyl 2-alkylpiperidines often put the 2-group axial
    # (A(1,3) strain; Johnson, Chem. Rev. 1968, 68, 375, from memory): one line per record must say so
    import chairdraw
    from chairdraw.report import summary_line

    assert "twist-boat likely" in summary_line(chairdraw.analyze("C[C@@H]1C[C@@H](C)OC(C)(C)O1"))
    assert "A(1,3) strain" in summary_line(chairdraw.analyze("CC(=O)N1CCCC[C@@H]1C"))
    assert "A(1,3) strain" not in summary_line(chairdraw.analyze("CC(C)(C)OC(=O)N1CC[C@@H](C)CC1"))
