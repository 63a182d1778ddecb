"""The pandas integration: plain functions and the ``.confspec`` Series accessor."""

from __future__ import annotations

import pytest

pd = pytest.importorskip("pandas")

import confspec.pandas as cp  # noqa: E402
from confspec.cleaning import ConfigurationCheck  # noqa: E402

VALUES = ["[ar] 4s^2 3d^{6}", "1s2 2s2 2p7", None, "3d6 4s2", "[ar] 4s^2 3d^{6}", "1S2"]


def series(values: list[object] = VALUES, **kwargs: object) -> object:
    return pd.Series(values, index=[10, 11, 12, 13, 14, 15][: len(values)], dtype=object,
                     **kwargs)


def test_check_columns_and_index() -> None:
    report = cp.check(series())
    assert list(report.columns) == ["status", "code", "message", "normalized", "fixes"]
    assert list(report.index) == [10, 11, 12, 13, 14, 15]
    assert report["status"].tolist() == ["ok", "error", "error", "ok", "ok", "error"]
    assert report["code"].tolist() == [None, "pauli-limit", "empty", None, None,
                                       "uppercase-subshell"]
    assert report.loc[11, "message"] == "2p holds at most 6 electrons, not 7 (at character 11)"


def test_species_series_and_repairs() -> None:
    species = pd.Series(["Fe", "O", None, "Fe", "Fe2+", "He"], index=range(10, 16))
    report = cp.check(series(), species, fill_core=True, accept_uppercase=True)
    # 1S2 read as 1s2 (on request) holds He's two electrons
    assert report["code"].tolist() == [None, "pauli-limit", "empty", None, "electron-count",
                                       None]
    assert report.loc[15, "fixes"] == "accept-uppercase"
    assert report.loc[13, "fixes"] == "fill-core:[Ar]"
    assert report.loc[13, "normalized"] == "[Ar] 3d6 4s2"
    one = cp.check(series(), "Fe")  # one species for every row
    assert one["code"].tolist()[3] == "electron-count"


@pytest.mark.parametrize(("errors", "expected"), [
    pytest.param("keep", ["[Ar] 3d6 4s2", "1s2 2s2 2p7", None, "3d6 4s2", "[Ar] 3d6 4s2",
                          "1S2"], id="keep"),
    pytest.param("null", ["[Ar] 3d6 4s2", None, None, "3d6 4s2", "[Ar] 3d6 4s2", None],
                 id="null"),
])
def test_normalize(errors: str, expected: list[object]) -> None:
    out = cp.normalize(series(name="cfg"), errors=errors)  # type: ignore[arg-type]
    assert out.tolist() == expected
    assert out.name == "cfg" and list(out.index) == [10, 11, 12, 13, 14, 15]


def test_normalize_raise_names_the_row() -> None:
    with pytest.raises(ValueError, match=r"row 11: 2p holds at most 6 .* \[pauli-limit\]"):
        cp.normalize(series(), errors="raise")


def test_string_dtype_is_kept() -> None:
    values = pd.Series(["1s22s1", "2p7"], dtype="string")
    out = cp.normalize(values)
    assert out.dtype == values.dtype
    assert out.tolist() == ["[He] 2s1", "2p7"]


def test_is_valid_and_electron_count() -> None:
    assert cp.is_valid(series()).tolist() == [True, False, False, True, True, False]
    counts = cp.electron_count(series())
    assert str(counts.dtype) == "Int64"
    assert counts.isna().tolist() == [False, True, True, False, False, True]
    assert counts[10] == 26 and counts[13] == 8


def test_accessor() -> None:
    s = series()
    assert s.confspec.normalize(style="unicode").tolist()[0] == "[Ar] 3d⁶ 4s²"
    assert s.confspec.is_valid().sum() == 3
    assert s.confspec.check()["status"].tolist()[1] == "error"
    assert s.confspec.electron_count()[14] == 26


def test_each_distinct_value_is_read_once(monkeypatch: pytest.MonkeyPatch) -> None:
    calls: list[tuple[object, ...]] = []
    original = ConfigurationCheck.__call__

    def counting(self: ConfigurationCheck, *cells: str | None) -> object:
        calls.append(cells)
        return original(self, *cells)

    monkeypatch.setattr(ConfigurationCheck, "__call__", counting)
    monkeypatch.setattr(cp, "_JOBS", {})
    big = pd.Series(["[Ar] 3d6 4s2", "2p7", "1s2", None] * 2500, dtype=object)
    out = cp.normalize(big)
    assert len(out) == 10_000
    assert sorted(calls, key=str) == sorted([("[Ar] 3d6 4s2",), ("2p7",), ("1s2",), (None,)],
                                            key=str)


def test_empty_series() -> None:
    empty = pd.Series([], dtype=object)
    assert cp.normalize(empty).tolist() == []
    assert len(cp.check(empty)) == 0
    assert cp.is_valid(empty).tolist() == []
