"""Build the hostile-book corpus: damaged, disguised and malicious workbooks, and what fuelsys must do.

Nothing here is committed as a binary: ``python3 tests/hostile/make_corpus.py DIR``
writes every book into DIR (and prints them with the exit codes expected);
``tests/hostile/test_hostile_corpus.py`` builds them in a temporary folder and
runs every command on each.

Each :class:`HostileBook` names the exit status README ("Where recalc writes,
and exit status") gives for each command:

* ``REFUSED`` -- the file is not read at all: every command exits 2;
* ``PARTIAL`` -- it reads, but some cells are refused by name (volatile or
  external references, circular references, formulas too deep or too long):
  recalc and check exit 1, eval with the book exits 2, diff of the book with
  itself exits 0;
* ``FINE`` -- it reads and computes (tricks that do no harm, such as member
  names with ``..``): recalc 0, check 1 (its stored values are stale until
  recalculated), eval 0, diff 0.

Sources of the formats: PKWARE APPNOTE.TXT (zip headers, flags, methods), ECMA-376
Part 1 and 2 (package parts, relationships, content types), W3C XML 1.0 Appendix F
(encodings without a byte order mark), [MS-CFB] (the OLE compound file signature),
RFC 1951 3.2.3 (deflate block types).
"""

from __future__ import annotations

import io
import os
import struct
import sys
import zipfile
from dataclasses import dataclass

MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PKG_NS = "http://schemas.openxmlformats.org/package/2006/relationships"
CT_NS = "http://schemas.openxmlformats.org/package/2006/content-types"
XLSX_CT = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"
SHEET_CT = "application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"
OLE_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"  # [MS-CFB] 2.2 header signature

REFUSED = {"recalc": 2, "check": 2, "diff": 2, "eval": 2, "notes": 2}
PARTIAL = {"recalc": 1, "check": 1, "diff": 0, "eval": 2, "notes": 1}
FINE = {"recalc": 0, "check": 1, "diff": 0, "eval": 0, "notes": 0}

BILLION_LAUGHS = ('<!DOCTYPE lolz [<!ENTITY lol "lol">'
                  + "".join(f'<!ENTITY lol{i} "{("&lol%s;" % ("" if i == 1 else i - 1)) * 10}">' for i in range(1, 10))
                  + ']>')
EXTERNAL_ENTITY = '<!DOCTYPE x [<!ENTITY xxe SYSTEM "file:///etc/passwd">]>'


@dataclass
class HostileBook:
    name: str
    what: str
    data: bytes
    expect: dict


def cells(pairs) -> str:
    """[(ref, value or None, formula or None)] -> sheetData rows."""
    rows: dict[int, list] = {}
    for ref, v, f in pairs:
        r = int("".join(ch for ch in ref if ch.isdigit()))
        inner = ""
        if f is not None:
            inner += "<f>" + f.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;") + "</f>"
        if v is not None:
            inner += f"<v>{v}</v>"
        rows.setdefault(r, []).append(f'<c r="{ref}">{inner}</c>')
    return "".join(f'<row r="{r}">{"".join(rows[r])}</row>' for r in sorted(rows))


SIMPLE = cells([("A1", "2", None), ("B1", None, "A1*3"), ("B2", None, "SUM(A1:B1)+1")])


def package(sheet_data: str = SIMPLE, extra=None, sheet_prolog: str = "", rels_extra: str = "",
            ctype: str = XLSX_CT, sheet_target: str = "worksheets/sheet1.xml", drop=(), method=zipfile.ZIP_DEFLATED,
            sheet_bytes: bytes | None = None) -> bytes:
    """A minimal workbook package with one sheet "S"; ``extra`` adds members (name -> str or bytes)."""
    members = {
        "[Content_Types].xml": (f'<?xml version="1.0" encoding="UTF-8"?><Types xmlns="{CT_NS}">'
                                '<Default Extension="xml" ContentType="application/xml"/>'
                                '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.'
                                f'relationships+xml"/><Override PartName="/xl/workbook.xml" ContentType="{ctype}"/>'
                                f'<Override PartName="/xl/worksheets/sheet1.xml" ContentType="{SHEET_CT}"/></Types>'),
        "_rels/.rels": (f'<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="{PKG_NS}"><Relationship '
                        f'Id="rId1" Type="{REL_NS}/officeDocument" Target="xl/workbook.xml"/></Relationships>'),
        "xl/workbook.xml": (f'<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="{MAIN_NS}" xmlns:r="{REL_NS}">'
                            '<sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>'),
        "xl/_rels/workbook.xml.rels": (f'<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="{PKG_NS}">'
                                       f'<Relationship Id="rId1" Type="{REL_NS}/worksheet" Target="{sheet_target}"/>'
                                       f'{rels_extra}</Relationships>'),
        "xl/worksheets/sheet1.xml": sheet_bytes if sheet_bytes is not None else (
            f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n{sheet_prolog}'
            f'<worksheet xmlns="{MAIN_NS}" xmlns:r="{REL_NS}"><sheetData>{sheet_data}</sheetData></worksheet>'),
    }
    for k in drop:
        members.pop(k, None)
    members.update(extra or {})
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", method) as zf:
        for i, (k, v) in enumerate(members.items()):
            zi = zipfile.ZipInfo(k, date_time=(2024, 1, 2, 3, 4, 2 * (i % 30)))
            zi.compress_type = method
            zf.writestr(zi, v.encode("utf-8") if isinstance(v, str) else v)
    return buf.getvalue()


def _entry(data: bytes, member: str):
    """(local header offset, central directory record offset, crc, compressed size) of ``member``."""
    eocd = data.rfind(b"PK\x05\x06")
    n, cd_size, cd_off = struct.unpack_from("<HLL", data, eocd + 10)
    pos = cd_off
    for _ in range(n):
        crc, csize = struct.unpack_from("<LL", data, pos + 16)
        nlen, xlen, klen = struct.unpack_from("<3H", data, pos + 28)
        off = struct.unpack_from("<L", data, pos + 42)[0]
        name = data[pos + 46:pos + 46 + nlen].decode()
        if name == member:
            return off, pos, crc, csize
        pos += 46 + nlen + xlen + klen
    raise KeyError(member)


def bad_crc(data: bytes, member: str) -> bytes:
    off, cd, crc, _ = _entry(data, member)
    out = bytearray(data)
    struct.pack_into("<L", out, off + 14, crc ^ 0x5A5A5A5A)  # APPNOTE 4.3.7: CRC-32 at 14 in the local header
    struct.pack_into("<L", out, cd + 16, crc ^ 0x5A5A5A5A)   # APPNOTE 4.3.12: at 16 in the directory record
    return bytes(out)


def bad_deflate(data: bytes, member: str) -> bytes:
    off, _, _, csize = _entry(data, member)
    nlen, xlen = struct.unpack_from("<2H", data, off + 26)
    start = off + 30 + nlen + xlen
    out = bytearray(data)
    out[start:start + csize] = b"\xff" * csize  # a reserved block type (RFC 1951, 3.2.3: BTYPE 11)
    return bytes(out)


def set_flag(data: bytes, member: str, bit: int = 0, method: int | None = None) -> bytes:
    off, cd, _, _ = _entry(data, member)
    out = bytearray(data)
    for at in (off + 6, cd + 8):
        flags = struct.unpack_from("<H", out, at)[0]
        struct.pack_into("<H", out, at, flags | (1 << bit))
        if method is not None:
            struct.pack_into("<H", out, at + 2, method)
    return bytes(out)


def corpus() -> list[HostileBook]:
    """Every book of the corpus, built in memory."""
    b = []

    def add(name, what, data, expect):
        b.append(HostileBook(name, what, data, expect))

    good = package()
    add("control.xlsx", "a plain good book (the control)", good, FINE)
    # -- not a workbook, whatever the name says
    add("encrypted.xlsx", "a password-protected workbook (an OLE compound file)", OLE_MAGIC + b"\0" * 1528, REFUSED)
    add("legacy.xlsx", "a legacy .xls renamed", OLE_MAGIC + b"\x01" * 2040, REFUSED)
    add("empty.xlsx", "an empty file", b"", REFUSED)
    add("csv.xlsx", "a CSV text renamed", b"a,b\n1,2\n", REFUSED)
    add("png.xlsx", "a picture renamed", b"\x89PNG\r\n\x1a\n" + b"\0" * 64, REFUSED)
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w") as zf:
        zf.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        zf.writestr("content.xml", "<office:document-content/>")
    add("opendocument.xlsx", "an OpenDocument spreadsheet renamed", buf.getvalue(), REFUSED)
    add("binary.xlsx", "a binary .xlsb workbook renamed",
        package(ctype="application/vnd.ms-excel.sheet.binary.macroEnabled.main"), REFUSED)
    add("no-content-types.xlsx", "a zip without [Content_Types].xml", package(drop=["[Content_Types].xml"]), REFUSED)
    add("truncated.xlsx", "a download cut in half", good[:len(good) // 2], REFUSED)
    add("junk-before.xlsx", "bytes before the zip", b"MZ" + b"\0" * 100 + good, REFUSED)
    # -- damaged members
    add("bad-crc-sheet.xlsx", "a sheet whose CRC-32 does not match", bad_crc(good, "xl/worksheets/sheet1.xml"), REFUSED)
    withapp = package(extra={"docProps/app.xml": "<Properties>" + "x" * 4000 + "</Properties>"})
    add("bad-crc-unparsed.xlsx", "a part fuelsys only copies, with a wrong CRC-32",
        bad_crc(withapp, "docProps/app.xml"), REFUSED)
    add("bad-deflate.xlsx", "a sheet whose deflate data does not decompress",
        bad_deflate(good, "xl/worksheets/sheet1.xml"), REFUSED)
    add("bad-deflate-unparsed.xlsx", "a copied part whose deflate data does not decompress",
        bad_deflate(withapp, "docProps/app.xml"), REFUSED)
    add("encrypted-member.xlsx", "a member marked encrypted (flag bit 0)", set_flag(good, "xl/workbook.xml", 0), REFUSED)
    add("bzip2-member.xlsx", "a member compressed with bzip2 (method 12)",
        set_flag(good, "xl/workbook.xml", 11, method=12), REFUSED)
    dup = io.BytesIO(good)
    with zipfile.ZipFile(dup, "a") as zf, _quiet():
        zf.writestr("xl/workbook.xml", f'<workbook xmlns="{MAIN_NS}"/>')
    add("duplicate-member.xlsx", "two members of one name", dup.getvalue(), REFUSED)
    # -- XML bombs and entities
    add("billion-laughs.xlsx", "entity expansion in a sheet",
        package(cells([("A1", None, "1")]).replace("<f>1</f>", "<f>1</f><v>&lol9;</v>"),
                sheet_prolog=BILLION_LAUGHS + "\n"), REFUSED)
    add("xxe-core.xlsx", "an external entity in a part fuelsys does not parse",
        package(extra={"docProps/core.xml": '<?xml version="1.0"?>' + EXTERNAL_ENTITY + "<c>&xxe;</c>"}), REFUSED)
    add("dtd-after-comment.xlsx", "a DTD after a 200 kB comment",
        package(extra={"xl/charts/chart1.xml": "<!--" + "x" * 200_000 + "-->" + EXTERNAL_ENTITY + "<a/>"}), REFUSED)
    for codec in ("utf-16-le", "utf-16-be", "utf-32-le"):
        add(f"dtd-{codec}.xlsx", f"a DTD in {codec} without a byte order mark",
            package(extra={"customXml/item1.xml": (EXTERNAL_ENTITY + "<a>&xxe;</a>").encode(codec)}), REFUSED)
    add("long-prolog.xlsx", "a prolog of 2 MiB of comments",
        package(extra={"customXml/item1.xml": "<!--" + "y" * (2 << 20) + "--><a/>"}), REFUSED)
    # -- zip bombs
    add("bomb-member.xlsx", "one member expanding 1000:1", package(extra={"xl/media/zeros.bin": b"\0" * (8 << 20)}),
        REFUSED)
    add("bomb-many.xlsx", "100 members of 1 MiB each, 1000:1 in all",
        package(extra={f"customXml/item{i}.xml": b" " * (1 << 20) for i in range(100)}), REFUSED)
    # -- external links
    link = f'<externalLink xmlns="{MAIN_NS}"><externalBook xmlns:r="{REL_NS}" r:id="rId1"/></externalLink>'
    link_rels = (f'<Relationships xmlns="{PKG_NS}"><Relationship Id="rId1" Type="{REL_NS}/externalLinkPath" '
                 'Target="file:///C:/club/other.xlsx" TargetMode="External"/></Relationships>')
    add("external-link-unused.xlsx", "a link part to another workbook that no formula uses",
        package(extra={"xl/externalLinks/externalLink1.xml": link,
                       "xl/externalLinks/_rels/externalLink1.xml.rels": link_rels},
                rels_extra=f'<Relationship Id="rId9" Type="{REL_NS}/externalLink" '
                           'Target="externalLinks/externalLink1.xml"/>'), REFUSED)
    # -- broken structure
    add("not-well-formed.xlsx", "a sheet that is not well-formed XML",
        package(sheet_bytes=b'<?xml version="1.0"?><worksheet><sheetData><row>'), REFUSED)
    add("bad-shared-string.xlsx", "a cell pointing at a shared string that does not exist",
        package(cells([("A1", "99", None)]).replace('<c r="A1">', '<c r="A1" t="s">')), REFUSED)
    add("bad-cell-ref.xlsx", "a cell reference that does not parse",
        package(cells([("A1", "1", None)]).replace('r="A1"', 'r="A0B"')), REFUSED)
    add("sheet-outside.xlsx", "a sheet relationship pointing outside the package",
        package(sheet_target="../../../../etc/passwd"), REFUSED)
    # -- formulas the engine refuses by name
    add("volatile.xlsx", "volatile and indirect functions",
        package(cells([("A1", "1", None), ("B1", None, "NOW()"), ("B2", None, "RAND()*A1"),
                       ("B3", None, 'INDIRECT("A1")'), ("B4", None, "OFFSET(A1,0,0)"), ("C1", None, "B1+1")])),
        PARTIAL)
    add("external-ref.xlsx", "a formula referring to another workbook",
        package(cells([("A1", None, "[1]Sheet1!A1*2")])), PARTIAL)
    add("circular.xlsx", "a circular reference", package(cells([("A1", None, "B1+1"), ("B1", None, "A1+1")])), PARTIAL)
    add("deep.xlsx", "a formula nested 200 levels deep", package(cells([("A1", None, "(" * 200 + "1" + ")" * 200)])),
        PARTIAL)
    add("long-formula.xlsx", "a formula of 9,000 characters", package(cells([("A1", None, "1" + "+1" * 4500)])),
        PARTIAL)
    add("unknown-function.xlsx", "a function the engine does not have",
        package(cells([("A1", None, "WEBSERVICE(\"http://127.0.0.1/\")")])), PARTIAL)
    # -- tricks that do no harm: computed, nothing written outside the output
    add("path-tricks.xlsx", "members named ../evil.txt, /abs.txt and C:\\evil.txt (never extracted)",
        package(extra={"../evil.txt": "x", "/abs.txt": "y", "C:\\evil.txt": "z"}), FINE)
    add("operands-500.xlsx", "a formula of 500 operands (2,391 characters)",
        package(cells([(f"A{i}", str(i), None) for i in range(1, 501)]
                      + [("B1", None, "+".join(f"A{i}" for i in range(1, 501)))])), FINE)
    add("stored-only.xlsx", "a book with no formulas (nothing to compute, nothing stale)",
        package(cells([("A1", "1", None)])), dict(FINE, check=0))
    return b


class _quiet:
    """Silence zipfile's duplicate-name warning while building the duplicate-member book."""

    def __enter__(self):
        import warnings

        self._cm = warnings.catch_warnings()
        self._cm.__enter__()
        warnings.simplefilter("ignore")

    def __exit__(self, *exc):
        return self._cm.__exit__(*exc)


def write(folder: str) -> list[HostileBook]:
    """Write every book of the corpus into ``folder``."""
    books = corpus()
    os.makedirs(folder, exist_ok=True)
    for hb in books:
        with open(os.path.join(folder, hb.name), "wb") as fh:
            fh.write(hb.data)
    return books


if __name__ == "__main__":
    out = sys.argv[1] if len(sys.argv) > 1 else "hostile-books"
    for hb in write(out):
        codes = " ".join(f"{k}={v}" for k, v in hb.expect.items())
        print(f"{hb.name:32s} {codes}  {hb.what}")
