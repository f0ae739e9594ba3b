"""Tests for chairdraw.read: every reader, with good and malformed input, and the messages a chemist sees.

Stereo results are always checked against an outside reference: RDKit's standard InChI of the source
molecule, built in the test straight from SMILES (never through chairdraw).

Data files (tests/data):
  v2000_wedges.mol    (1S,2S)-2-methylcyclohexanol, C[C@H]1CCCC[C@@H]1O; hash on 2->1, wedge on 7->8,
                      chiral flag 1; 8 atoms (lines 5-12), 8 bonds (lines 13-20), M  END on line 21
  v3000_wedges.mol    the same molecule as V3000: atoms on lines 8-15, bonds on lines 18-25, M  END line 28
  wavy.mol            v2000_wedges.mol with bond 1 (2->1) drawn wavy (bond stereo 4)
  explicit_h.mol      (1s,4s)-4-methylcyclohexanol, C[C@H]1CC[C@@H](O)CC1, all 22 atoms explicit, wedges on H only
  three_records.sdf   record-1 C[C@H]1CC[C@@H](O)CC1, record-2 C[C@H]1CC[C@H](O)CC1, record-3 C[C@@H]1CCC[C@H](O)C1
"""

from __future__ import annotations

import re
from collections.abc import Callable
from pathlib import Path

import pytest
from rdkit import Chem, RDLogger
from rdkit.Chem import AllChem

import chairdraw
from chairdraw import ChairdrawError, FormatError, InputError
from chairdraw.read import StereoGroup, Structure, read, sniff

DATA = Path(__file__).parent / "data"

V2000_FILE = DATA / "v2000_wedges.mol"
V3000_FILE = DATA / "v3000_wedges.mol"
TITLE = "(1S,2S)-2-methylcyclohexanol"
TITLE_SMILES = "C[C@H]1CCCC[C@@H]1O"  # what both wedge files depict

SDF_RECORDS = {
    "record-1": "C[C@H]1CC[C@@H](O)CC1",
    "record-2": "C[C@H]1CC[C@H](O)CC1",
    "record-3": "C[C@@H]1CCC[C@H](O)C1",
}

# ring stereoisomers used for round trips; the id says which ring stereo each one has
RING_ISOMERS = [
    pytest.param("C[C@H]1CC[C@@H](O)CC1", id="1,4-s,s"),
    pytest.param("C[C@H]1CC[C@H](O)CC1", id="1,4-r,r"),
    pytest.param("C[C@H]1CCCC[C@@H]1O", id="1,2-chiral"),
    pytest.param("C[C@@H]1CCC[C@H](O)C1", id="1,3-chiral"),
]


# --- helpers -------------------------------------------------------------------------------------


def reference_inchi(smiles: str) -> str:
    """Standard InChI computed by RDKit directly from SMILES: the outside reference for stereo."""
    inchi = Chem.MolToInchi(Chem.MolFromSmiles(smiles))
    assert inchi.startswith("InChI=1S/")
    return inchi


def inchi_of(structure: Structure) -> str:
    return Chem.MolToInchi(structure.mol)


def depicted(smiles: str, name: str = "") -> Chem.Mol:
    """The molecule with 2D coordinates and RDKit's own wedges, ready for a molfile writer."""
    mol = Chem.MolFromSmiles(smiles)
    mol.SetProp("_Name", name)
    AllChem.Compute2DCoords(mol)
    Chem.WedgeMolBonds(mol, mol.GetConformer())
    return mol


def unflagged_smiles(cxsmiles: str) -> tuple[str, str]:
    """Split RDKit's CXSMILES and strip '@' from the SMILES part (atom order unchanged)."""
    smiles, extension = cxsmiles.split(" ", 1)
    flat = re.sub(r"\[C@@?H\]", "C", smiles)
    assert "@" not in flat
    return flat, extension


def lines_of(path: Path) -> list[str]:
    return path.read_text().splitlines()


Edit = Callable[[list[str]], list[str]]


def set_line(no: int, text: str) -> Edit:
    """Replace line ``no`` (1-based, as an editor shows it)."""
    return lambda lines: [*lines[: no - 1], text, *lines[no:]]


def set_columns(no: int, start: int, stop: int, text: str) -> Edit:
    """Overwrite columns start..stop (0-based, stop exclusive) of line ``no``."""
    return lambda lines: [*lines[: no - 1], lines[no - 1][:start] + text + lines[no - 1][stop:], *lines[no:]]


def drop_lines(first: int, last: int | None = None) -> Edit:
    last = first if last is None else last
    return lambda lines: [*lines[: first - 1], *lines[last:]]


def cut_after(no: int) -> Edit:
    """The file ends after line ``no`` (a truncated download or copy)."""
    return lambda lines: lines[:no]


def assert_quiet(capfd: pytest.CaptureFixture[str]) -> None:
    """The library printed nothing, and in particular no RDKit C++ stack trace."""
    out, err = capfd.readouterr()
    assert "Stacktrace" not in err
    assert "Violation" not in err
    assert err == ""
    assert out == ""


# --- sniffing and format selection ---------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "expected", "reason"),
    [
        ("CCO", "smiles", "a single word"),
        ("C[C@H]1CC[C@@H](O)CC1 trans-ish", "smiles", "a title word after the SMILES is not an extension"),
        ("C[C@H](O)CC |&1:1|", "cxsmiles", "a |...| block after whitespace"),
        ("C[C@H](O)CC |&1:1| rac-butanol", "cxsmiles", "extension followed by a title"),
        ("InChI=1S/CH4/h1H4", "inchi", "the InChI= prefix"),
        ("  InChI=1S/CH4/h1H4\n", "inchi", "surrounding whitespace is ignored"),
        (V2000_FILE.read_text(), "molfile", "V2000 counts line and M  END"),
        (V3000_FILE.read_text(), "molfile", "V3000 counts line"),
        ((DATA / "three_records.sdf").read_text(), "sdf", "$$$$ record separators"),
    ],
    ids=["smiles", "smiles-title", "cxsmiles", "cxsmiles-title", "inchi", "inchi-padded", "v2000", "v3000", "sdf"],
)
def test_sniff_recognises_each_format(text: str, expected: str, reason: str) -> None:
    assert sniff(text) == expected, reason


@pytest.mark.parametrize(
    "text",
    [
        pytest.param("CCO\nCCC\n", id="two-smiles-lines"),
        pytest.param("some notes\nabout a compound\nwith no\nconnection table\n", id="prose"),
    ],
)
def test_multiline_text_that_is_not_a_molfile_is_a_format_error(text: str) -> None:
    with pytest.raises(FormatError, match="cannot tell the format"):
        sniff(text)
    with pytest.raises(FormatError) as info:
        read(text)
    assert "no 'M  END' (molfile)" in str(info.value)
    assert str(info.value).startswith("read: ")


def test_unknown_format_name_is_a_format_error() -> None:
    with pytest.raises(FormatError) as info:
        read("CCO", format="bogus")
    assert str(info.value) == "read: unknown format 'bogus'; choose one of smiles, cxsmiles, molfile, sdf, inchi"


def test_empty_input_is_an_input_error() -> None:
    with pytest.raises(InputError, match="the input is empty"):
        read("   \n  ")


def test_rdkit_molecule_and_structure_pass_through() -> None:
    mol = Chem.MolFromSmiles(TITLE_SMILES)
    structure = read(mol, record="given")
    assert structure.format == "rdkit"
    assert structure.record == "given"
    assert structure.mol is not mol  # a copy: the caller's molecule is not shared
    # outside reference: RDKit's standard InChI of the source SMILES
    assert inchi_of(structure) == reference_inchi(TITLE_SMILES)
    assert read(structure) is structure


# --- SMILES and CXSMILES -------------------------------------------------------------------------


def test_smiles_title_word_becomes_record() -> None:
    structure = read("C[C@H]1CC[C@@H](O)CC1 methylcyclohexanol-7")
    assert structure.format == "smiles"
    assert structure.record == "methylcyclohexanol-7"
    assert structure.label == "methylcyclohexanol-7"
    assert structure.source == "argument"
    assert structure.stereo_groups == ()
    assert structure.stereo_meaning == "absolute"
    # outside reference: RDKit's standard InChI of the SMILES without its title
    assert inchi_of(structure) == reference_inchi("C[C@H]1CC[C@@H](O)CC1")


def test_explicit_record_wins_over_the_title_word() -> None:
    assert read("CCO ethanol", record="EtOH-1").record == "EtOH-1"
    assert read("CCO").record is None


@pytest.mark.parametrize(
    ("extension", "groups", "meaning", "reason"),
    [
        ("|&1:1,5|", [("and", (1, 5))], "racemic", "&n is an AND group: the drawn isomer and its mirror image"),
        ("|o1:1,5|", [("or", (1, 5))], "relative", "on is an OR group: one of the two, not known which"),
        ("|a:1,5|", [("absolute", (1, 5))], "absolute", "a is the absolute group"),
        ("|&1:1,&2:5|", [("and", (1,)), ("and", (5,))], "racemic", "two AND groups are still racemic"),
        ("|a:1,o1:5|", [("absolute", (1,)), ("or", (5,))], "mixed", "different kinds together"),
    ],
    ids=["and", "or", "absolute", "two-and", "mixed"],
)
def test_cxsmiles_enhanced_stereo_groups(extension: str, groups: list, meaning: str, reason: str) -> None:
    smiles = "C[C@@H]1CCC[C@H](O)C1"
    structure = read(f"{smiles} {extension} sample-3")
    assert structure.format == "cxsmiles"
    assert structure.record == "sample-3"
    assert structure.stereo_groups == tuple(StereoGroup(kind, atoms) for kind, atoms in groups), reason
    assert structure.stereo_meaning == meaning, reason
    # outside reference: RDKit's own parse of the same CXSMILES gives the same groups
    rdkit_kinds = {
        Chem.StereoGroupType.STEREO_AND: "and",
        Chem.StereoGroupType.STEREO_OR: "or",
        Chem.StereoGroupType.STEREO_ABSOLUTE: "absolute",
    }
    direct = Chem.MolFromSmiles(f"{smiles} {extension}")
    assert [(g.kind, g.atoms) for g in structure.stereo_groups] == [
        (rdkit_kinds[g.GetGroupType()], tuple(sorted(a.GetIdx() for a in g.GetAtoms())))
        for g in direct.GetStereoGroups()
    ]
    # outside reference: standard InChI of the plain SMILES (the drawn centres are kept)
    assert inchi_of(structure) == reference_inchi(smiles)


def test_enhanced_stereo_of_a_rdkit_group_written_back_out() -> None:
    # the groups survive RDKit's CXSMILES writer -> chairdraw reader
    source = Chem.MolFromSmiles("C[C@H]1CC[C@@H](O)CC1 |&1:1,4|")
    structure = read(Chem.MolToCXSmiles(source))
    assert structure.stereo_groups == (StereoGroup("and", (1, 4)),)
    assert structure.stereo_meaning == "racemic"
    # outside reference: RDKit's standard InChI of the source
    assert inchi_of(structure) == Chem.MolToInchi(source)


@pytest.mark.parametrize("smiles", RING_ISOMERS)
def test_cxsmiles_wedges_with_coordinates_give_the_drawn_isomer(smiles: str) -> None:
    mol = Chem.MolFromSmiles(smiles)
    AllChem.Compute2DCoords(mol)
    flat, extension = unflagged_smiles(Chem.MolToCXSmiles(mol))
    assert re.search(r"w[UD]:", extension) and extension.startswith("|(")  # coordinates and wedges
    structure = read(f"{flat} {extension} drawn")
    assert structure.format == "cxsmiles"
    assert structure.record == "drawn"
    assert structure.notes == ()
    # outside reference: RDKit's standard InChI of the source molecule; the text itself has no '@'
    assert inchi_of(structure) == reference_inchi(smiles)


@pytest.mark.parametrize("smiles", RING_ISOMERS)
def test_cxsmiles_coordinates_without_wedges_carry_no_stereo(smiles: str) -> None:
    mol = Chem.MolFromSmiles(smiles)
    AllChem.Compute2DCoords(mol)
    cx = Chem.MolToCXSmiles(mol, Chem.SmilesWriteParams(), Chem.CXSmilesFields.CX_COORDS)
    flat, extension = unflagged_smiles(cx)
    assert "w" not in extension
    structure = read(f"{flat} {extension}")
    # outside reference: RDKit's standard InChI of the stereo-free SMILES (no /t layer)
    assert inchi_of(structure) == reference_inchi(flat)
    assert "/t" not in inchi_of(structure)


def test_cxsmiles_wedges_without_coordinates_are_ignored_with_a_note() -> None:
    structure = read("CC1CCC(O)CC1 |wU:1.0,wD:4.5|")
    assert structure.notes == ("CXSMILES wedges without coordinates are ignored by the reader",)
    # outside reference: RDKit's standard InChI of the flat constitution
    assert inchi_of(structure) == reference_inchi("CC1CCC(O)CC1")


@pytest.mark.parametrize(
    ("text", "position", "reason"),
    [
        ("C1CC(", 5, "branch opened at the very end"),
        ("C1CC( |&1:1|", 5, "the caret still points into the SMILES, not the extension"),
        ("CC)C", 3, "close parenthesis with no branch open"),
        ("C[Xx]C", 3, "unknown element in brackets"),
    ],
    ids=["open-branch", "open-branch-cx", "extra-close", "bracket-element"],
)
def test_bad_smiles_names_the_position_with_a_caret(text: str, position: int, reason: str, capfd) -> None:
    with pytest.raises(InputError) as info:
        read(text)
    err = info.value
    smiles = text.split()[0]
    assert f"SMILES at position {position}" in err.message, reason
    assert str(err).startswith(f"read: SMILES at position {position}: ")
    shown, caret = err.detail.splitlines()
    assert shown == f"  {smiles}"
    assert caret.strip() == "^"
    assert shown[caret.index("^")] == smiles[position - 1], "the caret stands under the offending character"
    assert str(err).endswith("\n" + err.detail)
    assert_quiet(capfd)


def test_open_branch_message_in_full() -> None:
    with pytest.raises(InputError) as info:
        read("C1CC(")
    assert str(info.value) == "read: SMILES at position 5: syntax error\n  C1CC(\n      ^"


def test_smiles_valence_error_mentions_valence(capfd) -> None:
    with pytest.raises(InputError) as info:
        read("CC(C)(C)(C)(C)C")
    assert "valence" in info.value.message.lower()
    assert str(info.value).startswith("read: SMILES")
    assert info.value.detail is None
    assert_quiet(capfd)


def test_unclosed_ring_has_no_position() -> None:
    with pytest.raises(InputError) as info:
        read("C1CC")
    assert str(info.value) == "read: SMILES: unclosed ring"
    assert info.value.detail is None


def test_unclosed_cxsmiles_extension_is_an_error() -> None:
    with pytest.raises(InputError, match="CXSMILES"):
        read("C[C@@H]1CCC[C@H](O)C1 |&1:1,5")


def test_cxsmiles_stereo_group_on_missing_atom_is_an_error() -> None:
    with pytest.raises(InputError, match="12"):
        read("C[C@@H]1CCC[C@H](O)C1 |&1:12|")


# --- molfile V2000 / V3000 -----------------------------------------------------------------------


@pytest.mark.parametrize("smiles", RING_ISOMERS)
@pytest.mark.parametrize("writer", [Chem.MolToMolBlock, Chem.MolToV3KMolBlock], ids=["V2000", "V3000"])
def test_molfile_wedges_give_the_drawn_isomer(smiles: str, writer: Callable[[Chem.Mol], str]) -> None:
    block = writer(depicted(smiles, name="drawn"))
    assert re.search(r"^ {0,2}\d+ {1,2}\d+  1  [16]$|CFG=[13]", block, re.MULTILINE)  # wedge/hash present
    structure = read(block)
    assert structure.format == "molfile"
    assert structure.record == "drawn"
    assert structure.notes == ()
    # outside reference: RDKit's standard InChI of the source molecule
    assert inchi_of(structure) == reference_inchi(smiles)
    if writer is Chem.MolToMolBlock:
        assert structure.chiral_flag == 0  # RDKit writes flag 0
    else:
        assert structure.chiral_flag == 0  # the fifth number of the V3000 COUNTS line, as RDKit writes it


def test_molfile_data_files_read_from_disk() -> None:
    for path in (V2000_FILE, V3000_FILE):
        structure = read(path)
        assert structure.source == str(path)
        assert structure.record == TITLE
        assert structure.format == "molfile"
        # outside reference: RDKit's standard InChI of the SMILES the files depict
        assert inchi_of(structure) == reference_inchi(TITLE_SMILES)
    assert read(V2000_FILE).chiral_flag == 1


@pytest.mark.parametrize(
    ("flag", "chiral_flag", "meaning", "reason"),
    [
        ("  0", 0, "relative", "flag 0: the wedges show relative configuration only"),
        ("  1", 1, "absolute", "flag 1: the wedges are the absolute configuration"),
    ],
    ids=["flag-0", "flag-1"],
)
def test_v2000_chiral_flag(flag: str, chiral_flag: int, meaning: str, reason: str) -> None:
    text = "\n".join(set_columns(4, 12, 15, flag)(lines_of(V2000_FILE))) + "\n"
    structure = read(text)
    assert structure.chiral_flag == chiral_flag, reason
    assert structure.stereo_meaning == meaning, reason
    # outside reference: the drawn centres are read either way; standard InChI of the source SMILES
    assert inchi_of(structure) == reference_inchi(TITLE_SMILES)


@pytest.mark.parametrize(
    ("extension", "kind", "meaning"),
    [("|&1:1,5|", "and", "racemic"), ("|o1:1,5|", "or", "relative"), ("|a:1,5|", "absolute", "absolute")],
    ids=["STERAC", "STEREL", "STEABS"],
)
def test_v3000_stereo_collections(extension: str, kind: str, meaning: str) -> None:
    smiles = "C[C@@H]1CCC[C@H](O)C1"
    source = Chem.MolFromSmiles(f"{smiles} {extension}")
    AllChem.Compute2DCoords(source)
    structure = read(Chem.MolToV3KMolBlock(source))
    assert structure.stereo_groups == (StereoGroup(kind, (1, 5)),)
    assert structure.stereo_meaning == meaning
    # outside reference: RDKit's standard InChI of the source
    assert inchi_of(structure) == reference_inchi(smiles)


def test_wavy_bond_leaves_its_ring_centre_unknown() -> None:
    lines = lines_of(DATA / "wavy.mol")
    assert lines[12] == "  2  1  1  4"  # bond 1, from ring atom 2, stereo 4 = either
    structure = read(DATA / "wavy.mol")
    # outside reference: RDKit's standard InChI of the SMILES with only the C-O centre defined
    assert inchi_of(structure) == reference_inchi("CC1CCCC[C@@H]1O")
    assert inchi_of(structure) != reference_inchi(TITLE_SMILES)
    specified = {
        info.centeredOn: info.specified
        for info in Chem.FindPotentialStereo(structure.mol, cleanIt=False, flagPossible=True)
    }
    assert specified[1] == Chem.StereoSpecified.Unknown  # the wavy centre
    assert specified[6] == Chem.StereoSpecified.Specified  # the wedged centre


def test_explicit_hydrogens_stay_atoms_with_their_numbers() -> None:
    path = DATA / "explicit_h.mol"
    lines = lines_of(path)
    n_atoms, n_bonds = int(lines[3][0:3]), int(lines[3][3:6])
    symbols = [line[31:34].strip() for line in lines[4 : 4 + n_atoms]]
    wedged = [line for line in lines[4 + n_atoms : 4 + n_atoms + n_bonds] if line[9:12].strip() in ("1", "6")]
    assert wedged and all(symbols[int(line[3:6]) - 1] == "H" for line in wedged)  # wedges only on C-H bonds
    structure = read(path)
    assert structure.mol.GetNumAtoms() == n_atoms == 22
    assert [atom.GetSymbol() for atom in structure.mol.GetAtoms()] == symbols
    # outside reference: RDKit's standard InChI of the source SMILES
    assert inchi_of(structure) == reference_inchi("C[C@H]1CC[C@@H](O)CC1")


def test_3d_molfile_takes_stereo_from_geometry() -> None:
    smiles = "C[C@H]1CC[C@@H](O)CC1"
    mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
    assert AllChem.EmbedMolecule(mol, randomSeed=7) == 0
    structure = read(Chem.MolToMolBlock(mol))
    assert structure.notes == ("3D coordinates: stereo was taken from the geometry",)
    # outside reference: RDKit's standard InChI of the source SMILES
    assert inchi_of(structure) == reference_inchi(smiles)


# --- SDF -----------------------------------------------------------------------------------------


def test_sdf_takes_the_first_record_and_says_so() -> None:
    path = DATA / "three_records.sdf"
    for structure in (read(path), read(str(path)), read(path.read_text())):
        assert structure.record == "record-1"
        assert structure.notes == ("the file holds 3 records; the first was taken",)
        # outside reference: RDKit's standard InChI of record-1's source SMILES
        assert inchi_of(structure) == reference_inchi(SDF_RECORDS["record-1"])


def test_sdf_single_record_has_no_note() -> None:
    text = Chem.MolToMolBlock(depicted(SDF_RECORDS["record-2"], name="only")) + ">  <ID>\nONLY\n\n$$$$\n"
    assert sniff(text) == "sdf"
    structure = read(text)
    assert structure.record == "only"
    assert structure.notes == ()
    # outside reference: RDKit's standard InChI of the source SMILES
    assert inchi_of(structure) == reference_inchi(SDF_RECORDS["record-2"])


def test_sdf_with_a_broken_first_record_names_it() -> None:
    lines = (DATA / "three_records.sdf").read_text().splitlines()
    lines[4] = lines[4][:31] + "Xx " + lines[4][34:]
    with pytest.raises(InputError) as info:
        read("\n".join(lines) + "\n")
    assert str(info.value) == "record-1: read: molfile: line 5 of the file (atom block, atom 1): unknown element 'Xx'"


# --- InChI ---------------------------------------------------------------------------------------


@pytest.mark.parametrize("smiles", RING_ISOMERS)
def test_standard_inchi_round_trip(smiles: str) -> None:
    inchi = reference_inchi(smiles)  # outside reference: RDKit's standard InChI of the source SMILES
    structure = read(inchi)
    assert structure.format == "inchi"
    assert inchi_of(structure) == inchi


@pytest.mark.parametrize(
    ("text", "options", "reason"),
    [
        ("InChI=1S/garbage", {}, "no formula layer"),
        ("InChI=1S/", {}, "nothing after the prefix"),
        ("InChI=1S/C7H14O/c1-6-2-4-7(8)5-3-6/h6-8H,2-5H2,1H3/garbage", {}, "a valid start, then rubbish"),
        ("CCO", {"format": "inchi"}, "a SMILES read as InChI on request"),
    ],
    ids=["garbage", "empty-body", "trailing-garbage", "forced-format"],
)
def test_garbage_inchi_is_an_input_error(text: str, options: dict, reason: str, capfd) -> None:
    with pytest.raises(InputError) as info:
        read(text, **options)
    assert "InChI" in str(info.value), reason
    assert str(info.value).startswith("read: InChI: ")
    assert_quiet(capfd)


# --- files ---------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "content", "fmt"),
    [
        ("ring.smi", "C[C@H]1CC[C@@H](O)CC1 from-file\n", "smiles"),
        ("ring.inchi", reference_inchi("C[C@H]1CC[C@@H](O)CC1") + "\n", "inchi"),
        ("ring.mol", Chem.MolToMolBlock(depicted("C[C@H]1CC[C@@H](O)CC1", "from-file")), "molfile"),
        ("ring.txt", Chem.MolToV3KMolBlock(depicted("C[C@H]1CC[C@@H](O)CC1", "from-file")), "molfile"),
    ],
    ids=["smi", "inchi", "mol", "txt-sniffed"],
)
def test_read_from_a_file_path(tmp_path: Path, name: str, content: str, fmt: str) -> None:
    path = tmp_path / name
    path.write_text(content)
    for source in (path, str(path)):
        structure = read(source)
        assert structure.source == str(path)
        assert structure.format == fmt
        assert structure.label == ("from-file" if fmt != "inchi" else str(path))
        # outside reference: RDKit's standard InChI of the source SMILES
        assert inchi_of(structure) == reference_inchi("C[C@H]1CC[C@@H](O)CC1")


def test_missing_path_cannot_be_opened(tmp_path: Path, capfd) -> None:
    missing = tmp_path / "missing.mol"
    for source in (missing, str(missing)):
        with pytest.raises(InputError) as info:
            read(source)
        assert "cannot open" in str(info.value)
        assert str(missing) in str(info.value)
        assert "No such file or directory" in str(info.value)
        assert info.value.record == str(missing)
    assert_quiet(capfd)


# --- malformed molfiles: the line and the problem, from molcheck ----------------------------------

# v2000_wedges.mol: line 4 counts, 5-12 atoms, 13-20 bonds, 21 M  END
V2000_BROKEN = [
    pytest.param(
        set_columns(5, 31, 34, "Xx "),
        "line 5 of the file (atom block, atom 1): unknown element 'Xx'",
        "unknown element on the first atom line",
        id="unknown-element-atom-1",
    ),
    pytest.param(
        set_columns(12, 31, 34, "Xx "),
        "line 12 of the file (atom block, atom 8): unknown element 'Xx'",
        "the line number follows the atom",
        id="unknown-element-atom-8",
    ),
    pytest.param(
        set_columns(5, 31, 34, "   "),
        "line 5 of the file (atom block, atom 1): the element symbol is missing",
        "blank symbol field",
        id="missing-element",
    ),
    pytest.param(
        set_columns(5, 10, 20, "       abc"),
        "line 5 of the file (atom block, atom 1): cannot read the x, y, z coordinates from",
        "a coordinate that is not a number",
        id="bad-coordinate",
    ),
    pytest.param(
        set_columns(4, 0, 3, " xx"),
        "line 4 (counts line): cannot read the atom and bond counts from ' xx  8'",
        "counts line unreadable",
        id="bad-counts",
    ),
    pytest.param(
        cut_after(9),
        "line 10: the atom block ends after 5 atoms, but the counts line promises 8 (truncated atom block)",
        "file ends inside the atom block",
        id="truncated-atom-block",
    ),
    pytest.param(
        cut_after(16),
        "line 17: the bond block ends after 4 bonds, but the counts line promises 8 (truncated bond block)",
        "file ends inside the bond block",
        id="truncated-bond-block",
    ),
    pytest.param(
        drop_lines(17, 20),
        "line 17: the bond block ends after 4 bonds, but the counts line promises 8 (truncated bond block)",
        "M  END arrives before the promised bonds",
        id="bonds-missing-before-end",
    ),
    pytest.param(
        set_line(14, "  2  9  1  0"),
        "line 14 of the file (bond block, bond 2): atom number 9 is outside 1..8",
        "bond to an atom past the end",
        id="bond-atom-too-high",
    ),
    pytest.param(
        set_line(14, "  0  3  1  0"),
        "line 14 of the file (bond block, bond 2): atom number 0 is outside 1..8",
        "atom numbers start at 1",
        id="bond-atom-zero",
    ),
    pytest.param(
        set_line(14, "  2  2  1  0"),
        "line 14 of the file (bond block, bond 2): bond from atom 2 to itself",
        "self-bond",
        id="self-bond",
    ),
    pytest.param(
        set_line(14, "  2  3  x  0"),
        "line 14 of the file (bond block, bond 2): cannot read two atom numbers and a bond type from '  2  3  x'",
        "bond type that is not a number",
        id="bond-type-not-a-number",
    ),
    pytest.param(
        set_line(14, "  2  3 99  0"),
        "line 14 of the file (bond block, bond 2): unknown bond type 99 (expected 1-8)",
        "bond type outside the MDL range",
        id="bond-type-99",
    ),
    pytest.param(
        set_line(14, "  2  13  1  0"),
        "line 14 of the file (bond block, bond 2): the numbers are not in the fixed columns of a V2000 bond "
        "line (by column 2-1 type 3, by spaces 2-13 type 1)",
        "a bond line shifted by one column reads as another bond (RDKit reads the columns)",
        id="bond-line-shifted",
    ),
    pytest.param(
        drop_lines(21), "no 'M  END' line after the bond block (truncated molfile)", "no M  END", id="missing-m-end"
    ),
]


@pytest.mark.parametrize(("edit", "expected", "reason"), V2000_BROKEN)
def test_malformed_v2000_names_the_line(edit: Edit, expected: str, reason: str, capfd) -> None:
    text = "\n".join(edit(lines_of(V2000_FILE))) + "\n"
    with pytest.raises(InputError) as info:
        read(text)
    err = info.value
    assert str(err).startswith(f"{TITLE}: read: molfile: "), reason
    assert expected in err.message, reason
    assert_quiet(capfd)


def test_molfile_too_short_for_a_header() -> None:
    with pytest.raises(InputError) as info:
        read("title\nprogram\ncomment\n", format="molfile")
    assert str(info.value) == (
        "title: read: molfile: a molfile needs a three-line header and a counts line, but it has 3 lines"
    )


# v3000_wedges.mol: line 6 COUNTS, 7 BEGIN ATOM, 8-15 atoms, 16 END ATOM, 17 BEGIN BOND, 18-25 bonds,
# 26 END BOND, 27 END CTAB, 28 M  END
V3000_BROKEN = [
    pytest.param(
        set_line(8, "M  V30 1 Xx -1.948557 -1.500000 0.000000 0"),
        "line 8 of the file (atom block, atom 1): unknown element 'Xx'",
        "unknown element",
        id="unknown-element",
    ),
    pytest.param(
        set_line(9, "M  V30 2 C -0.649519"),
        "line 9 of the file (atom block, atom 2): expected 'index element x y z ...'",
        "atom line without y and z",
        id="short-atom-line",
    ),
    pytest.param(
        drop_lines(11),
        "line 15: the atom block has 7 atoms, but COUNTS promises 8",
        "an atom line is missing",
        id="atom-missing",
    ),
    pytest.param(
        cut_after(10),
        "the ATOM block is not closed with 'M  V30 END ATOM' (truncated molfile)",
        "file ends inside the atom block",
        id="truncated-atom-block",
    ),
    pytest.param(
        drop_lines(21),
        "line 25: the bond block has 7 bonds, but COUNTS promises 8",
        "a bond line is missing",
        id="bond-missing",
    ),
    pytest.param(
        cut_after(20),
        "the BOND block is not closed with 'M  V30 END BOND' (truncated molfile)",
        "file ends inside the bond block",
        id="truncated-bond-block",
    ),
    pytest.param(
        set_line(19, "M  V30 2 1 2 9"),
        "line 19 of the file (bond block, bond 2): atom number 9 is outside 1..8",
        "bond to an atom past the end",
        id="bond-atom-too-high",
    ),
    pytest.param(
        set_line(19, "M  V30 2 1 2"),
        "line 19 of the file (bond block, bond 2): expected 'index type atom1 atom2'",
        "bond line with one atom",
        id="short-bond-line",
    ),
    pytest.param(
        set_line(6, "M  V30 COUNTS x 8 0 0 0"),
        "line 6 (COUNTS): cannot read the atom and bond counts",
        "COUNTS unreadable",
        id="bad-counts",
    ),
    pytest.param(
        drop_lines(6),
        "no 'M  V30 COUNTS' line (not a complete V3000 connection table)",
        "COUNTS missing",
        id="no-counts",
    ),
    pytest.param(drop_lines(28), "no 'M  END' line (truncated molfile)", "no M  END", id="missing-m-end"),
    pytest.param(
        set_line(19, "M  V30 2 1 2 2"),
        "line 19 of the file (bond block, bond 2): bond from atom 2 to itself",
        "self-bond",
        id="self-bond",
    ),
    pytest.param(
        set_line(9, "M  V30 2 C -0.649519 abc 0.000000 0"),
        "line 9 of the file (atom block, atom 2): expected 'index element x y z ...'",
        "a coordinate that is not a number",
        id="bad-coordinate",
    ),
    pytest.param(
        set_line(19, "M  V30 2 42 2 3"),
        "line 19 of the file (bond block, bond 2): unknown bond type 42",
        "bond type outside the V3000 range 1-10",
        id="bond-type-42",
    ),
]


@pytest.mark.parametrize(("edit", "expected", "reason"), V3000_BROKEN)
def test_malformed_v3000_names_the_line(edit: Edit, expected: str, reason: str, capfd) -> None:
    text = "\n".join(edit(lines_of(V3000_FILE))) + "\n"
    with pytest.raises(InputError) as info:
        read(text)
    err = info.value
    assert str(err).startswith(f"{TITLE}: read: molfile: "), reason
    assert expected in err.message, reason
    assert_quiet(capfd)


PENTAVALENT = """\
pentavalent carbon
  hand-written

  6  5  0  0  0  0  0  0  0  0999 V2000
    0.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    1.5000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    3.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    1.5000    1.5000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    1.5000   -1.5000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    2.5000    1.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
  1  2  1  0
  2  3  1  0
  2  4  1  0
  2  5  1  0
  2  6  1  0
M  END
"""


def test_molfile_valence_error_mentions_valence(capfd) -> None:
    with pytest.raises(InputError) as info:
        read(PENTAVALENT)
    assert str(info.value).startswith("pentavalent carbon: read: molfile: ")
    assert "valence" in info.value.message.lower()
    assert_quiet(capfd)


def test_molfile_valence_error_uses_the_files_atom_number() -> None:
    with pytest.raises(InputError) as info:
        read(PENTAVALENT)
    assert re.search(r"\batom 2\b", info.value.message)
    assert "# 1" not in info.value.message


# --- every read failure: the class tree, the stage, and a quiet stderr ----------------------------

ALL_FAILURES = [
    pytest.param("C1CC(", {}, id="bad-smiles"),
    pytest.param("CC(C)(C)(C)(C)C", {}, id="smiles-valence"),
    pytest.param("InChI=1S/garbage", {}, id="garbage-inchi"),
    pytest.param("CCO", {"format": "bogus"}, id="bogus-format"),
    pytest.param("one\ntwo\n", {}, id="unsniffable"),
    pytest.param("", {}, id="empty"),
    pytest.param("no/such/dir/missing.mol", {}, id="missing-path"),
    pytest.param("\n".join(set_columns(5, 31, 34, "Xx ")(lines_of(V2000_FILE))) + "\n", {}, id="v2000-unknown-element"),
    pytest.param(
        "\n".join(set_line(8, "M  V30 1 Xx 0 0 0 0")(lines_of(V3000_FILE))) + "\n", {}, id="v3000-unknown-element"
    ),
    pytest.param("\n".join(cut_after(9)(lines_of(V2000_FILE))) + "\n", {}, id="v2000-truncated"),
    pytest.param(PENTAVALENT, {}, id="molfile-valence"),
]


@pytest.mark.parametrize(("text", "options"), ALL_FAILURES)
def test_every_read_error_is_a_quiet_chairdraw_value_error(text: str, options: dict, capfd) -> None:
    with pytest.raises(InputError) as info:
        read(text, **options)
    err = info.value
    assert isinstance(err, ChairdrawError)
    assert isinstance(err, ValueError)
    assert isinstance(err, chairdraw.InputError)
    assert err.stage == "read"
    assert re.match(r"^(.+: )?read: ", str(err))
    assert_quiet(capfd)


def test_rdkit_would_print_a_stack_trace_without_chairdraw(capfd) -> None:
    # control for assert_quiet: with RDKit's log on, the same molfile does put a C++ trace on stderr
    text = "\n".join(set_columns(5, 31, 34, "Xx ")(lines_of(V2000_FILE))) + "\n"
    RDLogger.EnableLog("rdApp.error")
    try:
        assert Chem.MolFromMolBlock(text) is None
    finally:
        RDLogger.DisableLog("rdApp.*")
    err = capfd.readouterr().err
    assert "Element 'Xx' not found" in err
    assert "Violation" in err


def test_a_stereo_mark_that_rdkit_drops_is_reported() -> None:
    # C1 of 4-methylcyclohexanol is a stereocentre only together with C4: RDKit drops a lone mark
    # there (checked below on RDKit's own parse), and the reader must say so instead of losing it
    assert Chem.MolFromSmiles("C[C@H]1CCC(O)CC1").GetAtomWithIdx(1).GetChiralTag() == Chem.ChiralType.CHI_UNSPECIFIED
    structure = read("C[C@H]1CCC(O)CC1")
    assert any("1 stereo mark(s) of the SMILES were dropped" in n for n in structure.notes)
    assert not any("dropped" in n for n in read("C[C@H]1CC[C@H](O)CC1").notes)
    assert not any("dropped" in n for n in read("CC1CCCCC1").notes)


def test_identity_smiles_keeps_the_enhanced_stereo_groups() -> None:
    # a racemic registration written as CXSMILES must not come back as a plain (absolute) SMILES;
    # RDKit's own CXSMILES writer is the reference for the text
    import chairdraw

    text = "C[C@H]1CCCC[C@@H]1C |&1:1,6|"
    analysis = chairdraw.analyze(text)
    expected = Chem.MolToCXSmiles(
        Chem.MolFromSmiles(text), Chem.SmilesWriteParams(), Chem.CXSmilesFields.CX_ENHANCEDSTEREO
    )
    assert analysis.smiles == expected and "&1:" in analysis.smiles
    assert analysis.stereo_meaning == "racemic"
    assert chairdraw.analyze("C[C@H]1CCCC[C@@H]1C").smiles == "C[C@H]1CCCC[C@@H]1C"


def test_rdkit_molecules_are_sanitized_or_refused() -> None:
    import chairdraw
    from chairdraw.errors import InputError as _InputError

    # an unsanitized molecule has no ring information: it must still give its ring
    raw = Chem.MolFromSmiles("C[C@H]1CC[C@@H](O)CC1", sanitize=False)
    assert len(chairdraw.analyze(raw).rings) == 1
    with pytest.raises(_InputError, match="query"):
        chairdraw.analyze(Chem.MolFromSmarts("C1CCCCC1"))
    with pytest.raises(_InputError, match="cannot be sanitized"):
        chairdraw.analyze(Chem.MolFromSmiles("C1CC(C)(C)(C)CC1", sanitize=False))


def test_non_tetrahedral_marks_are_not_counted_as_dropped() -> None:
    assert not any("dropped" in n for n in read("F[Pt@SP1](Cl)(Br)I.C1CCCCC1").notes)


@pytest.mark.parametrize(
    "layer, meaning",
    [("/m0/s1", "absolute"), ("/s2", "relative"), ("/s3", "racemic")],
)
def test_inchi_stereo_layer_sets_the_meaning(layer, meaning) -> None:
    # standard InChI /s layer (InChI Technical Manual): 1 absolute, 2 relative, 3 racemic
    inchi = "InChI=1S/C8H16/c1-7-5-3-4-6-8(7)2/h7-8H,3-6H2,1-2H3/t7-,8-" + layer
    structure = read(inchi)
    assert structure.stereo_meaning == meaning
    # the centres themselves are kept: RDKit's InChI of the structure has the same /t layer
    assert Chem.MolToInchi(structure.mol).split("/t")[1].split("/")[0] == "7-,8-"


def test_non_standard_inchi_is_noted() -> None:
    structure = read("InChI=1/C8H16/c1-7-5-3-4-6-8(7)2/h7-8H,3-6H2,1-2H3/t7-,8-/s3")
    assert any("non-standard InChI" in n for n in structure.notes)


def test_rgroup_atoms_are_not_taken_for_a_query() -> None:
    import chairdraw

    # '*' / R-group atoms carry queries in RDKit; the structure around them is still a structure
    mol = Chem.MolFromSmiles("*C1CCCCC1 |$Q_e;;;;;;$|")
    assert len(chairdraw.analyze(mol).rings) == 1


def test_inchi_relative_layer_groups_each_component_apart() -> None:
    # two components of a /s2 InChI are each relative on their own: one OR group per component
    structure = read("InChI=1/2C7H14O/c2*1-6-3-2-4-7(8)5-6/h2*6-8H,2-5H2,1H3/t2*6-,7-/s2")
    assert [g.kind for g in structure.stereo_groups] == ["or", "or"]
    assert len({frozenset(g.atoms) for g in structure.stereo_groups}) == 2
