"""Safe output (issue 11, point 4): umask modes, special files written directly, no clobbering
without --overwrite, messages that name the user's path, stale temporary files removed,
over-long cells flagged on their own row with flat memory."""

from __future__ import annotations

import csv
import io
import os
import socket
import stat
import subprocess
import sys
import threading
from pathlib import Path

import pytest

from confspec.cleaning import (
    ConfigurationCheck,
    CsvSink,
    CsvSource,
    InputError,
    JsonLinesSink,
    OutputColumns,
    RowJob,
    is_oversized,
    is_special_output,
    normalized_rows,
    run,
    stale_temporary_files,
    write_text_output,
)
from confspec.cleaning import files as files_module
from confspec.reading import MAX_INPUT_LENGTH


def _partials(directory: Path) -> list[str]:
    return sorted(p.name for p in directory.iterdir() if p.name.endswith(".partial"))


def _write(sink: CsvSink | JsonLinesSink) -> None:
    sink.write(["a"], [["1"], ["2"]], plain=True)
    sink.commit()


@pytest.mark.parametrize("umask", [0o022, 0o077, 0o002])
def test_regular_files_get_the_mode_the_umask_gives(tmp_path: Path, umask: int) -> None:
    old = os.umask(umask)
    try:
        _write(CsvSink(str(tmp_path / "out.csv")))
    finally:
        os.umask(old)
    assert stat.S_IMODE(os.stat(tmp_path / "out.csv").st_mode) == 0o666 & ~umask
    assert _partials(tmp_path) == []


def test_an_existing_file_needs_overwrite(tmp_path: Path) -> None:
    target = tmp_path / "out.csv"
    target.write_text("keep me\n")
    with pytest.raises(InputError, match=r"out\.csv: exists already; pass --overwrite"):
        CsvSink(str(target), overwrite=False)
    assert target.read_text() == "keep me\n"
    _write(CsvSink(str(target), overwrite=True))
    assert target.read_text() == "a\n1\n2\n"


def test_a_symlinked_output_stays_a_symlink(tmp_path: Path) -> None:
    real = tmp_path / "real.csv"
    real.write_text("old\n")
    link = tmp_path / "link.csv"
    link.symlink_to(real)
    _write(CsvSink(str(link)))
    assert link.is_symlink() and real.read_text() == "a\n1\n2\n"


def test_a_fifo_is_written_directly_and_stays_a_fifo(tmp_path: Path) -> None:
    fifo = tmp_path / "out.csv"
    os.mkfifo(fifo)
    assert is_special_output(str(fifo))
    got: list[bytes] = []
    reader = threading.Thread(target=lambda: got.append(fifo.read_bytes()))
    reader.start()
    _write(CsvSink(str(fifo)))
    reader.join(10)
    assert got == [b"a\n1\n2\n"]
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)
    assert _partials(tmp_path) == []


def test_dash_writes_the_process_stdout(capsys: pytest.CaptureFixture[str]) -> None:
    _write(JsonLinesSink("-"))
    assert capsys.readouterr().out == '{"a": "1"}\n{"a": "2"}\n'
    assert not sys.stdout.closed


def test_std_names_are_streams_without_touching_them() -> None:
    # /dev/stdout is never opened by name, stat-ed as a target or renamed over (never try it)
    for name in ("-", "/dev/stdout", "/dev/stderr", "/dev/fd/1", "/proc/self/fd/2"):
        assert is_special_output(name)
    assert is_special_output("/dev/null")
    assert not is_special_output("/nonexistent/x.csv")


def test_a_character_device_is_not_replaced(tmp_path: Path) -> None:
    before = os.stat("/dev/null")
    _write(CsvSink("/dev/null"))
    after = os.stat("/dev/null")
    assert stat.S_ISCHR(after.st_mode) and before.st_ino == after.st_ino


def test_a_write_error_names_the_users_path(tmp_path: Path,
                                            monkeypatch: pytest.MonkeyPatch) -> None:
    real_open = os.open

    def refuse(path: str, *args: object, **kwargs: object) -> int:
        if str(path).endswith(".partial"):
            raise PermissionError(13, "Permission denied", path)
        return real_open(path, *args, **kwargs)  # type: ignore[arg-type]

    monkeypatch.setattr(files_module.os, "open", refuse)
    with pytest.raises(InputError) as caught:
        CsvSink(str(tmp_path / "out.csv"))
    message = str(caught.value)
    assert message.startswith(f"{tmp_path / 'out.csv'}: cannot write (Permission denied)")
    assert ".partial" not in message


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes into a read-only directory")
def test_a_read_only_directory_names_the_users_path(tmp_path: Path) -> None:
    locked = tmp_path / "locked"
    locked.mkdir()
    locked.chmod(0o500)
    try:
        with pytest.raises(InputError, match=r"locked/out\.csv: cannot write"):
            CsvSink(str(locked / "out.csv"))
    finally:
        locked.chmod(0o700)


def _dead_pid() -> int:
    done = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                          capture_output=True, text=True, check=True)
    return int(done.stdout)


def test_stale_temporary_files_of_a_killed_run_are_removed(tmp_path: Path) -> None:
    host = files_module._HOST
    dead = tmp_path / f".out.csv.{host}-{_dead_pid()}-0123abcd.partial"
    alive = tmp_path / f".out.csv.{host}-{os.getppid()}-0123abcd.partial"
    other_host = tmp_path / f".out.csv.otherhost{socket.gethostname()}x-1-0123abcd.partial"
    legacy_old = tmp_path / ".out.csv.ab12cd_9.partial"
    legacy_new = tmp_path / ".out.csv.zz12cd_9.partial"
    other_output = tmp_path / f".other.csv.{host}-{_dead_pid()}-0123abcd.partial"
    for path in (dead, alive, other_host, legacy_old, legacy_new, other_output):
        path.write_text("partial")
    os.utime(legacy_old, (0, 0))
    assert set(stale_temporary_files(str(tmp_path / "out.csv"))) == {str(dead),
                                                                      str(legacy_old)}
    _write(CsvSink(str(tmp_path / "out.csv")))
    assert not dead.exists() and not legacy_old.exists()
    assert alive.exists() and other_host.exists() and legacy_new.exists()
    assert other_output.exists()


def test_write_text_output_is_atomic_and_refuses_to_clobber(tmp_path: Path) -> None:
    path = tmp_path / "summary.json"
    write_text_output(str(path), "{}\n")
    with pytest.raises(InputError, match="exists already"):
        write_text_output(str(path), "{}\n", overwrite=False)
    assert path.read_text() == "{}\n" and _partials(tmp_path) == []


# ----------------------------------------------------------------- over-long cells
def test_a_ten_megabyte_cell_flags_its_own_row(tmp_path: Path) -> None:
    data = tmp_path / "big.csv"
    with open(data, "w", newline="") as handle:
        writer = csv.writer(handle)
        writer.writerow(["configuration"])
        writer.writerows([["1s2"], ["x" * 10_000_000], ["2p7"], ["[Ne] 3s1"]])
    out = tmp_path / "out.csv"
    job = RowJob(ConfigurationCheck())
    source = CsvSource(str(data))
    try:
        summary = run(source, job, ["configuration"],
                      writers=[(CsvSink(str(out)), normalized_rows(0, OutputColumns()))])
    finally:
        source.close()
    assert summary.rows == 4 and summary.by_code["too-long"] == 1
    rows = list(csv.reader(io.StringIO(out.read_text())))
    assert [r[1] for r in rows[1:]] == ["ok", "error", "error", "ok"]
    assert rows[2][0] == "x" * 10_000_000 and rows[2][2] == "too-long"  # the cell is kept
    assert all(len(str(ex.value)) <= 201 for ex in summary.examples)
    assert job._lookup.cache_info().currsize == 3  # the huge key is not cached


def test_the_fast_path_never_sees_an_over_long_cell(monkeypatch: pytest.MonkeyPatch) -> None:
    from confspec.cleaning import check as check_module

    seen: list[int] = []
    real = check_module.fast_occupancies

    def spy(text: str) -> object:
        seen.append(len(text))
        return real(text)

    monkeypatch.setattr(check_module, "fast_occupancies", spy)
    outcome = ConfigurationCheck()("1s2 " * 2000)
    assert outcome.code == "too-long" and seen == []
    assert ConfigurationCheck()("1s2", "H" * 5000).code == "too-long"


def test_huge_keys_are_never_cached_so_memory_stays_flat() -> None:
    job = RowJob(ConfigurationCheck(), cache_size=1000)
    keys = [f"{i:08d}" + "y" * 1_000_000 for i in range(30)]
    assert all(is_oversized(k) for k in keys)
    outcomes = job.outcomes(keys)
    assert {o.code for o in outcomes} == {"too-long"}
    assert job._lookup.cache_info().currsize == 0
    for key, outcome in zip(keys, outcomes, strict=True):
        job.remember(key, outcome)
    assert not job._cache
    assert sum(len(o.errors[0].text or "") for o in outcomes) < 100 * len(keys)
    assert not is_oversized("x" * MAX_INPUT_LENGTH)
    assert is_oversized(("1s2", "x" * (MAX_INPUT_LENGTH + 1)))
