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


def test_other_brackets_are_groups_of_their_own():
    assert parse_label("N(Me)2").reversed_text() == "(Me)2N"
    assert parse_label("CH2N(Me)2").reversed_text() == "(Me)2NH2C"
    assert parse_label("Si(Me)3").reversed_text() == "(Me)3Si"


# formulas of the abbreviations (common practice), to check labels.txt against its SMILES
_ABBREVIATION_ATOMS = {
    "Me": "CH3", "Et": "C2H5", "tBu": "C4H9", "Ph": "C6H5", "Bn": "C7H7", "Ac": "C2H3O",
    "Bz": "C7H5O", "Boc": "C5H9O2", "Cbz": "C8H7O2", "Ts": "C7H7O2S", "Tf": "CF3O2S",
    "Piv": "C5H9O", "PMB": "C8H9O", "MOM": "C2H5O", "TES": "C6H15Si", "Tr": "C19H15", "Phth": "C8H4O2",
}  # fmt: skip


def _atoms(formula: str) -> dict[str, int]:
    import re

    out: dict[str, int] = {}
    for element, count in re.findall(r"([A-Z][a-z]?)(\d*)", formula):
        out[element] = out.get(element, 0) + int(count or 1)
    return out


def _label_atoms(label) -> dict[str, int]:
    out: dict[str, int] = {}

    def add(unit, times):
        heads = [unit.head] if isinstance(unit.head, str) else None
        n = times * int(unit.count or 1)
        if heads is None:
            for inner in unit.head:
                add(inner, n)
            return
        for element, count in _atoms(_ABBREVIATION_ATOMS.get(unit.head, unit.head)).items():
            out[element] = out.get(element, 0) + count * n

    for unit in label.units:
        add(unit, 1)
    return out


def test_drawing_labels_have_the_formula_of_their_groups():
    """Each labels.txt label, expanded with the abbreviations' formulas, has the same atoms as its
    SMILES: a label naming the wrong group fails here."""
    from rdkit import Chem
    from rdkit.Chem.rdMolDescriptors import CalcMolFormula

    from chairdraw.energy import tables

    for label, group in tables.drawing_labels():
        mol = Chem.MolFromSmiles(group.replace("*", "[H]", 1))  # the ring atom as H: formula of the group + H
        want = _atoms(CalcMolFormula(mol))
        want["H"] -= 1
        assert _label_atoms(parse_label(label)) == {k: v for k, v in want.items() if v}, label
