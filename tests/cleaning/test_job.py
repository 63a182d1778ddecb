"""The per-row job and the streaming readers and writers shared by the CLI and the adapters."""

from __future__ import annotations

import csv
import pickle
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from confspec.cleaning import (
    MISSING,
    ConfigurationCheck,
    CsvSink,
    CsvSource,
    InputError,
    JsonLinesSink,
    JsonLinesSource,
    Outcome,
    OutputColumns,
    RowJob,
    cell_text,
    normalized_rows,
    report_rows,
    run,
)

CHECK_CASES = [
    # (options, configuration, species, status, code, normalized, fixes)
    pytest.param({}, "[ar] 4s^2 3d^{6}", None, "ok", None, "[Ar] 3d6 4s2", (), id="plain"),
    pytest.param({}, "[Ar] 3d6 4s2", "Fe", "ok", None, "[Ar] 3d6 4s2", (), id="species-ok"),
    pytest.param({}, "[Ar] 3d6", "Fe", "error", "electron-count", "[Ar] 3d6", (), id="count"),
    pytest.param({}, "[Ar] 3d5", "Fe(III)", "ok", None, "[Ar] 3d5", (), id="oxidation"),
    pytest.param({}, "[Ar] 3d5", "Fe III", "error", "electron-count", "[Ar] 3d5", (),
                 id="spectrum-label-is-fe2+"),
    pytest.param({}, "1s2 2s2 2p6", "O^{2−}", "ok", None, "[He] 2s2 2p6", (), id="anion"),
    pytest.param({}, "1s2", "Qq", "error", "unknown-element", "1s2", (), id="bad-species"),
    pytest.param({}, "1s2 2p7", None, "error", "pauli-limit", None, (), id="pauli"),
    pytest.param({}, None, None, "error", "empty", None, (), id="null-cell"),
    pytest.param({"fill_core": True}, "3d6 4s2", "Fe", "ok", None, "[Ar] 3d6 4s2",
                 ("fill-core:[Ar]",), id="fill-core"),
    pytest.param({"fill_core": True}, "3d6 4s2", None, "ok", None, "3d6 4s2", (),
                 id="fill-core-needs-species"),
    pytest.param({"fill_core": True}, "3d7 4s2", "Fe", "error", "electron-count", "3d7 4s2", (),
                 id="fill-core-only-when-it-fits"),
    pytest.param({"fill_core": True}, "4f14 5d10 6s1", "Au", "ok", None,
                 "[Xe] 4f14 5d10 6s1", ("fill-core:[Xe]",), id="fill-core-xe"),
    pytest.param({"accept_uppercase": True}, "1S2 2S2", None, "ok", None, "[He] 2s2",
                 ("accept-uppercase",), id="uppercase"),
    pytest.param({"accept_uppercase": True}, "[Ar] 3d6 4s2", None, "ok", None, "[Ar] 3d6 4s2",
                 (), id="uppercase-not-needed"),
    pytest.param({"repair_text": True}, "1sÂ² 2sÂ²", None, "ok", None, "[He] 2s2",
                 ("repair-text",), id="mojibake"),
    pytest.param({"repair_text": True, "accept_uppercase": True, "fill_core": True},
                 "3DÂ¹", "Sc2+", "ok", None, "[Ar] 3d1",
                 ("repair-text", "accept-uppercase", "fill-core:[Ar]"), id="all-repairs"),
    pytest.param({"strict": True}, "[Ar] 3d6 4s2", None, "ok", None, "[Ar] 3d6 4s2", (),
                 id="strict-canonical"),
    pytest.param({"strict": True}, "[Ar] 4s2 3d6", None, "error", "non-canonical",
                 "[Ar] 3d6 4s2", (), id="strict-non-canonical"),
    pytest.param({"style": "unicode", "core": "expand"}, "[He] 2s2", None, "ok", None,
                 "1s² 2s²", (), id="format-options"),
]


@pytest.mark.parametrize(("options", "config", "species", "status", "code", "normalized",
                          "fixes"), CHECK_CASES)
def test_configuration_check(options: dict[str, object], config: str | None,
                             species: str | None, status: str, code: str | None,
                             normalized: str | None, fixes: tuple[str, ...]) -> None:
    outcome = ConfigurationCheck(**options)(config, species)  # type: ignore[arg-type]
    assert (outcome.status, outcome.code, outcome.normalized, outcome.fixes) == (
        status, code, normalized, fixes)
    assert outcome.ok == (status == "ok")


def test_unknown_style_is_refused_early() -> None:
    with pytest.raises(ValueError, match="unknown style 'fancy'"):
        ConfigurationCheck(style="fancy")


def test_outcome_and_check_survive_pickling() -> None:
    check = ConfigurationCheck(fill_core=True, style="latex")
    outcome = check("1s2 2p7", None)
    assert pickle.loads(pickle.dumps(check)) == check
    copy = pickle.loads(pickle.dumps(outcome))
    assert copy.code == "pauli-limit" and copy.message == outcome.message


@pytest.mark.parametrize(("value", "text"), [
    pytest.param(None, None, id="none"),
    pytest.param(MISSING, None, id="missing"),
    pytest.param(float("nan"), None, id="nan"),
    pytest.param("1s2", "1s2", id="str"),
    pytest.param(b"1s\xc2\xb2", "1s²", id="bytes"),
    pytest.param(12, "12", id="int"),
    pytest.param([1, "a"], '[1, "a"]', id="list"),
])
def test_cell_text(value: object, text: str | None) -> None:
    assert cell_text(value) == text


class Counting:
    """A check that counts its calls (the job must call it once per distinct input)."""

    roles = ("configuration",)

    def __init__(self) -> None:
        self.calls = 0
        self.inner = ConfigurationCheck()

    def __call__(self, *cells: str | None) -> Outcome:
        self.calls += 1
        return self.inner(*cells)


def test_row_job_reads_each_distinct_value_once() -> None:
    check = Counting()
    job = RowJob(check, cache_size=100)
    keys = [("1s2",), ("2p7",), ("1s2",), (None,)] * 250
    outcomes = job.outcomes(keys)
    assert len(outcomes) == 1000
    assert check.calls == 3 == job.computed
    assert [o.status for o in outcomes[:4]] == ["ok", "error", "ok", "error"]


def test_row_job_cache_is_bounded_and_results_unchanged() -> None:
    check = Counting()
    job = RowJob(check, cache_size=3)
    keys = [(f"[Ar] 3d{i % 10}",) for i in range(200)]
    small = job.outcomes(keys)
    assert job._lookup.cache_info().currsize <= 3
    assert check.calls == 200  # ten values cycling through three slots: all misses
    assert [o.normalized for o in small] == [o.normalized for o in
                                             RowJob(ConfigurationCheck()).outcomes(keys)]


def _csv(path: Path, text: str) -> Path:
    path.write_text(text, "utf-8")
    return path


def test_csv_source_numbers_rows_and_lines(tmp_path: Path) -> None:
    source = CsvSource(str(_csv(tmp_path / "a.csv",
                                'a,c\n1,"1s2\n2s1"\n\n2,2p6\n3,"x,y"\n')))
    chunks = list(source.chunks(2))
    source.close()
    assert [c.first_row for c in chunks] == [1, 3]
    assert [c.lines for c in chunks] == [[3, 5], [6]]  # a row's line is where it ends
    assert [r for c in chunks for r in c.rows] == [["1", "1s2\n2s1"], ["2", "2p6"],
                                                   ["3", "x,y"]]
    assert source.blank_lines == 1


def test_single_column_blank_line_is_an_empty_value(tmp_path: Path) -> None:
    source = CsvSource(str(_csv(tmp_path / "a.csv", "c\n1s2\n\n2s1\n")))
    rows = [r for c in source.chunks(10) for r in c.rows]
    source.close()
    assert rows == [["1s2"], [""], ["2s1"]]


@pytest.mark.parametrize(("text", "message"), [
    pytest.param('c\n"1s2\n', "line 2: malformed CSV", id="unterminated"),
    pytest.param("a,c\n1\n", "line 2: 1 fields where the header has 2", id="short-row"),
])
def test_csv_source_refuses_malformed_lines(tmp_path: Path, text: str, message: str) -> None:
    source = CsvSource(str(_csv(tmp_path / "m.csv", text)))
    with pytest.raises(InputError, match=message):
        list(source.chunks(10))
    source.close()


def test_jsonl_keys_missing_stay_missing(tmp_path: Path) -> None:
    path = _csv(tmp_path / "a.jsonl", '{"c": "1s2"}\n{"d": 1, "c": "2s1"}\n')
    source = JsonLinesSource(str(path))
    (chunk,) = list(source.chunks(10))
    source.close()
    assert chunk.columns == ["c", "d"]
    assert chunk.rows == [["1s2", MISSING], ["2s1", 1]]
    out = tmp_path / "o.jsonl"
    sink = JsonLinesSink(str(out))
    sink.write(chunk.columns, chunk.rows)
    sink.commit()
    assert out.read_text("utf-8") == '{"c": "1s2"}\n{"c": "2s1", "d": 1}\n'


def test_sink_abort_leaves_nothing(tmp_path: Path) -> None:
    sink = CsvSink(str(tmp_path / "o.csv"))
    sink.write(["c"], [["1s2"]])
    sink.abort()
    assert list(tmp_path.iterdir()) == []


def _run_csv(tmp_path: Path, values: list[str], **options: object) -> tuple[list[list[str]],
                                                                              list[list[str]]]:
    source_path = tmp_path / "in.csv"
    with open(source_path, "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(["n", "c"])
        writer.writerows([str(i), v] for i, v in enumerate(values))
    source = CsvSource(str(source_path), encoding="utf-8")
    out, report = CsvSink(str(tmp_path / "out.csv")), CsvSink(str(tmp_path / "report.csv"))
    run(source, RowJob(ConfigurationCheck(), cache_size=4), ["c"],
        writers=[(report, report_rows([1])), (out, normalized_rows(1, OutputColumns()))],
        chunk_size=3, **options)  # type: ignore[arg-type]
    source.close()
    with open(tmp_path / "out.csv", encoding="utf-8", newline="") as handle:
        written = list(csv.reader(handle))
    with open(tmp_path / "report.csv", encoding="utf-8", newline="") as handle:
        reported = list(csv.reader(handle))
    return written, reported


CELLS = st.one_of(
    st.sampled_from(["[Ar] 3d6 4s2", "1s22s22p6", "2p7", "", "[Ne] 2p^-1 3s2", "3d 6 4s 2",
                     "[ar]3d104s2", "2p<sup>6</sup>", "1S2", "Fe", "\u200b1s2"]),
    st.text(alphabet="0123456789spdf^{}[]ArNe -.,²⁶\n\"", max_size=12),
)


@settings(max_examples=40, deadline=None)
@given(st.lists(CELLS, max_size=25))
def test_every_row_in_is_one_row_out_in_order(tmp_path_factory: pytest.TempPathFactory,
                                              values: list[str]) -> None:
    tmp_path = tmp_path_factory.mktemp("rows")
    written, reported = _run_csv(tmp_path, values)
    assert written[0] == ["n", "c", "status", "code", "fixes"]
    assert [r[0] for r in written[1:]] == [str(i) for i in range(len(values))]
    assert [r[1] for r in reported[1:]] == values  # the report keeps the input text
    for (_, text, status, *_), value in zip(written[1:], values, strict=True):
        if status == "error":
            assert text == value  # a flagged row keeps its original text
    assert len(reported) == len(written) == len(values) + 1


@pytest.mark.slow
def test_worker_processes_give_the_same_rows(tmp_path: Path) -> None:
    values = [f"{n}s2 {n}p{k}" for n in range(2, 7) for k in range(9)] * 7
    (tmp_path / "a").mkdir()
    (tmp_path / "b").mkdir()
    one = _run_csv(tmp_path / "a", values)
    two = _run_csv(tmp_path / "b", values, jobs=2)
    assert one == two
