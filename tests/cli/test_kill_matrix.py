"""The kill matrix (issue 11, point 6): `confspec normalize` on 200k generated rows, killed with
SIGKILL and SIGTERM at several moments. Whatever the moment: the input is unchanged, no partial
output is visible under the output's name, the next run succeeds and leaves no stale temporary
file. Run with ``-s`` to see the matrix (moment x signal -> outcome)."""

from __future__ import annotations

import hashlib
import signal
import subprocess
import time
from pathlib import Path

import pytest

from .runner import COMMAND

ROWS = 200_000
VALUES = ["[ar] 4s2 3d6", "1s2 2s2", "2p7", "[Ne] 3s1", "", "4f14 5d10", "[Kr] 5s1"]

#: moment -> (what it means, when to send the signal)
MOMENTS = ["start-up", "temp-created", "a third written", "nine tenths written"]


def _generate(path: Path) -> int:
    with open(path, "w") as handle:
        handle.write("id,configuration\n")
        handle.writelines(f"{i},{VALUES[i % len(VALUES)]}\n" for i in range(ROWS))
    return path.stat().st_size


def _partials(directory: Path) -> list[Path]:
    return [p for p in directory.iterdir() if p.name.endswith(".partial")]


def _wait_for(directory: Path, size: int, deadline: float) -> bool:
    while time.monotonic() < deadline:
        for part in _partials(directory):
            try:
                if part.stat().st_size >= size:
                    return True
            except FileNotFoundError:
                pass
        time.sleep(0.001)
    return False


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.mark.slow
def test_kill_matrix(tmp_path: Path) -> None:
    data = tmp_path / "in.csv"
    in_size = _generate(data)
    digest = _digest(data)
    expected = int(in_size * 1.5)  # the output is about half as long again (status columns)
    matrix: list[tuple[str, str, str]] = []
    for moment in MOMENTS:
        for sig in (signal.SIGKILL, signal.SIGTERM):
            work = tmp_path / f"{moment.replace(' ', '-')}-{sig.name}"
            work.mkdir()
            out = work / "out.csv"
            args = [*COMMAND, "normalize", str(data), "-c", "configuration", "-o", str(out),
                    "--chunk-rows", "2000", "--fail-on", "never", "-q"]
            process = subprocess.Popen(args, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                                       text=True)
            deadline = time.monotonic() + 60
            if moment == "start-up":
                time.sleep(0.05)
                reached = True
            elif moment == "temp-created":
                reached = _wait_for(work, 0, deadline)
            elif moment == "a third written":
                reached = _wait_for(work, expected // 3, deadline)
            else:
                reached = _wait_for(work, expected * 9 // 10, deadline)
            process.send_signal(sig)
            _, stderr = process.communicate(timeout=60)
            finished = process.returncode == 0
            assert _digest(data) == digest, "the input changed"
            assert "Traceback" not in stderr, stderr
            left = _partials(work)
            if finished:  # the run won the race: the whole output, committed
                assert len(out.read_text().splitlines()) == ROWS + 1
            else:
                assert not out.exists(), "a partial output is visible"
            if sig == signal.SIGTERM and not finished:
                assert process.returncode in (143, -15), stderr
                if process.returncode == 143:
                    assert "stopped by SIGTERM" in stderr and not left
            outcome = ("finished first" if finished else
                       f"exit {process.returncode}, {len(left)} temp file(s) left"
                       + ("" if reached else " (moment not reached)"))
            rerun = subprocess.run([*args, "--overwrite"], capture_output=True, text=True,
                                   timeout=120, check=False)
            assert rerun.returncode == 0, rerun.stderr
            assert len(out.read_text().splitlines()) == ROWS + 1
            assert not _partials(work), "the next run left a stale temporary file"
            matrix.append((moment, sig.name, outcome + "; next run ok, no temp file"))
    print("\nkill matrix (moment x signal -> outcome):")
    for moment, name, outcome in matrix:
        print(f"  {moment:<20} {name:<8} {outcome}")
