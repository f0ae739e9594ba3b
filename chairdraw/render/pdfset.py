"""Many one-page PDFs -> one PDF, written page by page, so memory does not grow with the pages.

pypdf's PdfWriter holds every appended page until it writes (measured here: +320 MB for 5,000
figure pages, and more in its incremental mode), which breaks a bulk run's flat memory. Our pages
are simple (cairo's output: a page, its content stream, its resources), so each input is read with
pypdf, its page and the objects it refers to are renumbered and written out at once, and only the
byte offsets and page numbers are kept for the cross-reference table written at the end.
"""

from __future__ import annotations

import os
from collections.abc import Iterable
from pathlib import Path

from pypdf import PdfReader
from pypdf.generic import (
    ArrayObject,
    DictionaryObject,
    IndirectObject,
    NameObject,
    NumberObject,
    PdfObject,
    StreamObject,
)

_INHERITED = ("/MediaBox", "/CropBox", "/Resources", "/Rotate")


def write_pdf_set(pages: Iterable[str | os.PathLike], out: str | os.PathLike) -> int:
    """Write the first page of each PDF in ``pages``, in order, into ``out``; returns the count."""
    with open(out, "wb") as handle:
        copier = _Copier(handle)
        for path in pages:
            copier.page(Path(path))
        copier.finish()
    return len(copier.kids)


class _Copier:
    """Writes objects as they come; keeps only their byte offsets and the page numbers."""

    def __init__(self, handle):
        self.handle = handle
        self.offsets: dict[int, int] = {}
        self.kids: list[int] = []
        self.number = 2  # 1: catalog, 2: page tree; pages and their objects from 3 on
        handle.write(b"%PDF-1.5\n%\xe2\xe3\xcf\xd3\n")

    def page(self, path: Path) -> None:
        page = PdfReader(str(path)).pages[0]
        for key in _INHERITED:  # what a page may take from its old parent goes on the page itself
            if key not in page:
                value = page.mediabox if key == "/MediaBox" else _inherited(page, key)
                if value is not None:
                    page[NameObject(key)] = value
        if "/Parent" in page:
            del page["/Parent"]
        renumbered: dict[int, int] = {}
        todo: list[tuple[int, PdfObject | None]] = []

        def new_ref(ref: IndirectObject) -> IndirectObject:
            if ref.idnum not in renumbered:
                self.number += 1
                renumbered[ref.idnum] = self.number
                todo.append((self.number, ref.get_object()))
            return _ref(renumbered[ref.idnum])

        self.number += 1
        page_number = self.number
        _relink(page, new_ref)
        page[NameObject("/Parent")] = _ref(2)
        self._write(page_number, page)
        while todo:
            n, obj = todo.pop()
            _relink(obj, new_ref)
            self._write(n, obj)
        self.kids.append(page_number)

    def finish(self) -> None:
        tree = DictionaryObject(
            {
                NameObject("/Type"): NameObject("/Pages"),
                NameObject("/Kids"): ArrayObject(_ref(k) for k in self.kids),
                NameObject("/Count"): NumberObject(len(self.kids)),
            }
        )
        self._write(2, tree)
        self._write(1, DictionaryObject({NameObject("/Type"): NameObject("/Catalog"), NameObject("/Pages"): _ref(2)}))
        start = self.handle.tell()
        size = self.number + 1
        self.handle.write(f"xref\n0 {size}\n0000000000 65535 f \n".encode("ascii"))
        for n in range(1, size):
            self.handle.write(f"{self.offsets[n]:010d} 00000 n \n".encode("ascii"))
        self.handle.write(f"trailer\n<< /Size {size} /Root 1 0 R >>\nstartxref\n{start}\n%%EOF\n".encode("ascii"))

    def _write(self, number: int, obj) -> None:
        self.offsets[number] = self.handle.tell()
        self.handle.write(f"{number} 0 obj\n".encode("ascii"))
        obj.write_to_stream(self.handle)
        self.handle.write(b"\nendobj\n")


def _ref(number: int) -> IndirectObject:
    return IndirectObject(number, 0, None)  # type: ignore[arg-type]  # written as "n 0 R"; no reader needed


def _inherited(page, key: str):
    parent = page.get("/Parent")
    while parent is not None:
        parent = parent.get_object()
        if key in parent:
            return parent[key]
        parent = parent.get("/Parent")
    return None


def _relink(obj, new_ref) -> None:
    """Replace, in place, every indirect reference inside ``obj`` by its new number."""
    if isinstance(obj, StreamObject | DictionaryObject):
        for key in list(obj.keys()):
            value = dict.__getitem__(obj, key)  # the raw value: references are not resolved here
            if isinstance(value, IndirectObject):
                dict.__setitem__(obj, key, new_ref(value))
            else:
                _relink(value, new_ref)
    elif isinstance(obj, ArrayObject):
        for i, value in enumerate(obj):
            if isinstance(value, IndirectObject):
                obj[i] = new_ref(value)
            else:
                _relink(value, new_ref)
