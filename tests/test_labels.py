"""Condensed labels: reading, reversal for bonds that leave to the left, sub/superscripts, errors.

Expected reversed forms are the ones used in printed structures (common practice: MeO2C, HOH2C,
TBSO, AcHN, F3C, Me2N, (H3C)2HC)."""

import pytest
from hypothesis import given
from hypothesis import strategies as st

from chairdraw import LabelError
from chairdraw.labels import SUB, SUP, parse_label

REVERSED = [
    ("CO2Me", "MeO2C"),
    ("CH2OH", "HOH2C"),
    ("OTBS", "TBSO"),
    ("NHAc", "AcHN"),
    ("OAc", "AcO"),
    ("OMe", "MeO"),
    ("CF3", "F3C"),
    ("NMe2", "Me2N"),
    ("CO2H", "HO2C"),
    ("SO2Ph", "PhO2S"),
    ("CH(CH3)2", "(H3C)2HC"),
    ("S(O)Me", "MeS(O)"),  # a bracketed =O stays with its atom
    ("P(O)Ph2", "Ph2P(O)"),
    ("C(O)Me", "MeC(O)"),
    ("C#CH", "HC\u2261C"),
    ("CH=CH2", "H2C=HC"),
    ("NH3+", "H3N+"),
    ("Me", "Me"),
    ("tBu", "tBu"),
    ("Cl", "Cl"),
]


@pytest.mark.parametrize("label,reversed_", REVERSED)
def test_reversed_labels_keep_the_attachment_atom_next_to_the_bond(label, reversed_):
    parsed = parse_label(label)
    assert parsed.reversed_text() == reversed_
    start, end = parsed.attachment(reverse=True)
    joined = "".join(t for t, _ in parsed.runs(reverse=True))
    first = parsed.units[0]
    assert joined[start:end] == (first.head if isinstance(first.head, str) else "(")
    assert "".join(t for t, _ in parsed.runs()).replace("\u2261", "#") == label


def test_counts_are_subscripts_and_charges_superscripts():
    assert parse_label("CH2OH").runs() == [("CH", "normal"), ("2", SUB), ("OH", "normal")]
    assert parse_label("NH3+").runs() == [("NH", "normal"), ("3", SUB), ("+", SUP)]
    assert parse_label("CO2-").runs()[-1] == ("\u2212", SUP)


@pytest.mark.parametrize(
    "bad,column,what",
    [("CO2Xe", 4, "unexpected 'X'"), ("C)", 2, "unexpected ')'"), ("CH(CH3", 7, "ends too early"), ("Me-x", 4, "'x'")],
)
def test_a_bad_label_names_the_column_and_shows_a_caret(bad, column, what):
    with pytest.raises(LabelError) as info:
        parse_label(bad)
    assert info.value.column == column
    assert what in info.value.message
    text_line, caret_line = info.value.detail.splitlines()
    assert text_line.strip() == bad
    assert caret_line.index("^") == text_line.index(bad) + column - 1


def test_empty_label_is_refused():
    with pytest.raises(LabelError, match="empty"):
        parse_label(" ")


UNITS = ["C", "H", "O", "N", "S", "F", "Cl", "Br", "Si", "Me", "Et", "Ac", "Ph", "tBu", "TBS", "Bn"]


@given(st.lists(st.tuples(st.sampled_from(UNITS), st.sampled_from(["", "2", "3"])), min_size=1, max_size=6))
def test_reversing_twice_gives_the_units_back(units):
    text = "".join(u + n for u, n in units)
    parsed = parse_label(text)
    assert len(parsed.units) == len(units)
    assert [u.text() for u in parsed.units] == [u + n for u, n in units]
    assert "".join(u.text() for u in reversed(parsed.units)) == parsed.reversed_text()


def test_every_drawing_label_reads_and_names_a_real_group():
    """labels.txt (names for drawing groups without an A-value row): each label is read by the
    grammar, each group is a valid fragment, and no group is also in the A-value table."""
    from rdkit import Chem

    from chairdraw.energy import tables
    from chairdraw.substituents import recognise

    rows = tables.drawing_labels()
    assert len(rows) >= 15
    for label, group in rows:
        assert parse_label(label).text == label
        mol = Chem.MolFromSmiles(group)
        assert mol is not None and sum(1 for a in mol.GetAtoms() if a.GetAtomicNum() == 0) == 1, group
        assert recognise(Chem.MolToSmiles(mol)).estimated_as is not None, f"{label} has an A-value row already"
