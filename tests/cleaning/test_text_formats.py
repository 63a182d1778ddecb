"""The format names and the text-table readers at the library level: which extension reads
as which format, which formats are written, and what the readers hand to the run loop
(rows, lines and marks). The command-line behaviour is in ``tests/cli/test_file_formats.py``.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from confspec.cleaning import (
    FORMATS,
    WRITTEN_FORMATS,
    ConfigurationCheck,
    InputError,
    JsonSink,
    JsonSource,
    PipeTableSource,
    RowJob,
    RowMark,
    format_of,
    normalized_rows,
    run,
)
from confspec.cleaning.run import OutputColumns


@pytest.mark.parametrize(("name", "expected"), [
    ("a.csv", "csv"), ("a.tsv", "tsv"), ("a.tab", "tsv"), ("a.jsonl", "jsonl"),
    ("a.ndjson", "jsonl"), ("a.json", "json"), ("a.JSON.gz", "json"), ("a.parquet", "parquet"),
    ("a.txt", "nist-text"), ("a.md", "markdown"), ("a.rst", "rst"), ("-", "csv"),
])
def test_the_extension_names_the_format(name: str, expected: str) -> None:
    assert format_of(name, None) == expected
    assert expected in FORMATS


def test_only_written_formats_are_outputs() -> None:
    assert set(WRITTEN_FORMATS) < set(FORMATS)
    for name in ("a.txt", "a.md", "a.rst"):
        with pytest.raises(InputError, match="is read, not written"):
            format_of(name, None, option="--output-format", written=True)
    with pytest.raises(InputError, match="unknown format 'markdown' for --report-format"):
        format_of("r.csv", "markdown", option="--report-format", written=True)
    with pytest.raises(InputError, match=r"give it with --input-format \(one of: csv"):
        format_of("a.xlsx", None)


def test_nist_text_marks_only_the_rows_it_changed(tmp_path: Path) -> None:
    path = tmp_path / "t.txt"
    path.write_text("Configuration | Term | J\n--------------|------|---\n"
                    "2s.2p         | 3P*  | 0\n"
                    "              |      | 1\n"
                    "Limit\n", "utf-8")
    source = PipeTableSource(str(path))
    try:
        (chunk,) = list(source.chunks(10))
    finally:
        source.close()
    assert chunk.rows == [["2s.2p", "3P*", "0"], ["2s.2p", "3P*", "1"], ["Limit", "", ""]]
    assert chunk.lines == [3, 4, 5]
    assert chunk.marks == [
        None, RowMark(("filled-from-above:Configuration", "filled-from-above:Term")),
        RowMark((), "Configuration", "Limit")]
    assert source.filled_cells == 2


def test_a_plain_table_carries_no_marks(tmp_path: Path) -> None:
    # the run loop then has nothing to add: the common case costs nothing more
    path = tmp_path / "t.txt"
    path.write_text("c | t\n---|---\n1s2 | 1S\n2s1 | 2S\n", "utf-8")
    source = PipeTableSource(str(path))
    try:
        assert [c.marks for c in source.chunks(1)] == [None, None]
    finally:
        source.close()


@settings(max_examples=40, deadline=None)
@given(st.lists(st.dictionaries(st.sampled_from(["c", "n", "x"]),
                                st.one_of(st.text(max_size=8), st.integers(), st.none(),
                                          st.lists(st.integers(), max_size=2)),
                                min_size=1), max_size=12),
       st.sampled_from([None, "records"]))
def test_json_round_trip_keeps_every_record(tmp_path_factory: pytest.TempPathFactory,
                                            records: list[dict[str, object]],
                                            key: str | None) -> None:
    # property: any array of records, bare or under a key, comes back with one record per
    # record, each with its own keys and values, the other members unchanged
    folder = tmp_path_factory.mktemp("json")
    document: object = records if key is None else {"a": 1, key: records, "z": [True]}
    path = folder / "in.json"
    path.write_text(json.dumps(document, indent=1), "utf-8")
    if not records:
        return
    source = JsonSource(str(path))
    extra = OutputColumns(status="_status", code="_code", fixes="_fixes")
    try:
        if "c" not in source.columns:  # the first record names the value column
            return
        sink = JsonSink(str(folder / "out.json"), envelope=source.envelope)
        run(source, RowJob(ConfigurationCheck()), ["c"],
            writers=[(sink, normalized_rows(source.columns.index("c"), extra))],
            chunk_size=5)
    finally:
        source.close()
    written = json.loads((folder / "out.json").read_text("utf-8"))
    rows = written if key is None else written[key]
    if key is not None:
        assert list(written) == ["a", key, "z"] and written["z"] == [True]
    assert len(rows) == len(records)
    for before, after in zip(records, rows, strict=True):
        assert set(after) - {"_status", "_code", "_fixes"} == set(before)
        assert {k: v for k, v in after.items() if k not in ("c", "_status", "_code",
                                                            "_fixes")} == {
            k: v for k, v in before.items() if k != "c"}
