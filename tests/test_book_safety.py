"""A builder's book is never written while it is open elsewhere, and failures are counted, not hidden.

Facts used: LibreOffice keeps ".~lock.NAME#" and Excel "~$NAME" beside a book it has open
(common practice, no source).
"""

import openpyxl

from fuelsys.cli import main
from fuelsys.sheet.evaluate import recalc_workbook


def _book(path, temp=15):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws["A1"] = temp
    ws["B1"] = '=FS_DENSITY("kerosene",A1)'
    ws["B2"] = "=B1*2"
    wb.save(path)
    return path


def test_recalc_refuses_a_book_open_in_a_spreadsheet_program(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    before = book.read_bytes()
    for lock in (".~lock.engine.xlsx#", "~$gine.xlsx"):
        (tmp_path / lock).write_text("someone")
        assert main(["recalc", str(book)]) == 2
        assert "is open in a spreadsheet program" in capsys.readouterr().err
        assert book.read_bytes() == before
        (tmp_path / lock).unlink()
    assert main(["recalc", str(book)]) == 0


def test_recalc_counts_error_results(tmp_path):
    rep = recalc_workbook(_book(tmp_path / "cold.xlsx", temp=-70))  # below kerosene's freezing point
    assert rep.fs_errors == 1 and rep.error_values == 1  # B1's text, and B2's #VALUE! from arithmetic on it
    assert "1 showing an FS error text, 1 an error value" in rep.summary()


def test_libreoffice_engine_refuses_to_write_over_the_book(tmp_path, capsys):
    book = _book(tmp_path / "b.xlsx")
    before = book.read_bytes()
    assert main(["recalc", str(book), "--engine", "libreoffice", "-o", str(book)]) == 2
    assert "another file than the book" in capsys.readouterr().err
    assert book.read_bytes() == before


# ---------------------------------------------------------------------------
# damaged and hostile packages (issue 16): a refusal with a reason, never a traceback
#
# Zip layout facts: PKWARE APPNOTE.TXT 4.3.7 (local file header: CRC-32 at offset 14),
# 4.3.12 (central directory header: CRC-32 at offset 16). XML encodings without a byte
# order mark: W3C XML 1.0 (fifth edition), Appendix F.1 (the first four bytes of
# "<?xm" / "<!DO" in UTF-16 and UTF-32 show zero bytes where ASCII would not).

import struct  # noqa: E402
import time  # noqa: E402
import zipfile  # noqa: E402

import pytest  # noqa: E402

from fuelsys.sheet import xlsx  # noqa: E402
from test_xlsx import EXTERNAL_ENTITY, REL_NS, c, raw_book, rows_xml  # noqa: E402


def _small(path, extra=None):
    return raw_book(str(path), [("S", rows_xml([c("A1", "2"), c("B1", f="A1*3")]))], extra=extra)


def _patch_crc(path, member, delta=1):
    data = bytearray(open(path, "rb").read())
    e = next(e for e in xlsx._layout(bytes(data))[0] if e.name == member)
    cd_pos = bytes(data).find(e.cd)
    struct.pack_into("<L", data, e.offset + 14, (e.crc + delta) & 0xFFFFFFFF)
    struct.pack_into("<L", data, cd_pos + 16, (e.crc + delta) & 0xFFFFFFFF)
    open(path, "wb").write(bytes(data))


def _garble_deflate(path, member):
    data = bytearray(open(path, "rb").read())
    e = next(e for e in xlsx._layout(bytes(data))[0] if e.name == member)
    start = xlsx._local_header(bytes(data), e.offset)[7]
    data[start:start + e.csize] = b"\xff" * e.csize  # BTYPE 11: a reserved block type (RFC 1951, 3.2.3)
    open(path, "wb").write(bytes(data))


@pytest.mark.parametrize("member", ["xl/worksheets/sheet1.xml", "docProps/app.xml"])
@pytest.mark.parametrize("damage", [_patch_crc, _garble_deflate])
def test_a_damaged_member_is_refused_by_every_command(tmp_path, capsys, member, damage):
    path = _small(tmp_path / "d.xlsx", extra={"docProps/app.xml": "<Properties>" + "x" * 3000 + "</Properties>"})
    damage(path, member)
    before = open(path, "rb").read()
    with pytest.raises(xlsx.WorkbookRefused, match=f"{member}.*damaged"):
        xlsx.read_book(path)
    for argv in (["recalc", path], ["check", path], ["eval", "=1", "--book", path],
                 ["recalc", path, "-o", str(tmp_path / "o.xlsx")]):
        assert main(argv) == 2
        err = capsys.readouterr().err
        assert "damaged" in err and "Traceback" not in err
    assert open(path, "rb").read() == before
    assert not (tmp_path / "o.xlsx").exists()


def _external_link_book(path):
    rels_target = "externalLinks/externalLink1.xml"
    link = (f'<?xml version="1.0"?><externalLink xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">'
            '<externalBook xmlns:r="' + REL_NS + '" r:id="rId1"/></externalLink>')
    link_rels = ('<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/'
                 f'relationships"><Relationship Id="rId1" Type="{REL_NS}/externalLinkPath" '
                 'Target="file:///C:/club/other.xlsx" TargetMode="External"/></Relationships>')
    path = _small(path, extra={"xl/" + rels_target: link, "xl/externalLinks/_rels/externalLink1.xml.rels": link_rels})
    # the workbook's relationship to the link part, as a spreadsheet program writes it
    with zipfile.ZipFile(path) as zf:
        items = [(i, zf.read(i)) for i in zf.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zf:
        for i, d in items:
            if i.filename == "xl/_rels/workbook.xml.rels":
                d = d.replace(b"</Relationships>", f'<Relationship Id="rId99" Type="{REL_NS}/externalLink" '
                              f'Target="{rels_target}"/></Relationships>'.encode())
            zf.writestr(i, d)
    return path


def test_external_links_are_refused_even_when_no_formula_uses_them(tmp_path, capsys):
    path = _external_link_book(tmp_path / "linked.xlsx")
    before = open(path, "rb").read()
    with pytest.raises(xlsx.WorkbookRefused, match="links to another workbook.*other.xlsx"):
        xlsx.read_book(path)
    assert main(["recalc", path]) == 2
    assert "Break Link" in capsys.readouterr().err
    assert open(path, "rb").read() == before


@pytest.mark.parametrize("codec", ["utf-16-le", "utf-16-be", "utf-32-le", "utf-32-be"])
def test_a_dtd_in_utf16_or_utf32_without_a_byte_order_mark_is_found(tmp_path, codec):
    part = (EXTERNAL_ENTITY.split("\n", 1)[1] + "<a>&xxe;</a>").encode(codec)
    assert part[:2] not in (b"\xff\xfe", b"\xfe\xff")  # no byte order mark
    path = _small(tmp_path / "u.xlsx", extra={"customXml/item1.xml": part})
    with pytest.raises(xlsx.WorkbookRefused, match="item1.xml.*document type"):
        xlsx.read_book(path)
    declared = ('<?xml version="1.0" encoding="UTF-16"?>\n<!-- a note -->\n' + EXTERNAL_ENTITY.split("\n", 1)[1]
                + "<a/>").encode(codec)
    path = _small(tmp_path / "v.xlsx", extra={"customXml/item1.xml": declared})
    with pytest.raises(xlsx.WorkbookRefused, match="item1.xml.*document type"):
        xlsx.read_book(path)


def test_a_utf16_part_without_a_dtd_still_reads(tmp_path):
    part = '<?xml version="1.0" encoding="UTF-16"?><a>x</a>'.encode("utf-16-le")
    book = xlsx.read_book(_small(tmp_path / "ok.xlsx", extra={"customXml/item1.xml": part}))
    assert book.sheets[0].formulas


def test_the_prolog_scan_is_linear_and_bounded(tmp_path, monkeypatch):
    # 900 members of 1 MiB of spaces each (about 1 MB on disk) once took about a minute
    members = {f"customXml/item{i}.xml": b" " * (1 << 20) for i in range(900)}
    path = _small(tmp_path / "spaces.xlsx", extra=members)
    with pytest.raises(xlsx.WorkbookRefused, match="expand .* times in all"):
        xlsx.read_book(path)
    monkeypatch.setattr(xlsx, "TOTAL_RATIO_FLOOR", 1 << 40)  # past the ratio check: the prologs' own bound
    t0 = time.process_time()
    with pytest.raises(xlsx.WorkbookRefused, match="prologs of its parts add up"):
        xlsx.read_book(path)
    assert time.process_time() - t0 < 20  # a generous bound; the benchmark measures, this only catches a regression to minutes
    # one member of 1 MiB of spaces alone is within the limits and reads
    path = _small(tmp_path / "one.xlsx", extra={"customXml/item1.xml": b" " * (1 << 20)})
    assert xlsx.read_book(path).sheets[0].formulas


def test_many_small_members_that_expand_a_thousandfold_are_refused_together(tmp_path):
    # each member is 1 MiB (not over the per-member ratio floor); 900 of them are 900 MiB from 1 MB
    members = {f"customXml/item{i}.xml": b"<a>" + b" " * ((1 << 20) - 7) + b"</a>" for i in range(900)}
    path = _small(tmp_path / "many.xlsx", extra=members)
    with pytest.raises(xlsx.WorkbookRefused, match="expand .* times in all"):
        xlsx.read_book(path)


# ---------------------------------------------------------------------------
# the output policy (README, "Where recalc writes"): run as root in CI, so the
# root-only cases (a device node, another owner) are exercised there

import os  # noqa: E402
import socket  # noqa: E402
import stat  # noqa: E402
import subprocess  # noqa: E402
import sys  # noqa: E402

root_only = pytest.mark.skipif(os.geteuid() != 0, reason="needs root (CI runs as root)")


def test_a_symlink_as_output_or_book_is_not_followed_without_the_flag(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    victim = tmp_path / "victim.txt"
    victim.write_text("precious")
    link = tmp_path / "out.xlsx"
    link.symlink_to(victim)
    assert main(["recalc", str(book), "-o", str(link)]) == 2
    err = capsys.readouterr().err
    assert "symbolic link" in err and "--follow-symlinks" in err
    assert victim.read_text() == "precious" and link.is_symlink()
    # in place through a link to the book: refused too, then allowed by the flag (the link stays a link)
    alias = tmp_path / "alias.xlsx"
    alias.symlink_to(book)
    before = book.read_bytes()
    assert main(["recalc", str(alias)]) == 2
    assert book.read_bytes() == before
    assert main(["recalc", str(alias), "--follow-symlinks"]) == 0
    assert alias.is_symlink() and book.read_bytes() != before


@root_only
def test_a_device_or_fifo_as_output_is_refused_never_replaced(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    dev = tmp_path / "null"
    os.mknod(dev, stat.S_IFCHR | 0o666, os.makedev(1, 3))  # the null device's numbers (Linux devices.txt)
    fifo = tmp_path / "pipe.xlsx"
    os.mkfifo(fifo)
    for out in (dev, fifo):
        for extra in ([], ["--force", "--follow-symlinks"]):
            assert main(["recalc", str(book), "-o", str(out)] + extra) == 2
            assert "not a regular file" in capsys.readouterr().err
    assert stat.S_ISCHR(os.lstat(dev).st_mode) and stat.S_ISFIFO(os.lstat(fifo).st_mode)


def test_a_read_only_book_is_refused_unless_forced_and_keeps_its_mode(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    os.chmod(book, 0o444)
    before = book.read_bytes()
    assert main(["recalc", str(book)]) == 2
    assert "read-only" in capsys.readouterr().err and book.read_bytes() == before
    assert main(["recalc", str(book), "--force"]) == 0
    assert book.read_bytes() != before and stat.S_IMODE(os.stat(book).st_mode) == 0o444


@root_only
def test_owner_group_and_mode_are_kept(tmp_path):
    book = _book(tmp_path / "engine.xlsx")
    os.chmod(book, 0o640)
    os.chown(book, 4321, 8765)
    before = book.read_bytes()
    assert main(["recalc", str(book)]) == 0
    st = os.stat(book)
    assert book.read_bytes() != before
    assert (st.st_uid, st.st_gid, stat.S_IMODE(st.st_mode)) == (4321, 8765, 0o640)
    out = tmp_path / "copy.xlsx"
    _book(out)
    os.chown(out, 1111, 2222)
    assert main(["recalc", str(book), "-o", str(out)]) == 0
    assert (os.stat(out).st_uid, os.stat(out).st_gid) == (1111, 2222)


def test_extended_attributes_are_kept_where_the_file_system_has_them(tmp_path):
    book = _book(tmp_path / "engine.xlsx")
    try:
        os.setxattr(book, "user.fuelsys.test", b"kept")
    except OSError:
        pytest.skip("this file system keeps no user extended attributes")
    assert main(["recalc", str(book)]) == 0
    assert os.getxattr(book, "user.fuelsys.test") == b"kept"


def test_a_hard_linked_book_is_refused_unless_forced_saying_what_breaks(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    other = tmp_path / "shared-copy.xlsx"
    os.link(book, other)
    before = book.read_bytes()
    assert main(["recalc", str(book)]) == 2
    err = capsys.readouterr().err
    assert "2 hard links" in err and "--force" in err and book.read_bytes() == before
    assert main(["recalc", str(book), "--force"]) == 0
    assert "other names keep the old file" in capsys.readouterr().err
    assert book.read_bytes() != before and other.read_bytes() == before


def _dead_pid():
    p = subprocess.Popen([sys.executable, "-c", "pass"])
    p.wait()
    return p.pid


def test_stale_temporary_files_of_fuelsys_only_are_removed(tmp_path):
    book = _book(tmp_path / "engine.xlsx")
    dead = tmp_path / f".~fuelsys-{_dead_pid()}-a1b2c3.tmp"
    alive = tmp_path / f".~fuelsys-{os.getpid()}-d4e5f6.tmp"
    others = [tmp_path / ".~fuelsys-lo-x1.xlsx", tmp_path / "notes.tmp", tmp_path / ".~fuelsys-12ab-x.tmp"]
    for p in [dead, alive] + others:
        p.write_bytes(b"half a book")
    assert main(["recalc", str(book)]) == 0
    assert not dead.exists()
    assert alive.exists() and all(p.exists() for p in others)
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".~fuelsys-")) == \
        sorted([alive.name, others[0].name, others[2].name])


def test_a_stale_lock_is_explained_with_how_to_clear_it(tmp_path, capsys):
    book = _book(tmp_path / "engine.xlsx")
    lock = tmp_path / ".~lock.engine.xlsx#"
    # LibreOffice's lock: user name, system user, host, date, profile URL (common practice, no source)
    lock.write_text(f",builder,{socket.gethostname()},05.12.2026 09:00,file:///home/builder/.config/libreoffice/4;")
    assert main(["recalc", str(book)]) == 2
    err = capsys.readouterr().err
    assert socket.gethostname() in err and "builder" in err
    assert "delete" in err and str(lock.name) in err
    lock.write_text(f",builder,{socket.gethostname()},05.12.2026 09:00,{_dead_pid()};")
    assert main(["recalc", str(book)]) == 2
    assert "is not running: the lock is stale" in capsys.readouterr().err
    lock.unlink()
    assert main(["recalc", str(book)]) == 0
