"""Line-level diagnosis of a molfile that RDKit refused.

RDKit says "Element 'Xx' not found" but not where. When a parse fails we walk the connection table
ourselves and name the line, the block and the problem, the way a chemist would look for it in an
editor. Only used after a failure, so it can be plain and thorough rather than fast.
"""

from __future__ import annotations

import re

from rdkit import Chem

_PT = Chem.GetPeriodicTable()
ELEMENTS = frozenset(_PT.GetElementSymbol(z) for z in range(1, 119))
# query and pseudo atoms that the MDL format allows in the symbol field
PSEUDO = frozenset({"R", "R#", "A", "Q", "*", "L", "LP", "D", "T", "X", "M", "AH", "QH", "XH", "MH"})


_BOND_LINE = re.compile(r"^[ \d]{3}[ \d]{3}[ \d]{3}(?:[ \d]{3})*\s*$")


def v3000_chiral_flag(text: str) -> int | None:
    """The chiral flag of a V3000 COUNTS line (fifth number), or None when absent."""
    for line in text.splitlines():
        if line.startswith("M  V30 COUNTS"):
            words = line.split()[3:]
            if len(words) >= 5:
                return _int(words[4])
            return None
    return None


def diagnose(text: str) -> str | None:
    """Return the first problem found in a single molfile record, or None if none is seen."""
    lines = text.splitlines()
    if len(lines) < 4:
        return f"a molfile needs a three-line header and a counts line, but it has {len(lines)} lines"
    counts = lines[3]
    if "V3000" in counts:
        return _diagnose_v3000(lines)
    return _diagnose_v2000(lines)


def _int(field: str) -> int | None:
    try:
        return int(field)
    except ValueError:
        return None


def _float(field: str) -> float | None:
    try:
        return float(field)
    except ValueError:
        return None


def _symbol_problem(symbol: str) -> str | None:
    if not symbol:
        return "the element symbol is missing"
    if symbol in ELEMENTS or symbol in PSEUDO:
        return None
    return f"unknown element '{symbol}'"


def _shifted_fields(line: str, by_column: tuple[int, int, int]) -> tuple[int, int, int] | None:
    """The first three numbers as the spaces separate them, where they differ from the fixed
    columns and no field ran into its neighbour (atom numbers of 100 and more may touch: '100101')."""
    tokens = line.split()[:3]
    if len(tokens) < 3 or any(len(t) > 3 or not t.isdigit() for t in tokens):
        return None
    spaced = (int(tokens[0]), int(tokens[1]), int(tokens[2]))
    return None if spaced == by_column else spaced


def _diagnose_v2000(lines: list[str]) -> str | None:
    counts = lines[3]
    n_atoms, n_bonds = _int(counts[0:3]), _int(counts[3:6])
    if n_atoms is None or n_bonds is None:
        return f"line 4 (counts line): cannot read the atom and bond counts from {counts[:6]!r}"
    first_atom, first_bond = 4, 4 + n_atoms
    for k in range(n_atoms):
        no = first_atom + k
        if no >= len(lines) or lines[no].startswith("M  "):
            return (
                f"line {no + 1}: the atom block ends after {k} atoms, but the counts line "
                f"promises {n_atoms} (truncated atom block)"
            )
        line = lines[no]
        where = f"line {no + 1} of the file (atom block, atom {k + 1})"
        if _BOND_LINE.match(line):
            return (
                f"line {no + 1}: the atom block ends after {k} atoms, but the counts line "
                f"promises {n_atoms} (this line is a bond line; truncated atom block)"
            )
        if any(_float(line[a:b]) is None for a, b in ((0, 10), (10, 20), (20, 30))):
            return f"{where}: cannot read the x, y, z coordinates from {line[:30]!r}"
        problem = _symbol_problem(line[31:34].strip())
        if problem:
            return f"{where}: {problem}"
    for k in range(n_bonds):
        no = first_bond + k
        if no >= len(lines) or lines[no].startswith("M  "):
            return (
                f"line {no + 1}: the bond block ends after {k} bonds, but the counts line "
                f"promises {n_bonds} (truncated bond block)"
            )
        line = lines[no]
        where = f"line {no + 1} of the file (bond block, bond {k + 1})"
        a, b, order = _int(line[0:3]), _int(line[3:6]), _int(line[6:9])
        if a is None or b is None or order is None:
            return f"{where}: cannot read two atom numbers and a bond type from {line[:9]!r}"
        shifted = _shifted_fields(line, (a, b, order))
        if shifted is not None:
            return (
                f"{where}: the numbers are not in the fixed columns of a V2000 bond line (by column "
                f"{a}-{b} type {order}, by spaces {shifted[0]}-{shifted[1]} type {shifted[2]}): {line.rstrip()!r}"
            )
        for end in (a, b):
            if not 1 <= end <= n_atoms:
                return f"{where}: atom number {end} is outside 1..{n_atoms}"
        if a == b:
            return f"{where}: bond from atom {a} to itself"
        if not 1 <= order <= 8:
            return f"{where}: unknown bond type {order} (expected 1-8)"
    if not any(line.startswith("M  END") for line in lines[first_bond + n_bonds :]):
        return "no 'M  END' line after the bond block (truncated molfile)"
    return None


def _diagnose_v3000(lines: list[str]) -> str | None:
    block = None
    n_atoms = n_bonds = None
    seen_atoms = seen_bonds = 0
    ended = False
    for no, line in enumerate(lines, start=1):
        if line.startswith("M  END"):
            ended = True
            break
        if not line.startswith("M  V30 "):
            continue
        body = line[7:].strip()
        words = body.split()
        if not words:
            continue
        if words[0] == "COUNTS":
            n_atoms, n_bonds = (
                (_int(words[1]) if len(words) > 1 else None),
                (_int(words[2]) if len(words) > 2 else None),
            )
            if n_atoms is None or n_bonds is None:
                return f"line {no} (COUNTS): cannot read the atom and bond counts"
        elif words[0] == "BEGIN" and len(words) > 1:
            block = words[1]
        elif words[0] == "END":
            if block == "ATOM" and n_atoms is not None and seen_atoms != n_atoms:
                return f"line {no}: the atom block has {seen_atoms} atoms, but COUNTS promises {n_atoms}"
            if block == "BOND" and n_bonds is not None and seen_bonds != n_bonds:
                return f"line {no}: the bond block has {seen_bonds} bonds, but COUNTS promises {n_bonds}"
            block = None
        elif block == "ATOM":
            seen_atoms += 1
            where = f"line {no} of the file (atom block, atom {seen_atoms})"
            if len(words) < 5 or any(_float(w) is None for w in words[2:5]):
                return f"{where}: expected 'index element x y z ...'"
            problem = _symbol_problem(words[1])
            if problem:
                return f"{where}: {problem}"
        elif block == "BOND":
            seen_bonds += 1
            where = f"line {no} of the file (bond block, bond {seen_bonds})"
            nums = [_int(w) for w in words[:4]]
            if len(words) < 4 or any(n is None for n in nums):
                return f"{where}: expected 'index type atom1 atom2'"
            if not 1 <= nums[1] <= 10:  # type: ignore[operator]
                return f"{where}: unknown bond type {nums[1]} (expected 1-10)"
            if nums[2] == nums[3]:
                return f"{where}: bond from atom {nums[2]} to itself"
            for end in nums[2:]:
                if n_atoms is not None and not 1 <= end <= n_atoms:  # type: ignore[operator]
                    return f"{where}: atom number {end} is outside 1..{n_atoms}"
    if n_atoms is None:
        return "no 'M  V30 COUNTS' line (not a complete V3000 connection table)"
    if block is not None:
        return f"the {block} block is not closed with 'M  V30 END {block}' (truncated molfile)"
    if not ended:
        return "no 'M  END' line (truncated molfile)"
    return None
