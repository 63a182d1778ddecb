"""``confspec check`` and ``confspec normalize``: open the input (file or database), run the
row check over it and print a summary; ``normalize`` also writes the rewritten rows (to a file,
a new table or new columns of the input table), ``check`` at most a per-row report.

Output files are written beside their target and renamed into place at the end, so an
interrupted run leaves no half-written file.
"""

from __future__ import annotations

import argparse
import dataclasses
import json
import os
import re
import sys
from textwrap import fill
from typing import IO, Any

from ..cleaning import (
    KEY_COLUMN,
    STDIN,
    STREAM_NAMES,
    ConfigurationCheck,
    CsvSink,
    CsvSource,
    Database,
    InPlaceSink,
    InputError,
    JsonEnvelope,
    JsonLinesSink,
    JsonLinesSource,
    JsonSink,
    JsonSource,
    LevelCheck,
    OutputColumns,
    ParquetSink,
    ParquetSource,
    PipeTableSource,
    Progress,
    ReplayedSource,
    RowJob,
    RowWriter,
    RstTableSource,
    Sink,
    Source,
    Summary,
    TableSink,
    TableSource,
    abort_unfinished,
    decide_parity,
    format_of,
    in_place_rows,
    is_database,
    is_special_output,
    locate,
    mask_secrets,
    normalized_rows,
    open_database,
    repair_text_available,
    report_rows,
    run,
    same_database,
    write_text_output,
)
from .common import indent, say

__all__ = ["run_check", "run_normalize"]


# ===================================================================== summary
def _short(value: Any, width: int = 60) -> str:
    text = repr(value)
    return text if len(text) <= width else text[: width - 1] + "…"


def _wrapped(items: list[str], width: int) -> list[str]:
    lines: list[str] = []
    for item in items:
        if lines and len(lines[-1]) + 2 + len(item) <= width:
            lines[-1] += ", " + item
        else:
            lines.append(item)
    return lines


def _print_summary(summary: Summary, what: str, *, out: IO[str],
                   args: argparse.Namespace | None = None) -> None:
    total = summary.rows
    share = f" ({summary.valid / total:.1%})" if total else ""
    say(what, out)
    decision = None if args is None else getattr(args, "parity_decision", None)
    if decision is not None:  # it explains the figures below, so it comes first
        say(fill(decision.describe(), width=92, initial_indent="  ",
                 subsequent_indent="    "), out)
    say(f"  rows read   {total:>10,}", out)
    say(f"  valid       {summary.valid:>10,}{share}", out)
    say(f"  invalid     {summary.invalid:>10,}", out)
    if summary.repaired_rows:
        kinds = ", ".join(f"{k} {v:,}" for k, v in summary.fixes.most_common())
        say(f"  repaired    {summary.repaired_rows:>10,}  ({kinds})", out)
    if summary.blank_lines:
        say(f"  blank lines {summary.blank_lines:>10,}  (not rows; skipped)", out)
    if summary.filled_cells:
        say(f"  filled      {summary.filled_cells:>10,}  (blank cells repeating the row above;"
            " each row says which in its fixes)", out)
    if summary.by_code:
        say("  invalid rows by code (of their first problem):", out)
        for line in _wrapped([f"{code} {count:,}" for code, count
                              in summary.by_code.most_common()], width=92):
            say("    " + line, out)
    if summary.examples:
        say(f"  first {len(summary.examples)} invalid rows:", out)
        for ex in summary.examples:
            where = f"row {ex.row:,}" + (f" (line {ex.line:,})" if ex.line else "")
            say(f"    {where}: {_short(ex.value)}", out)
            if ex.outcome.fixes and ex.outcome.checked is not None:
                say(f"      after {', '.join(ex.outcome.fixes)}: {ex.outcome.checked!r}", out)
            elif ex.outcome.fixes:  # recorded, not rewritten (parents, notes, spectrum)
                say(f"      recorded {', '.join(ex.outcome.fixes)}", out)
            for err in ex.outcome.errors[:3]:
                say(indent(err.render(), 6), out)
            if len(ex.outcome.errors) > 3:
                say(f"      … and {len(ex.outcome.errors) - 3} more", out)


# ===================================================================== sources and sinks
class _Opened:
    """What a command opened, closed in reverse order at the end."""

    def __init__(self) -> None:
        self.databases: list[Database] = []
        self.sources: list[Source] = []

    def close(self) -> None:
        abort_unfinished()  # an output made but never committed (a stop before the run)
        for source in self.sources:
            source.close()
        for db in self.databases:
            db.close()


def _levels_asked(args: argparse.Namespace) -> bool:
    return bool(getattr(args, "level", False) or getattr(args, "term_column", None)
                or getattr(args, "j_column", None))


def _check_from(args: argparse.Namespace) -> ConfigurationCheck | LevelCheck:
    if args.repair_text and not repair_text_available():
        raise InputError("--repair-text needs ftfy: pip install 'confspec[tables]'")
    if _levels_asked(args):
        if args.j_column and not args.term_column and not args.level:
            raise InputError("--j-column needs --term-column (or --level)")
        return LevelCheck(strict=getattr(args, "strict", False),
                          accept_uppercase=args.accept_uppercase,
                          term_column=bool(args.term_column), style=args.style, core=args.core,
                          order=args.order, fill_core=args.fill_core,
                          repair_text=args.repair_text,
                          parity="marked" if args.parity == "auto" else args.parity)
    return ConfigurationCheck(strict=getattr(args, "strict", False),
                              accept_uppercase=args.accept_uppercase, fill_core=args.fill_core,
                              repair_text=args.repair_text, style=args.style, core=args.core,
                              order=args.order)


def _job(args: argparse.Namespace, check: ConfigurationCheck | LevelCheck, source: Source,
         opened: _Opened) -> tuple[Source, RowJob]:
    """The row job; for levels with ``--parity auto``, the column's convention decided first
    (an input read once more, or standard input held until its first odd mark)."""
    if not isinstance(check, LevelCheck) or getattr(args, "parity", "auto") != "auto":
        return source, RowJob(check, args.cache_size)
    column = args.term_column or args.column
    if args.input == STDIN and not args.table:
        seen: list[Any] = []
        stream = source.chunks(args.chunk_rows)
        decision = decide_parity(stream, source.columns, column, source.label,
                                 term_cells=bool(args.term_column), seen=seen)
        source = ReplayedSource(source, seen, stream)
    else:
        again = _Opened()
        try:
            fresh = _open_source(args, again)
            decision = decide_parity(fresh.chunks(args.chunk_rows), fresh.columns, column,
                                     fresh.label, term_cells=bool(args.term_column))
        finally:  # not _Opened.close(): that also aborts the outputs already made
            for opened_source in again.sources:
                opened_source.close()
            for db in again.databases:
                db.close()
    args.parity_decision = decision
    return source, RowJob(dataclasses.replace(check, parity=decision.convention),
                          args.cache_size)


def _open_source(args: argparse.Namespace, opened: _Opened, *, writable: bool = False,
                 tabular_output: bool = False, in_place: bool = False) -> Source:
    target: str = args.input
    if args.table or is_database(target):
        if not args.table:
            raise InputError(f"{mask_secrets(target)}: a database input needs --table NAME")
        db = open_database(target, read_only=not writable)
        opened.databases.append(db)
        only = None
        if in_place:
            only = [name for name in _role_columns(args) if name]
            columns = db.columns(args.table) if db.has_table(args.table) else []
            for name in only:
                if columns:
                    locate(columns, name, f"{db.label} table {args.table}")
        source: Source = TableSource(db, args.table, only=only, keyed=in_place)
        if isinstance(source, TableSource) and _progress(args).enabled:
            source.count_rows()
    else:
        if in_place:
            raise InputError("--in-place-column is for database inputs; write files with -o")
        fmt = format_of(target, args.input_format)
        if args.records_key is not None and fmt != "json":
            raise InputError(f"--records-key names the array of records in a plain JSON "
                             f"input; {target} is read as {fmt}")
        if fmt in ("csv", "tsv"):
            source = CsvSource(target, delimiter="\t" if fmt == "tsv" else ",",
                               encoding=args.encoding)
        elif fmt == "jsonl":
            source = JsonLinesSource(target, encoding=args.encoding, scan_keys=tabular_output)
        elif fmt == "json":
            source = JsonSource(target, encoding=args.encoding, scan_keys=tabular_output,
                                records_key=args.records_key)
        elif fmt in ("nist-text", "markdown"):
            source = PipeTableSource(target, flavor=fmt, encoding=args.encoding)
        elif fmt == "rst":
            source = RstTableSource(target, encoding=args.encoding)
        else:
            source = ParquetSource(target)
    opened.sources.append(source)
    return source


def _file_sink(path: str, fmt: str | None, *, types: dict[str, Any] | None = None,
               overwrite: bool = False, option: str = "--output-format",
               envelope: JsonEnvelope | None = None) -> Sink:
    kind = format_of(path, fmt, option=option, written=True)
    if kind == "json":
        return JsonSink(path, envelope=envelope, overwrite=overwrite)
    if kind == "csv":
        return CsvSink(path, overwrite=overwrite)
    if kind == "tsv":
        return CsvSink(path, delimiter="\t", overwrite=overwrite)
    if kind == "jsonl":
        return JsonLinesSink(path, overwrite=overwrite)
    if is_special_output(path):
        raise InputError(f"{path}: Parquet is written to files only, not to a stream or a "
                         "device; write CSV, TSV or JSON Lines there (--output-format)")
    return ParquetSink(path, types=types, overwrite=overwrite)


def _to_stdout(args: argparse.Namespace) -> list[str]:
    """The options whose data go to stdout (at most one may)."""
    named = [("--output", getattr(args, "output", None)), ("--report", args.report),
             ("--summary-json", args.summary_json)]
    return [option for option, path in named if path is not None
            and STREAM_NAMES.get(path) == 1]


def _summary_stream(args: argparse.Namespace) -> IO[str]:
    """Where the human summary goes: stdout, unless stdout carries data."""
    return sys.stderr if _to_stdout(args) else sys.stdout


def _check_outputs(args: argparse.Namespace) -> None:
    """Refusals that must come before any work: two outputs on stdout, an existing summary
    file without --overwrite."""
    on_stdout = _to_stdout(args)
    if len(on_stdout) > 1:
        raise InputError(f"{' and '.join(on_stdout)} both write to stdout; send one of them to "
                         "a file")
    summary = args.summary_json
    if (summary is not None and not args.overwrite and not is_special_output(summary)
            and os.path.exists(summary)):
        raise InputError(f"{summary}: exists already; pass --overwrite to replace it")


def _exit_status(summary: Summary, fail_on: str) -> int:
    """0 or 1 by the --fail-on policy: any flagged row, flagged rows but empty ones, never."""
    if fail_on == "never":
        return 0
    if fail_on == "errors":
        return 1 if summary.invalid - summary.by_code.get("empty", 0) > 0 else 0
    return 0 if summary.invalid == 0 else 1


def _finish(args: argparse.Namespace, summary: Summary, facts: dict[str, Any]) -> int:
    """The exit status; the JSON summary written when asked for."""
    status = _exit_status(summary, args.fail_on)
    if args.summary_json is not None:
        data = {"command": args.command, **facts, "fail_on": args.fail_on,
                "exit_status": status, **summary.as_dict()}
        write_text_output(args.summary_json,
                          json.dumps(data, ensure_ascii=False, indent=2) + "\n",
                          overwrite=True)  # refused before the run unless --overwrite
    return status


def _refuse_same_file(input_path: str, output: str, what: str) -> None:
    if is_database(input_path) or is_database(output):
        return
    if input_path == STDIN or is_special_output(output):
        return
    try:
        same = os.path.exists(output) and os.path.samefile(input_path, output)
    except OSError:
        same = False
    if same:
        raise InputError(f"{output}: the {what} would overwrite the input; the input is never "
                         "modified, choose another name")


def _progress(args: argparse.Namespace) -> Progress:
    choice = getattr(args, "progress", "auto")
    return Progress(enabled=None if choice == "auto" else choice == "always")


def _role_columns(args: argparse.Namespace) -> list[str | None]:
    if _levels_asked(args):
        return [args.column, args.species_column, args.term_column, args.j_column]
    return [args.column, args.species_column]


def _locate_roles(source: Source, args: argparse.Namespace) -> None:
    for name in _role_columns(args)[1:]:
        if name:
            locate(source.columns, name, source.label)


def _report_sink(args: argparse.Namespace) -> Sink | None:
    if not args.report:
        return None
    if is_database(args.report):
        raise InputError(f"{args.report}: the report is a file (CSV, TSV, JSON Lines, JSON, "
                         "Parquet)")
    _refuse_same_file(args.input, args.report, "report")
    return _file_sink(args.report, args.report_format, overwrite=args.overwrite,
                      option="--report-format")


def _value_index(source: Source, args: argparse.Namespace) -> int:
    return locate(source.columns, args.column, source.label)


# ===================================================================== commands
def run_check(args: argparse.Namespace) -> int:
    """Check every row; 0 when all are valid, 1 otherwise (see --fail-on)."""
    check = _check_from(args)
    _check_outputs(args)
    opened = _Opened()
    try:
        source = _open_source(args, opened)
        writers: list[tuple[Sink, RowWriter]] = []
        value_at = _value_index(source, args)
        _locate_roles(source, args)
        report = _report_sink(args)
        if report is not None:
            writers.append((report, report_rows([value_at])))
        source, job = _job(args, check, source, opened)
        summary = run(source, job, _role_columns(args),
                      writers=writers, chunk_size=args.chunk_rows, jobs=args.jobs,
                      progress=_progress(args), keep_examples=max(0, args.examples))
    finally:
        opened.close()
    species = f", species from {args.species_column!r}" if args.species_column else ""
    if not args.quiet:
        out = _summary_stream(args)
        _print_summary(summary, f"checked {source.label}, column {args.column!r}{species}"
                       + (" (strict)" if args.strict else ""), out=out, args=args)
        if args.report:
            say(f"  report: {args.report} ({summary.rows:,} rows)", out)
    return _finish(args, summary, {"input": source.label, "column": args.column,
                                   "report": args.report, **_parity_facts(args)})


def run_normalize(args: argparse.Namespace) -> int:
    """Write every row rewritten; 0 when all are valid, 1 when some were flagged (see
    --fail-on)."""
    check = _check_from(args)
    if bool(args.output) == bool(args.in_place_column):
        raise InputError("give an output with -o OUTPUT, or --in-place-column NAME for a "
                         "database input (one of the two)")
    _check_outputs(args)
    opened = _Opened()
    try:
        if args.in_place_column:
            written = _normalize_in_place(args, check, opened)
        else:
            written = _normalize_to(args, check, opened)
    finally:
        opened.close()
    summary, where = written
    if not args.quiet:
        out = _summary_stream(args)
        _print_summary(summary, f"normalized {args.column!r} of {where[0]} "
                       f"(style {args.style}, core {args.core}, order {args.order})", out=out,
                       args=args)
        say(f"  written: {where[1]} ({summary.rows:,} rows; "
            f"{summary.invalid:,} flagged and kept as they were)", out)
        if args.report:
            say(f"  report: {args.report} ({summary.rows:,} rows)", out)
    return _finish(args, summary, {"input": where[0], "column": args.column,
                                   "output": where[1], "report": args.report,
                                   **_parity_facts(args)})


def _parity_facts(args: argparse.Namespace) -> dict[str, Any]:
    """The parity convention a level run used, for the JSON summary."""
    if not _levels_asked(args):
        return {}
    decision = getattr(args, "parity_decision", None)
    if decision is None:
        return {"parity": args.parity}
    return {"parity": decision.convention, "parity_decided_by_row": decision.row}


def _extra_columns(args: argparse.Namespace, prefix: str = "") -> OutputColumns:
    return OutputColumns(status=args.status_column or f"{prefix}status",
                         code=args.code_column or f"{prefix}code",
                         fixes=args.fixes_column or f"{prefix}fixes",
                         original=args.keep_original)


def _default_table(args: argparse.Namespace, same_db: bool) -> str:
    if args.output_table:
        return str(args.output_table)
    if args.table:
        return f"{args.table}_normalized" if same_db else str(args.table)
    stem = os.path.basename(args.input).split(".")[0]
    cleaned = re.sub(r"\W+", "_", stem).strip("_") or "rows"
    return cleaned if not cleaned[0].isdigit() else f"t_{cleaned}"


def _normalize_to(args: argparse.Namespace, check: ConfigurationCheck | LevelCheck,
                  opened: _Opened
                  ) -> tuple[Summary, tuple[str, str]]:
    output: str = args.output
    to_db = is_database(output) or args.output_table is not None
    same_db = bool(args.table) and to_db and same_database(args.input, output)
    source = _open_source(args, opened, writable=same_db,
                          tabular_output=not (not to_db and format_of(
                              output, args.output_format, option="--output-format",
                              written=True) in ("jsonl", "json")))
    value_at = _value_index(source, args)
    _locate_roles(source, args)
    extra = _extra_columns(args)
    clash = [n for n in extra.names() if n in source.columns]
    if clash:
        raise InputError(f"{source.label}: already has a column {clash[0]!r}; name the added "
                         "columns with --status-column, --code-column, --fixes-column")
    writers: list[tuple[Sink, RowWriter]] = []
    report = _report_sink(args)
    if report is not None:
        writers.append((report, report_rows([value_at])))
    if to_db:
        if not is_database(output):
            raise InputError(f"{output}: --output-table needs a database output "
                             "(sqlite:///file.db, a .db path or a database URL)")
        if same_db:
            db = opened.databases[0]
        else:
            db = open_database(output, create=True)
            opened.databases.append(db)
        table = _default_table(args, same_db)
        like = source if same_db and isinstance(source, TableSource) else None
        sink: Sink = TableSink(db, table, overwrite=args.overwrite, like=like,
                               text_columns=[args.column])
        where = f"{db.label} table {table}"
    else:
        _refuse_same_file(args.input, output, "output")
        types = None
        if isinstance(source, ParquetSource):
            types = {f.name: f.type for f in source.schema if f.name != args.column}
        envelope = source.envelope if isinstance(source, JsonSource) else None
        sink = _file_sink(output, args.output_format, types=types, overwrite=args.overwrite,
                          envelope=envelope)
        where = output
    writers.append((sink, normalized_rows(value_at, extra)))
    source, job = _job(args, check, source, opened)
    summary = run(source, job, _role_columns(args), writers=writers,
                  chunk_size=args.chunk_rows, jobs=args.jobs, progress=_progress(args),
                  keep_examples=max(0, args.examples))
    return summary, (source.label, where)


def _normalize_in_place(args: argparse.Namespace, check: ConfigurationCheck | LevelCheck,
                        opened: _Opened
                        ) -> tuple[Summary, tuple[str, str]]:
    if not (args.table or is_database(args.input)):
        raise InputError("--in-place-column is for database inputs; write files with -o")
    source = _open_source(args, opened, writable=True, in_place=True)
    assert isinstance(source, TableSource)
    name = args.in_place_column
    extra = _extra_columns(args, prefix=f"{name}_")
    if args.keep_original:
        raise InputError("--keep-original is not needed in place: the original column stays")
    sink = InPlaceSink(source, [name, extra.status, extra.code, extra.fixes],
                       overwrite=args.overwrite,
                       keep=[c for c in _role_columns(args) if c is not None])
    value_at = source.columns.index(args.column) if args.column in source.columns else \
        locate(source.columns, args.column, source.label)
    writers: list[tuple[Sink, RowWriter]] = []
    report = _report_sink(args)
    if report is not None:
        writers.append((report, report_rows([value_at])))
    writers.append((sink, in_place_rows(value_at, extra)))
    roles = _role_columns(args)
    job = _job(args, check, source, opened)[1]  # a table is read again, never replayed
    summary = run(source, job, roles, writers=writers,
                  chunk_size=args.chunk_rows, jobs=args.jobs, progress=_progress(args),
                  keep_examples=max(0, args.examples))
    assert KEY_COLUMN in source.columns
    what = "column" if args.overwrite else "new column"
    return summary, (source.label, f"{source.label}, {what} {name!r}")
