"""Dataframe paths flag cells that are not text (lists, dicts, sets) like the CLI does, and
name a missing column in our words."""

from __future__ import annotations

import pytest

pd = pytest.importorskip("pandas")

import confspec  # noqa: E402
import confspec.pandas as cp  # noqa: E402

CELLS = ["[Ar] 3d6 4s2", ["x"], {"a": 1}, {1, 2}, None]


def test_unhashable_cells_are_flagged_in_every_function() -> None:
    values = pd.Series(CELLS, dtype=object)
    report = cp.check(values)
    assert list(report["status"]) == ["ok", "error", "error", "error", "error"]
    assert list(cp.is_valid(values)) == [True, False, False, False, False]
    assert next(iter(cp.normalize(values))) == "[Ar] 3d6 4s2"
    assert list(cp.normalize(values))[1:4] == CELLS[1:4]  # kept as they were
    assert int(cp.electron_count(values)[0]) == 26
    species = pd.Series([["Fe"], "He"], dtype=object)
    assert list(cp.check(pd.Series(["1s2", "1s2"]), species)["status"]) == ["error", "ok"]


def test_dask_names_a_missing_column() -> None:
    dd = pytest.importorskip("dask.dataframe")
    import confspec.dask as cd

    frame = dd.from_pandas(pd.DataFrame({"c": ["1s2"]}), npartitions=1)
    for call in (cd.check, cd.normalize):
        with pytest.raises(confspec.ConfspecError) as info:
            call(frame, "configuration")
        assert info.value.code == "unknown-column" and "'configuration'" in info.value.message
