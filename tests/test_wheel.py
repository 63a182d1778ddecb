"""The grammar ships inside the wheel: build it, install it into a fresh venv, parse there."""

from __future__ import annotations

import subprocess
import sys
import venv
import zipfile
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


@pytest.mark.slow
def test_installed_wheel_parses(tmp_path: Path) -> None:
    dist = tmp_path / "dist"
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist),
                    str(ROOT)], check=True)
    (wheel,) = dist.glob("confspec-*.whl")
    names = zipfile.ZipFile(wheel).namelist()
    assert "confspec/notation/configuration.lark" in names
    assert "confspec/py.typed" in names
    assert "confspec/data/elements.csv" in names
    assert "_confspec_launch.py" in names  # the console script's start-up module

    # a fresh venv without a pip of its own (bootstrapping one costs seconds): this pip
    # installs the wheel and its dependencies into it (pip's --python, pip >= 22.3)
    env = tmp_path / "venv"
    venv.create(env, with_pip=False)
    python = env / "bin" / "python"
    subprocess.run([sys.executable, "-m", "pip", "--python", str(python), "install", "-q",
                    "--disable-pip-version-check", str(wheel)], check=True)
    script = (
        "import confspec, pathlib\n"
        "assert 'site-packages' in confspec.__file__, confspec.__file__\n"
        "print(confspec.parse('[ar] 4s^2 3d^{6}'), confspec.parse('[Ne] 2p⁻¹ 3s²'),"
        " confspec.parse_species('Fe(III)'))\n")
    out = subprocess.run([str(python), "-c", script], check=True, capture_output=True,
                         text=True, cwd=tmp_path)
    assert out.stdout.split() == ["[Ar]", "3d6", "4s2", "[He]", "2s2", "2p5", "3s2", "Fe3+"]
    command = subprocess.run([str(env / "bin" / "confspec"), "show", "[Ar] 3d6 4s2"],
                             capture_output=True, text=True, check=False, cwd=tmp_path)
    assert command.returncode == 0 and "[Ar] 3d6 4s2" in command.stdout, command.stderr
