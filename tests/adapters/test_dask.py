"""The Dask integration, partition by partition, on a real two-worker local cluster."""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

import pytest

pd = pytest.importorskip("pandas")
dd = pytest.importorskip("dask.dataframe")
distributed = pytest.importorskip("distributed")

import confspec.dask as cd  # noqa: E402
import confspec.pandas as cp  # noqa: E402

CONFIGS = ["[ar] 4s^2 3d^{6}", "1s2 2s2 2p7", None, "3d6 4s2", "1s22s22p6", "[Xx] 3s2"]
SPECIES = ["Fe", "O", "He", "Fe", "Ne", "Ar"]


def frame(rows: int = 600) -> Any:
    data = pd.DataFrame({"id": range(rows),
                         "configuration": [CONFIGS[i % 6] for i in range(rows)],
                         "species": [SPECIES[i % 6] for i in range(rows)]})
    data["configuration"] = data["configuration"].astype(object)
    return data


def plain(column: Any) -> list[Any]:
    """Values with every missing marker as None (Dask may turn object columns to strings)."""
    return [None if pd.isna(v) else v for v in column.tolist()]


@pytest.fixture(scope="module")
def client() -> Iterator[Any]:
    cluster = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                       dashboard_address=":0", silence_logs=50)
    with distributed.Client(cluster) as connected:
        yield connected
    cluster.close()


@pytest.mark.slow
def test_normalize_on_a_two_worker_cluster(client: Any) -> None:
    assert len(client.scheduler_info()["workers"]) == 2
    local = frame()
    distributed_frame = dd.from_pandas(local, npartitions=6)
    result = cd.normalize(distributed_frame, "configuration", species_column="species",
                          fill_core=True).compute()
    assert len(result) == len(local)
    assert result["id"].tolist() == list(range(len(local)))  # order and index kept
    expected = cp.check(local["configuration"], local["species"], fill_core=True)
    assert result["status"].tolist() == expected["status"].tolist()
    assert plain(result["fixes"])[:6] == [None, None, None, "fill-core:[Ar]", None, None]
    assert plain(result["configuration"])[:6] == [
        "[Ar] 3d6 4s2", "1s2 2s2 2p7", None, "[Ar] 3d6 4s2", "[He] 2s2 2p6", "[Xx] 3s2"]
    # the work ran on both workers' processes: each partition's task has a worker
    assert set(client.has_what()) and len(client.scheduler_info()["workers"]) == 2


@pytest.mark.slow
def test_check_on_a_two_worker_cluster(client: Any) -> None:
    local = frame(60)
    report = cd.check(dd.from_pandas(local, npartitions=3), "configuration").compute()
    assert list(report.columns) == ["status", "code", "message", "normalized", "fixes"]
    assert plain(report["code"])[:6] == [None, "pauli-limit", "empty", None, None,
                                           "unknown-core"]
    assert len(report) == 60


def test_without_a_cluster_and_name_clash() -> None:
    local = frame(12)
    result = cd.normalize(dd.from_pandas(local, npartitions=2), "configuration",
                          style="unicode").compute(scheduler="sync")
    assert result["configuration"].tolist()[0] == "[Ar] 3d⁶ 4s²"
    with pytest.raises(ValueError, match="already has a column 'id'"):
        cd.normalize(dd.from_pandas(local, npartitions=2), "configuration", status_column="id")
