"""Hostile input, round three: each test feeds the input that once broke sizer (a silent pass, a
crash, a runaway, a damaged file) and checks the one-line refusal (exit 2, no traceback, nothing
written) or the safe behaviour that replaced it.

The ranges are sizer's own stated rules (docs/limits.md). Check values: rectangle b x d: the shear
centre is at the centroid, the faces at +-d/2 (elementary beam theory); HMAC-SHA256 as RFC 2104 /
FIPS 198-1 define it (Python's hmac module, common practice for keyed digests).
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import socket
import stat
import threading
import time
from pathlib import Path

import pytest
import typer

from sizer import cache_store, units
from sizer.cli import app
from sizer.cli_common import guarded, run_guarded
from sizer.cli_many import jobs_option
from sizer.cache_store import cache_root
from sizer.files import MAX_INPUT_BYTES, write_all
from sizer.cluster import cluster_host_port
from sizer.parallel import RUNS_FOLDER, _kept_path, keep, read_kept
from sizer.workers import Workers, default_jobs
from sizer.printable import printable, safe_console
from tests.cli_runs import bad_input, run
from tests.steel import STEEL_TOML

CATALOGUE = STEEL_TOML + """
[[sections]]
name = "F 30x8"
shape = "rectangle"
depth = "30 mm"
width = "8 mm"

[[sections]]
name = "F 60x8"
shape = "rectangle"
depth = "60 mm"
width = "8 mm"
"""

BEAM = """\
[member]
length = "2 m"
material = "steel"
self_weight = false

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "2 m"
type = "roller"

[[loads]]
type = "point"
at = "1 m"
fy = "-0.2 kN"
"""


@pytest.fixture
def folder(tmp_path: Path) -> Path:
    (tmp_path / "section_library").mkdir()
    (tmp_path / "section_library" / "stock.toml").write_text(CATALOGUE, encoding="utf-8")
    return tmp_path


def member(folder: Path, text: str, name: str = "m.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def with_section(text: str, section: str = "F 30x8") -> str:
    return text.replace('material = "steel"', f'material = "steel"\nsection = "{section}"')


# ----------------------------------------------------------------------------------------------
# 1. physical ranges

def test_a_load_height_below_the_section_is_refused_by_check(folder: Path) -> None:
    # "-5 m" on a section 30 mm deep once turned a failing beam into a pass
    path = member(folder, with_section(BEAM) + 'height = "-5 m"\n')
    line = bad_input(run("check", path), "loads[1].height", "outside the section", "F 30x8")
    assert "-15.0 mm and +15.0 mm" in line  # rectangle: faces at -d/2 and +d/2 from the shear centre (= centroid)
    assert bad_input(run("report", path, "-o", folder / "r.html"), "loads[1].height")
    assert not (folder / "r.html").exists()


def test_a_height_within_the_section_is_checked(folder: Path) -> None:
    result = run("check", member(folder, with_section(BEAM) + 'height = "-15 mm"\n'), "--json")  # the bottom face exactly
    assert result.exit_code in (0, 1), result.stderr


def test_a_restraint_height_outside_the_section_is_refused(folder: Path) -> None:
    text = with_section(BEAM) + '[[restraints]]\nat = "1 m"\nhold = ["lateral"]\nheight = "+16 mm"\n'
    bad_input(run("check", member(folder, text)), "restraints[1].height", "outside the section")


def test_size_leaves_out_the_sections_a_height_does_not_fit(folder: Path) -> None:
    # +20 mm is above the top of F 30x8 (+15 mm) and within F 60x8 (+30 mm); F 30x8 is lighter and strong enough
    path = member(folder, BEAM + 'height = "+20 mm"\n')
    document = json.loads(run("size", path, "--json").stdout)
    assert document["section"] == "F 60x8" and document["passes"]
    assert all(row["section"] != "F 30x8" for row in document["candidates"])
    assert any("height" in note for note in document["assumptions"])
    bad_input(run("check", path, "--section", "F 30x8"), "loads[1].height")  # size and check agree
    bad_input(run("size", member(folder, BEAM + 'height = "-5 m"\n')), "loads[1].height", "no candidate section")


@pytest.mark.parametrize("zone, refused", [('from = "1 m"\nto = "1.000001 m"', True), ('from = "1 m"\nto = "1.099 m"', True),
                                           ('from = "1 m"\nto = "1.1 m"', False)])
def test_a_restraint_zone_shorter_than_100_mm_is_refused(folder: Path, zone: str, refused: bool) -> None:
    # a 1 micrometre zone once held the slope like a deck (load factor 14 against 6.3 at a point)
    text = with_section(BEAM) + f'[[restraints]]\n{zone}\nhold = ["lateral", "twist"]\n'
    result = run("check", member(folder, text), "--json")
    if refused:
        bad_input(result, "restraints[1].to", "100 mm", "use at =")
    else:
        assert result.exit_code in (0, 1), result.stderr


@pytest.mark.parametrize("key, value, words", [
    ("buckling_safety_factor", "1e-310", ("checks.buckling_safety_factor",)),  # flipped 1.208 to 0.919
    ("buckling_safety_factor", "0.5", ("1 to 100",)),
    ("deflection_limit", "1e-310", ("checks.deflection_limit",)),  # showed "inf mm" and passed
    ("deflection_limit", "20000", ("1 to 10000",)),
    ("deflection_limit_overhang", "0.5", ("checks.deflection_limit_overhang",)),
])
def test_factors_and_limits_out_of_range_are_refused(folder: Path, key: str, value: str, words: tuple[str, ...]) -> None:
    path = member(folder, with_section(BEAM) + f"[checks]\n{key} = {value}\n")
    bad_input(run("check", path), *words)


def test_factors_and_limits_at_the_ends_of_the_range_are_used(folder: Path) -> None:
    path = member(folder, with_section(BEAM) + "[checks]\nbuckling_safety_factor = 1\ndeflection_limit = 10000\n")
    result = run("check", path, "--json")
    assert result.exit_code in (0, 1), result.stderr


def test_a_schedule_quantity_and_a_span_table_width_are_bounded(tmp_path: Path) -> None:
    (tmp_path / "m.toml").write_text(with_section(BEAM), encoding="utf-8")
    schedule = tmp_path / "s.toml"
    schedule.write_text('[[members]]\nmark = "B1"\nfile = "m.toml"\nquantity = 10000000\n', encoding="utf-8")
    bad_input(run("schedule", schedule), "members[1].quantity", "1 to 1000000")
    table = tmp_path / "t.toml"
    table.write_text('[span_table]\nmaterial = "steel"\nloads = [' + ", ".join(['"-1 kN/m"'] * 1001) + "]\n", encoding="utf-8")
    bad_input(run("span-table", table), "span_table.loads", "1000")


# ----------------------------------------------------------------------------------------------
# 2. keyed digests

def test_the_cache_secret_is_owner_only_and_seals_are_hmac(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    path = tmp_path / "cache" / "runs" / "kept.json"
    cache_store.write_sealed(path, b"payload")
    secret = tmp_path / "cache" / cache_store.SECRET_NAME
    assert stat.S_IMODE(secret.stat().st_mode) == 0o600
    import hmac

    seal, _, body = path.read_bytes().partition(b"\n")
    message = f"{cache_store.code_fingerprint()}\0runs/kept.json\0".encode() + b"payload"
    assert seal.decode() == hmac.new(secret.read_bytes(), message, hashlib.sha256).hexdigest()  # RFC 2104 HMAC-SHA256
    assert seal.decode() != hashlib.sha256(message).hexdigest()  # not a plain hash anyone can remake
    assert cache_store.read_sealed(path) == b"payload"
    path.write_bytes(seal + b"\npayload!")
    assert cache_store.read_sealed(path) is None


def test_a_secret_others_can_read_is_replaced(tmp_path: Path) -> None:
    root = tmp_path / "cache"
    root.mkdir()
    shared = root / cache_store.SECRET_NAME
    shared.write_bytes(b"k" * cache_store.SECRET_BYTES)
    shared.chmod(0o644)
    made = cache_store._secret_of(str(root))
    assert made != b"k" * cache_store.SECRET_BYTES
    assert stat.S_IMODE(shared.stat().st_mode) == 0o600 and shared.read_bytes() == made


def test_a_unit_factor_changed_with_a_plain_digest_is_not_believed(folder: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    assert units.parse("12 daN", "force") == pytest.approx(120.0)  # a unit pint is asked for (1 daN = 10 N)
    memory = tmp_path / "cache" / units.UNIT_CACHE_NAME
    _, _, body = memory.read_bytes().partition(b"\n")
    factors = json.loads(body)
    factors["daN|force"] = 15.0  # x1.5, with the seal remade as a plain sha256 anyone can make
    body = json.dumps(factors, sort_keys=True).encode()
    memory.write_bytes(hashlib.sha256(body).hexdigest().encode() + b"\n" + body)
    monkeypatch.setattr(units, "_UNIT_FACTORS", None)
    assert units.parse("12 daN", "force") == pytest.approx(120.0)  # 1 daN = 10 N (SI prefix deca)


def test_a_kept_result_changed_with_its_digest_remade_is_redone(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    key = "ab" + "0" * 62
    keep(key, {"passes": False, "utilization": 1.208})
    assert read_kept(key) == {"passes": False, "utilization": 1.208}
    body = json.dumps({"passes": True, "utilization": 0.5}).encode()
    _kept_path(key).write_bytes(hashlib.sha256(body).hexdigest().encode() + b"\n" + body)  # "ok", with a plain digest
    assert read_kept(key) is None
    _kept_path(key).write_bytes(body)  # the old form: no digest at all
    assert read_kept(key) is None


def test_kept_schedule_rows_that_fail_their_digest_are_worked_out_again(folder: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    from sizer.schedule import read_schedule, run_schedule

    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "cache"))
    member(folder, with_section(BEAM).replace("-0.2 kN", "-20 kN"))  # fails: M = PL/4 = 10 kN*m on a 30x8 flat
    (folder / "s.toml").write_text('[[members]]\nmark = "B1"\nfile = "m.toml"\n', encoding="utf-8")
    first = run_schedule(read_schedule(folder / "s.toml"), [], jobs=1, show_progress=False)
    assert first.rows[0]["passes"] is False
    for path in (tmp_path / "cache" / RUNS_FOLDER).rglob("*.json"):
        digest, _, body = path.read_bytes().partition(b"\n")
        path.write_bytes(digest + b"\n" + body.replace(b'"passes": false', b'"passes": true'))
    second = run_schedule(read_schedule(folder / "s.toml"), [], jobs=1, show_progress=False)
    assert (second.summary.resumed, second.rows[0]["passes"]) == (0, False)


# ----------------------------------------------------------------------------------------------
# 3. names shown as text only

ESCAPES = "\x1b[2K\r\x1b[32mB1 passes\x1b[0m"


def test_a_combination_name_with_an_escape_sequence_is_refused(folder: Path) -> None:
    text = with_section(BEAM) + '[combinations]\n"x\\u001b[2K\\rpasses" = { load = 1.0 }\n'
    line = bad_input(run("check", member(folder, text)), "control character \\x1b")
    assert "\x1b" not in line and "\r" not in line


def test_a_schedule_mark_with_an_escape_sequence_is_refused(folder: Path) -> None:
    member(folder, with_section(BEAM))
    schedule = folder / "s.csv"
    schedule.write_text(f'mark,file\n"{ESCAPES}",m.toml\n', encoding="utf-8")
    line = bad_input(run("schedule", schedule, "--jobs", "1"), "row 2.mark", "control character")
    assert "\x1b" not in line


def test_the_console_csv_html_and_error_lines_show_control_characters_as_text() -> None:
    from rich.table import Table
    from rich.text import Text

    from sizer.render.report.markup import _e
    from sizer.render.schedule import _TextOnlyWriter

    out = io.StringIO()
    terminal = safe_console(file=out, force_terminal=True, width=80)
    table = Table()
    table.add_column("mark")
    table.add_row(ESCAPES)
    terminal.print(table)
    terminal.print(Text("FAILS " + ESCAPES, style="bold"))
    shown = out.getvalue()
    assert "\\x1b[2K" in shown and "\x1b[2K" not in shown and "\r" not in shown
    assert "\x1b[1m" in shown  # rich's own styles still pass
    buffer = io.StringIO()
    _TextOnlyWriter(buffer).writerow([ESCAPES, 1.5])
    assert "\x1b" not in buffer.getvalue() and next(csv.reader(io.StringIO(buffer.getvalue())))[0] == printable(ESCAPES)
    assert "\x1b" not in _e(ESCAPES) and "&lt;b&gt;" in _e("<b>")
    result = run("check", "nowhere.toml", "--section", ESCAPES)
    assert "\x1b" not in result.stderr and result.exit_code == 2


# ----------------------------------------------------------------------------------------------
# 4. one output guard

@pytest.fixture
def scheduled(folder: Path) -> Path:
    member(folder, with_section(BEAM))
    schedule = folder / "s.csv"
    schedule.write_text("mark,file\nB1,m.toml\n", encoding="utf-8")
    return schedule


def test_csv_never_overwrites_the_schedule(scheduled: Path) -> None:
    before = scheduled.read_bytes()
    bad_input(run("schedule", scheduled, "--jobs", "1", "--csv", scheduled), "--csv", "input file")
    assert scheduled.read_bytes() == before


def test_csv_never_makes_a_missing_folder(scheduled: Path) -> None:
    bad_input(run("schedule", scheduled, "--jobs", "1", "--csv", scheduled.parent / "new" / "out.csv"), "--csv", "does not exist")
    assert not (scheduled.parent / "new").exists()


def test_csv_refuses_a_read_only_folder(scheduled: Path) -> None:
    locked = scheduled.parent / "locked"
    locked.mkdir()
    locked.chmod(0o555)
    try:
        bad_input(run("span-table", scheduled.parent / "none.toml", "--csv", locked / "out.csv"), "--csv", "read-only")
        bad_input(run("schedule", scheduled, "--jobs", "1", "--csv", locked / "out.csv"), "--csv", "read-only")
    finally:
        locked.chmod(0o755)
    assert list(locked.iterdir()) == []


def test_a_bad_record_folder_is_refused_before_any_work_and_nothing_is_written(scheduled: Path) -> None:
    folder = scheduled.parent
    (folder / "out_records").write_text("in the way", encoding="utf-8")
    before = set(folder.iterdir())
    bad_input(run("schedule", scheduled, "--jobs", "1", "--csv", folder / "out.csv", "-o", folder / "out.html"), "-o", "out_records")
    assert set(folder.iterdir()) == before


def test_outputs_written_together_leave_nothing_when_one_fails(tmp_path: Path) -> None:
    (tmp_path / "a_file").write_text("x", encoding="utf-8")
    with pytest.raises(OSError):
        write_all([(tmp_path / "one.csv", "1"), (tmp_path / "records" / "r.html", "2"), (tmp_path / "a_file" / "two.html", "3")])
    assert sorted(path.name for path in tmp_path.iterdir()) == ["a_file"]


# ----------------------------------------------------------------------------------------------
# 5. shapes that crashed the mesher, catalogues without a material

POLYGON = STEEL_TOML + """
[[sections]]
name = "P1"
shape = "polygon"
points = [["0 mm", "0 mm"], ["100 mm", "0 mm"], ["100 mm", "100 mm"], ["0 mm", "100 mm"]]
holes = [HOLES]
"""


@pytest.mark.parametrize("holes, words", [
    ('[["0 mm", "0 mm"], ["50 mm", "20 mm"], ["20 mm", "50 mm"]]', ("holes[0]", "the outline")),  # at a corner: exit 139 once
    ('[["10 mm", "10 mm"], ["50 mm", "10 mm"], ["50 mm", "50 mm"]], [["50 mm", "10 mm"], ["90 mm", "10 mm"], ["90 mm", "50 mm"]]',
     ("holes[1]", "holes[0]")),  # two holes sharing a corner: a singular torsion solve once
    ('[["0 mm", "10 mm"], ["50 mm", "10 mm"], ["50 mm", "50 mm"], ["0 mm", "50 mm"]]', ("holes",)),  # along an edge
])
def test_a_hole_touching_the_outline_or_another_hole_is_refused(tmp_path: Path, holes: str, words: tuple[str, ...]) -> None:
    path = tmp_path / "p.toml"
    path.write_text(POLYGON.replace("HOLES", holes), encoding="utf-8")
    bad_input(run("sections", "show", "P1", "--catalogue", path), "P1", *words)


def test_a_catalogue_without_a_material_lists_its_sections(tmp_path: Path) -> None:
    path = tmp_path / "c.toml"
    path.write_text(CATALOGUE.split("[[sections]]", 1)[1].join(["[[sections]]", ""]), encoding="utf-8")
    result = run("sections", "list", "--catalogue", path)
    assert result.exit_code == 0, result.output
    assert "F 30x8" in result.stdout and "—" in result.stdout  # no density: no mass


# ----------------------------------------------------------------------------------------------
# 6. resource limits

def test_a_device_or_an_oversized_file_is_refused_at_once(tmp_path: Path) -> None:
    started = time.monotonic()
    bad_input(run("check", "/dev/zero"), "/dev/zero", "not a plain file")
    big = tmp_path / "big.toml"
    with open(big, "wb") as stream:
        stream.truncate(MAX_INPUT_BYTES + 1)
    bad_input(run("forces", big), "16 MiB")
    bad_input(run("schedule", big), "16 MiB")
    assert time.monotonic() - started < 5


@pytest.mark.parametrize("jobs", ["1e20", "0", "-3", "two", "٣"])
def test_jobs_that_are_not_a_count_are_one_line(scheduled: Path, jobs: str) -> None:
    bad_input(run("schedule", scheduled, "--jobs", jobs), "--jobs")


def test_more_jobs_than_cores_run_on_the_cores() -> None:
    assert Workers(1000).count == default_jobs()  # --jobs 1000 once forked 1000 workers
    assert Workers(jobs_option("9" * 5000)).count == default_jobs()  # too long for int() to read: capped first


@pytest.mark.parametrize("address, words", [("ucx://10.0.0.5:8786", ("'ucx'", "tcp://")), ("tls://10.0.0.5:8786", ("'tls'",)),
                                            ("tcp://host:99999", ("port",)), ("tcp://a b:1", ("not a scheduler address",))])
def test_cluster_addresses_of_another_kind_are_refused(scheduled: Path, address: str, words: tuple[str, ...]) -> None:
    pytest.importorskip("distributed")
    bad_input(run("schedule", scheduled, "--cluster", address), "--cluster", *words)


def test_cluster_address_forms() -> None:
    assert cluster_host_port("tcp://10.0.0.5:8786") == ("10.0.0.5", 8786)
    assert cluster_host_port("10.0.0.5") == ("10.0.0.5", 8786)  # Dask's default port
    assert cluster_host_port("tcp://[::1]:9000") == ("::1", 9000)


def _serve_once(reply: bytes | None) -> tuple[int, threading.Thread | None]:
    """A local server on a free port that answers one connection with `reply` (None: refuses: closed port)."""
    server = socket.socket()
    server.bind(("127.0.0.1", 0))
    port = server.getsockname()[1]
    if reply is None:
        server.close()
        return port, None
    server.listen(1)

    def answer() -> None:
        with server:
            connection, _ = server.accept()
            with connection:
                connection.sendall(reply)
                time.sleep(0.2)

    thread = threading.Thread(target=answer, daemon=True)
    thread.start()
    return port, thread


@pytest.mark.parametrize("reply, words", [(None, ("cannot reach",)), (b"HTTP/1.1 400 Bad Request\r\n\r\n", ("not a Dask scheduler",))])
def test_a_closed_port_or_a_web_server_is_refused_quickly(scheduled: Path, reply: bytes | None, words: tuple[str, ...]) -> None:
    pytest.importorskip("distributed")
    port, thread = _serve_once(reply)
    started = time.monotonic()
    bad_input(run("schedule", scheduled, "--cluster", f"tcp://127.0.0.1:{port}"), "--cluster", *words)
    assert time.monotonic() - started < 5  # once 16 s (refused) and 59 s (a web server), or 3 EiB asked for
    if thread is not None:
        thread.join(1)


def test_a_csv_field_over_the_limit_is_one_line(folder: Path) -> None:
    schedule = folder / "s.csv"
    schedule.write_text("mark,file\n" + "B" * 200_000 + ",m.toml\n", encoding="utf-8")
    bad_input(run("schedule", schedule), "not a readable CSV table")


def test_memory_error_is_one_line_and_exit_2(capsys: pytest.CaptureFixture) -> None:
    def greedy() -> int:
        raise MemoryError

    with pytest.raises(typer.Exit) as stopped:
        run_guarded(greedy)
    assert stopped.value.exit_code == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("sizer: the request needs more memory")


def _callbacks(typer_app: typer.Typer) -> list[object]:
    """The function of every command of `typer_app` and of its command groups."""
    found: list[object] = [info.callback for info in typer_app.registered_commands]
    for group in typer_app.registered_groups:
        assert group.typer_instance is not None
        found += _callbacks(group.typer_instance)
    return found


def test_every_command_runs_under_the_guard() -> None:
    """Each command is a plain function run by cli_common.guarded, so bad input anywhere is one line
    and exit 2 (common practice: one convention, no command left out)."""
    callbacks = _callbacks(app)
    assert len(callbacks) == 12  # forces, check, size, report, init, schedule, span-table; sections list, show, build, add, import
    guard = guarded(lambda: 0).__code__
    assert all(getattr(callback, "__code__", None) is guard and hasattr(callback, "__wrapped__") for callback in callbacks)


def test_a_span_table_starts_its_first_cell_before_making_every_key(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    from sizer.span_table import read_span_table, run_span_table, search

    (tmp_path / "c.toml").write_text(CATALOGUE, encoding="utf-8")
    table = tmp_path / "t.toml"
    table.write_text('[span_table]\nmaterial = "steel"\nself_weight = false\nloads = [' + ", ".join(['"-1 kN/m"'] * 300) + "]\n",
                     encoding="utf-8")
    made: list[int] = []
    original = search.cell_key
    monkeypatch.setattr(search, "cell_key", lambda task, settings: made.append(1) or original(task, settings))

    class FirstCell(Exception):
        pass

    def first_cell(task: object) -> dict:
        raise FirstCell(len(made))

    monkeypatch.setattr(search, "work_cell", first_cell)
    with pytest.raises(FirstCell) as started:
        run_span_table(read_span_table(table), [tmp_path / "c.toml"], jobs=1, show_progress=False)
    assert started.value.args[0] == 1  # of 600 cells: the first runs at once


# ----------------------------------------------------------------------------------------------
# 7. byte-order marks and the cache folder

def test_a_csv_schedule_with_a_byte_order_mark_is_read(scheduled: Path) -> None:
    from sizer.schedule import read_schedule

    scheduled.write_bytes(b"\xef\xbb\xbf" + scheduled.read_bytes())  # as spreadsheets save UTF-8
    assert [row.mark for row in read_schedule(scheduled).rows] == ["B1"]


def test_an_unwritable_cache_names_the_variable_and_the_fix(scheduled: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    (tmp_path / "not_a_folder").write_text("x", encoding="utf-8")
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path / "not_a_folder" / "cache"))
    bad_input(run("schedule", scheduled, "--jobs", "1"), "SIZER_CACHE_DIR", "fix: set the environment variable SIZER_CACHE_DIR")
    assert cache_root() == tmp_path / "not_a_folder" / "cache"


# ----------------------------------------------------------------------------------------------
# messages

@pytest.mark.parametrize("args, words", [(["report", "m.toml"], ("Missing option '-o'", "sizer report --help")),
                                         (["check", "--bogus"], ("No such option: --bogus",)),
                                         (["size", "m.toml", "--top", "x"], ("'--top'",))])
def test_command_line_mistakes_are_one_line_from_the_sizer_command(args: list[str], words: tuple[str, ...],
                                                                  capsys: pytest.CaptureFixture) -> None:
    from sizer.cli import run_app

    assert run_app(args) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("sizer: command line: ") and all(word in lines[0] for word in words), lines


def test_a_span_step_longer_than_the_spans_names_the_resolution(tmp_path: Path) -> None:
    # once named "span_table.length", a key that does not exist
    table = tmp_path / "t.toml"
    table.write_text('[span_table]\nmaterial = "steel"\nloads = ["-1 kN/m"]\nresolution = "1 km"\n', encoding="utf-8")
    bad_input(run("span-table", table), "span_table.resolution", "max_span")


@pytest.mark.parametrize("line, key", [('restraint = "0.001 mm"', "span_table.restraint"), ('resolution = "1 µm"', "span_table.resolution")])
def test_a_span_table_with_restraints_every_micrometre_is_refused(tmp_path: Path, line: str, key: str) -> None:
    # point restraints every 0.001 mm ran past a minute (millions of restraints per trial)
    table = tmp_path / "t.toml"
    table.write_text(f'[span_table]\nmaterial = "steel"\nloads = ["-1 kN/m"]\n{line}\n', encoding="utf-8")
    bad_input(run("span-table", table), key)


def test_stock_lists_read_as_other_inputs(tmp_path: Path) -> None:
    # /dev/zero never returned; a name with a newline went into the catalogue, to be refused on every later read
    bad_input(run("sections", "import", "/dev/zero", "--shape", "rectangle"), "not a plain file")
    stock = tmp_path / "stock.csv"
    stock.write_text('name,depth,width\n"A\nB",30 mm,8 mm\n', encoding="utf-8")
    result = run("sections", "import", stock, "--shape", "rectangle")
    assert result.exit_code == 2 and "control character \\x0a" in result.stderr and result.stdout == ""
    stock.write_bytes(b"\xef\xbb\xbfname,depth,width\nF1,30 mm,8 mm\n")  # with a byte-order mark
    result = run("sections", "import", stock, "--shape", "rectangle")
    assert result.exit_code == 0 and 'name = "F1"' in result.stdout


@pytest.mark.parametrize("mark, kept", [("=HYPERLINK(\"http://x\")", False), ("+1+cmd", False), ("-2+3", False), ("@SUM(A1)", False),
                                        ("B-1", True), ("-1.5", True), ("1e3", True), ("Beam 3", True)])
def test_a_csv_text_cell_never_starts_a_formula(mark: str, kept: bool) -> None:
    """A text cell starting with = + - or @ that is not a number is written with a leading apostrophe
    (OWASP, "CSV Injection", from memory); numbers and other text as they are."""
    from sizer.render.schedule import _TextOnlyWriter

    buffer = io.StringIO()
    _TextOnlyWriter(buffer).writerow([mark, -2.5])
    first, number = next(csv.reader(io.StringIO(buffer.getvalue())))
    assert first == (mark if kept else "'" + mark) and float(number) == -2.5


def test_a_schedule_csv_writes_a_formula_like_mark_as_text(folder: Path) -> None:
    member(folder, with_section(BEAM))
    schedule = folder / "s.csv"
    schedule.write_text('mark,file\n"=1+2",m.toml\n', encoding="utf-8")
    out = folder / "out.csv"
    run("schedule", schedule, "--jobs", "1", "--csv", out)
    rows = list(csv.reader(out.open(encoding="utf-8")))
    assert rows[1][0] == "'=1+2"
