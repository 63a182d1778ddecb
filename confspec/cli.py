"""The ``confspec`` command: check and normalize configuration columns, inspect one value.

Exit status: 0 when every row (or value) is valid, 1 when any is not, 2 for a usage or input
error (printed on one line, never as a traceback). Output files are written beside their
target and renamed into place at the end, so an interrupted run leaves no half-written file.
"""

from __future__ import annotations

import argparse
import os
import re
import sqlite3
import sys
from collections.abc import Callable, Sequence
from typing import IO, Any, NoReturn

from . import ERROR_CODES, ConfspecError, __version__, parse, parse_species
from . import validate as validate_text
from ._format import CORE_MODES, ORDERS, STYLES
from ._tables import (
    DEFAULT_CACHE_SIZE,
    DEFAULT_CHUNK_ROWS,
    FORMATS,
    KEY_COLUMN,
    ConfigurationCheck,
    CsvSink,
    CsvSource,
    Database,
    InPlaceSink,
    InputError,
    JsonLinesSink,
    JsonLinesSource,
    LevelCheck,
    OutputColumns,
    ParquetSink,
    ParquetSource,
    Progress,
    RowJob,
    RowWriter,
    Sink,
    Source,
    Summary,
    TableSink,
    TableSource,
    format_of,
    in_place_rows,
    is_database,
    locate,
    normalized_rows,
    open_database,
    repair_text_available,
    report_rows,
    run,
    same_database,
)

__all__ = ["main"]

PROG = "confspec"


# ===================================================================== argument parsing
class _Parser(argparse.ArgumentParser):
    """argparse with one-line errors: ``confspec check: error: ... (see --help)``."""

    def error(self, message: str) -> NoReturn:
        self.exit(2, f"{self.prog}: error: {message} (see {self.prog} --help)\n")


def _positive(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"{text!r} must be at least 1")
    return value


def _jobs(text: str) -> int:
    if text == "auto":
        return os.cpu_count() or 1
    return _positive(text)


def _add_input(p: argparse.ArgumentParser) -> None:
    p.add_argument("input", metavar="INPUT",
                   help="a file (CSV, TSV, JSON Lines, Parquet; by extension, .gz allowed) or a "
                        "database: sqlite:///file.db, a .db/.sqlite path, or any SQLAlchemy URL")
    p.add_argument("--column", "-c", required=True, metavar="COL",
                   help="the column holding configurations")
    p.add_argument("--species-column", "-s", metavar="COL",
                   help="a column holding the species (Fe, Fe2+, Fe(III), Fe III, ...): the "
                        "electron count is checked against it")
    levels = p.add_argument_group("level designations")
    levels.add_argument("--level", action="store_true",
                        help="the column holds level designations (3d6(5D)4s 6D9/2): check "
                             "term, parents, J and parity against the configuration")
    levels.add_argument("--term-column", metavar="COL",
                        help="a column holding the term (5D4, 2P°1/2) of each configuration")
    levels.add_argument("--j-column", metavar="COL",
                        help="a column holding J (4, 9/2 or 4.5), with --term-column")
    p.add_argument("--table", "-t", metavar="NAME", help="the table to read, for a database")
    p.add_argument("--input-format", choices=FORMATS, help="override the input file format")
    p.add_argument("--encoding", default="utf-8-sig",
                   help="text encoding of CSV/TSV/JSON Lines input (default: UTF-8, with or "
                        "without a byte-order mark)")
    repairs = p.add_argument_group("repairs (each recorded per row in the fixes column)")
    repairs.add_argument("--accept-uppercase", action="store_true",
                         help="read upper-case subshell letters ('2P6') when the value fails "
                              "otherwise; only for columns that hold no term symbols")
    repairs.add_argument("--fill-core", action="store_true",
                         help="add the noble-gas core that a valence-only spelling leaves out "
                              "('3d6 4s2' for Fe), when that makes the species' electron count")
    repairs.add_argument("--repair-text", action="store_true",
                         help="undo mojibake ('2pâ¶' -> '2p⁶') with ftfy, when the value fails "
                              "otherwise")
    fmt = p.add_argument_group("notation of the rewritten value")
    fmt.add_argument("--style", choices=STYLES, default="plain")
    fmt.add_argument("--core", choices=CORE_MODES, default="condense",
                     help="condense to the largest noble-gas core, or expand every subshell")
    fmt.add_argument("--order", choices=ORDERS, default="shell",
                     help="shell order (n, then l) or filling (Madelung) order")
    run_opts = p.add_argument_group("running")
    run_opts.add_argument("--jobs", "-j", type=_jobs, default=1, metavar="N",
                          help="worker processes ('auto': one per core; default 1)")
    run_opts.add_argument("--chunk-rows", type=_positive, default=DEFAULT_CHUNK_ROWS,
                          metavar="N", help=f"rows per chunk (default {DEFAULT_CHUNK_ROWS:,})")
    run_opts.add_argument("--cache-size", type=_positive, default=DEFAULT_CACHE_SIZE,
                          metavar="N", help="distinct values whose results are kept "
                                            f"(default {DEFAULT_CACHE_SIZE:,})")
    run_opts.add_argument("--examples", type=int, default=5, metavar="N",
                          help="bad rows to show in the summary (default 5)")
    run_opts.add_argument("--progress", choices=("auto", "always", "never"), default="auto",
                          help="progress display on stderr (auto: when it is a terminal)")
    p.add_argument("--report", "-r", metavar="REPORT",
                   help="write one row per input row: row, input, status, code, message, "
                        "normalized, fixes (CSV, TSV, JSON Lines or Parquet by extension)")
    p.add_argument("--report-format", choices=FORMATS, help="override the report format")


def _build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog=PROG, description="Validate and normalize atomic electron "
                     "configurations in files and databases.",
                     epilog="Exit status: 0 all valid, 1 some invalid, 2 usage or input error.")
    parser.add_argument("--version", action="version", version=f"%(prog)s {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True

    check = sub.add_parser("check", help="validate every row and summarize the problems",
                           description="Validate every row of a column; print a summary and "
                           "optionally write a per-row report.")
    _add_input(check)
    check.add_argument("--strict", action="store_true",
                       help="also flag valid values not written in the canonical notation")
    check.set_defaults(handler=_cmd_check)

    norm = sub.add_parser("normalize", help="rewrite a column in one notation",
                          description="Write every input row, in order, with the column "
                          "rewritten and status columns added. Unreadable values keep their "
                          "text and are flagged, never dropped. The input is never modified.")
    _add_input(norm)
    out = norm.add_argument_group("output")
    out.add_argument("--output", "-o", metavar="OUTPUT",
                     help="a file (format by extension) or a database (a new table)")
    out.add_argument("--output-format", choices=FORMATS, help="override the output format")
    out.add_argument("--output-table", metavar="NAME",
                     help="table to create in a database output (default: the input table "
                          "name, '<table>_normalized' in the same database, or the file name)")
    out.add_argument("--overwrite", action="store_true",
                     help="replace an existing output table")
    out.add_argument("--in-place-column", metavar="NAME",
                     help="for a database input: add the rewritten value as a new column NAME "
                          "of the input table (with NAME_status, NAME_code, NAME_fixes)")
    out.add_argument("--keep-original", metavar="NAME",
                     help="also keep the original text in a column NAME")
    out.add_argument("--status-column", metavar="NAME", help="name of the status column "
                     "(default 'status'; with --in-place-column, 'NAME_status')")
    out.add_argument("--code-column", metavar="NAME", help="name of the error-code column")
    out.add_argument("--fixes-column", metavar="NAME", help="name of the fixes column")
    norm.set_defaults(handler=_cmd_normalize)

    show = sub.add_parser("show", help="everything about one configuration",
                          description="Canonical forms in every notation, electron count, "
                          "problems with carets, and chemistry where available.")
    show.add_argument("text", metavar="TEXT", help="a configuration, e.g. '[Ar] 3d6 4s2'")
    show.add_argument("--species", metavar="SP", help="check against a species (Fe, Fe2+, ...)")
    show.add_argument("--accept-uppercase", action="store_true",
                      help="read upper-case subshell letters")
    show.set_defaults(handler=_cmd_show)

    ground = sub.add_parser("ground", help="ground configurations of species, with provenance",
                            description="The ground configuration (and level, where known) "
                            "of each species, saying where each value comes from.")
    ground.add_argument("species", metavar="SPECIES", nargs="+")
    ground.add_argument("--style", choices=STYLES, default="plain")
    ground.set_defaults(handler=_cmd_ground)

    codes = sub.add_parser("codes", help="the error codes, what triggers them, how to fix them")
    codes.set_defaults(handler=_cmd_codes)
    return parser


# ===================================================================== output helpers
def _out(text: str = "", stream: IO[str] | None = None) -> None:
    print(text, file=stream or sys.stdout)


def _indent(text: str, by: int) -> str:
    pad = " " * by
    return "\n".join(pad + line for line in text.splitlines())


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


def _print_summary(summary: Summary, what: str, *, out: IO[str]) -> None:
    total = summary.rows
    share = f" ({summary.valid / total:.1%})" if total else ""
    _out(what, out)
    _out(f"  rows read   {total:>10,}", out)
    _out(f"  valid       {summary.valid:>10,}{share}", out)
    _out(f"  invalid     {summary.invalid:>10,}", out)
    if summary.repaired_rows:
        kinds = ", ".join(f"{k} {v:,}" for k, v in summary.fixes.most_common())
        _out(f"  repaired    {summary.repaired_rows:>10,}  ({kinds})", out)
    if summary.blank_lines:
        _out(f"  blank lines {summary.blank_lines:>10,}  (not rows; skipped)", out)
    if summary.by_code:
        _out("  invalid rows by code (of their first problem):", out)
        for line in _wrapped([f"{code} {count:,}" for code, count
                              in summary.by_code.most_common()], width=92):
            _out("    " + line, out)
    if summary.examples:
        _out(f"  first {len(summary.examples)} invalid rows:", out)
        for ex in summary.examples:
            where = f"row {ex.row:,}" + (f" (line {ex.line:,})" if ex.line else "")
            _out(f"    {where}: {_short(ex.value)}", out)
            if ex.outcome.fixes:
                _out(f"      after {', '.join(ex.outcome.fixes)}: {ex.outcome.checked!r}", out)
            for err in ex.outcome.errors[:3]:
                _out(_indent(err.render(), 6), out)
            if len(ex.outcome.errors) > 3:
                _out(f"      … and {len(ex.outcome.errors) - 3} more", out)


# ===================================================================== sources and sinks
class _Opened:
    """What a command opened, closed in reverse order at the end."""

    def __init__(self) -> None:
        self.databases: list[Database] = []
        self.sources: list[Source] = []

    def close(self) -> None:
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
        if args.fill_core or args.repair_text:
            raise InputError("--fill-core and --repair-text apply to configuration columns, "
                             "not to level designations (--level, --term-column, --j-column)")
        if args.j_column and not args.term_column and not args.level:
            raise InputError("--j-column needs --term-column (or --level)")
        return LevelCheck(strict=getattr(args, "strict", False),
                          accept_uppercase=args.accept_uppercase,
                          term_column=bool(args.term_column), style=args.style, core=args.core,
                          order=args.order)
    return ConfigurationCheck(strict=getattr(args, "strict", False),
                              accept_uppercase=args.accept_uppercase, fill_core=args.fill_core,
                              repair_text=args.repair_text, style=args.style, core=args.core,
                              order=args.order)


def _open_source(args: argparse.Namespace, opened: _Opened, *, writable: bool = False,
                 tabular_output: bool = False, in_place: bool = False) -> Source:
    target: str = args.input
    if args.table or is_database(target):
        if not args.table:
            raise InputError(f"{target}: a database input needs --table NAME")
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
        if fmt in ("csv", "tsv"):
            source = CsvSource(target, delimiter="\t" if fmt == "tsv" else ",",
                               encoding=args.encoding)
        elif fmt == "jsonl":
            source = JsonLinesSource(target, encoding=args.encoding, scan_keys=tabular_output)
        else:
            source = ParquetSource(target)
    opened.sources.append(source)
    return source


def _file_sink(path: str, fmt: str | None, *, types: dict[str, Any] | None = None) -> Sink:
    kind = format_of(path, fmt)
    if kind == "csv":
        return CsvSink(path)
    if kind == "tsv":
        return CsvSink(path, delimiter="\t")
    if kind == "jsonl":
        return JsonLinesSink(path)
    return ParquetSink(path, types=types)


def _refuse_same_file(input_path: str, output: str, what: str) -> None:
    if is_database(input_path) or is_database(output):
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
        raise InputError(f"{args.report}: the report is a file (CSV, TSV, JSON Lines, Parquet)")
    _refuse_same_file(args.input, args.report, "report")
    return _file_sink(args.report, args.report_format)


def _value_index(source: Source, args: argparse.Namespace) -> int:
    return locate(source.columns, args.column, source.label)


# ===================================================================== commands
def _cmd_check(args: argparse.Namespace) -> int:
    check = _check_from(args)
    opened = _Opened()
    try:
        source = _open_source(args, opened)
        writers: list[tuple[Sink, RowWriter]] = []
        value_at = _value_index(source, args)
        _locate_roles(source, args)
        report = _report_sink(args)
        if report is not None:
            writers.append((report, report_rows([value_at])))
        summary = run(source, RowJob(check, args.cache_size), _role_columns(args),
                      writers=writers, chunk_size=args.chunk_rows, jobs=args.jobs,
                      progress=_progress(args), keep_examples=max(0, args.examples))
    finally:
        opened.close()
    species = f", species from {args.species_column!r}" if args.species_column else ""
    _print_summary(summary, f"checked {source.label}, column {args.column!r}{species}"
                   + (" (strict)" if args.strict else ""), out=sys.stdout)
    if args.report:
        _out(f"  report: {args.report} ({summary.rows:,} rows)")
    return 0 if summary.invalid == 0 else 1


def _cmd_normalize(args: argparse.Namespace) -> int:
    check = _check_from(args)
    if bool(args.output) == bool(args.in_place_column):
        raise InputError("give an output with -o OUTPUT, or --in-place-column NAME for a "
                         "database input (one of the two)")
    opened = _Opened()
    try:
        if args.in_place_column:
            written = _normalize_in_place(args, check, opened)
        else:
            written = _normalize_to(args, check, opened)
    finally:
        opened.close()
    summary, where = written
    _print_summary(summary, f"normalized {args.column!r} of {where[0]} "
                   f"(style {args.style}, core {args.core}, order {args.order})", out=sys.stdout)
    _out(f"  written: {where[1]} ({summary.rows:,} rows; "
         f"{summary.invalid:,} flagged and kept as they were)")
    if args.report:
        _out(f"  report: {args.report} ({summary.rows:,} rows)")
    return 0 if summary.invalid == 0 else 1


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
                              output, args.output_format) == "jsonl"))
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
        sink = _file_sink(output, args.output_format, types=types)
        where = output
    writers.append((sink, normalized_rows(value_at, extra)))
    summary = run(source, RowJob(check, args.cache_size), _role_columns(args), writers=writers,
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
    sink = InPlaceSink(source, [name, extra.status, extra.code, extra.fixes])
    value_at = source.columns.index(args.column) if args.column in source.columns else \
        locate(source.columns, args.column, source.label)
    writers: list[tuple[Sink, RowWriter]] = []
    report = _report_sink(args)
    if report is not None:
        writers.append((report, report_rows([value_at])))
    writers.append((sink, in_place_rows(value_at, extra)))
    roles = _role_columns(args)
    summary = run(source, RowJob(check, args.cache_size), roles, writers=writers,
                  chunk_size=args.chunk_rows, jobs=args.jobs, progress=_progress(args),
                  keep_examples=max(0, args.examples))
    assert KEY_COLUMN in source.columns
    return summary, (source.label, f"{source.label}, new column {name!r}")


# -- show / ground ------------------------------------------------------------------------
def _chemistry(name: str) -> Callable[..., Any] | None:
    """A chemistry function of the package, if this build has it."""
    import confspec

    found = getattr(confspec, name, None)
    return found if callable(found) else None


def _cmd_show(args: argparse.Namespace) -> int:
    text: str = args.text
    species_text: str | None = args.species
    problems = validate_text(text, species_text, accept_uppercase=args.accept_uppercase)
    rows: list[tuple[str, str]] = []
    try:
        config = parse(text, species=None if species_text is None else _try_species(
            species_text), accept_uppercase=args.accept_uppercase)
    except ConfspecError:
        config = None
    level = None
    if config is None:  # perhaps a level designation: 3d6(5D)4s 6D9/2
        from ._levels import parse_level, validate_level

        try:
            level = parse_level(text, accept_uppercase=args.accept_uppercase)
        except ConfspecError:
            level = None
        if level is not None:
            config = level.configuration
            problems = validate_level(level, species_text)
            if species_text is None and level.species is not None:
                species_text = str(level.species)
    _out(f"input          {text!r}")
    if level is not None:
        rows.append(("level", level.format()))
        if level.term is not None:
            j = "" if level.J is None else f", J = {level.J}, statistical weight " \
                f"{level.statistical_weight}"
            rows.append(("term", f"{level.term}{j}"))
        for parent in level.parents:
            rows.append(("parent", f"{parent} of {' '.join(parent.subshells)}"))
    if config is not None:
        rows.append(("canonical", str(config)))
        rows.append(("expanded", config.format(core="expand")))
        rows.append(("filling order", config.format(order="filling")))
        for style in STYLES:
            if style != "plain":
                rows.append((style, config.format(style=style)))
        rows.append(("electrons", str(config.electron_count)))
        rows.append(("parity", config.parity))
        open_shells = " ".join(str(s) for s in config.open_subshells) or "none (closed shells)"
        rows.append(("open subshells", open_shells))
        rows.append(("unpaired", f"{config.unpaired_electrons} (Hund's first rule, "
                                  "per open subshell)"))
    species = _try_species(species_text) if species_text else None
    if species is not None:
        detail = f"{species} ({species.name}, Z = {species.Z}, {species.electron_count} electrons)"
        if config is not None:
            same = config.electron_count == species.electron_count
            detail += "; electron count " + ("matches" if same else
                                             f"does not match ({config.electron_count})")
        rows.append(("species", detail))
    for label, value in rows:
        _out(f"  {label:<14} {value}")
    if config is not None and config.subshells:
        from ._diagrams import box_diagram_text

        _out("  orbital boxes (filling order; arrows by Hund's rule):")
        _out(_indent(box_diagram_text(config, order="filling"), 4))
    if config is not None:
        _show_chemistry(config, species)
    if problems:
        _out(f"problems ({len(problems)}):")
        for err in problems:
            _out(_indent(err.render(), 2))
        return 1
    _out("no problems")
    return 0


def _try_species(text: str) -> Any:
    try:
        return parse_species(text)
    except ConfspecError:
        return None


def _show_chemistry(config: Any, species: Any) -> None:
    """Ground-state comparison, terms, Hund term and Slater shielding (where this build has
    the chemistry layer). Without a species, the neutral atom of the electron count."""
    lines: list[str] = []
    assumed = ""
    if species is None and config.electron_count > 0:
        try:
            species = parse_species(_element_symbol(config.electron_count))
            assumed = " (the neutral atom with this many electrons)"
        except (ConfspecError, LookupError):
            species = None
    ground_level = _chemistry("ground_level")
    if species is not None and ground_level is not None:
        try:
            level = ground_level(species)
            same = level.configuration.occupancies == config.occupancies
            lines.append(f"  ground state   {species}{assumed}: {level.configuration}"
                         + (f" {level.term}" if getattr(level, "term", None) else "")
                         + ("  <- this configuration" if same else "  (this one is not it)"))
            lines.append(f"  {'':<14} {_provenance(level)}")
        except (ConfspecError, LookupError, ValueError) as err:
            lines.append(f"  ground state   not known ({_first(err)})")
    hund = _chemistry("hund_ground_term")
    if hund is not None:
        try:
            lines.append(f"  Hund term      {hund(config)}  (Hund's rules: the lowest term of "
                         "this configuration, an estimate)")
        except (ConfspecError, ValueError) as err:
            lines.append(f"  Hund term      not available ({_first(err)})")
    terms = _chemistry("terms")
    if terms is not None:
        try:
            found = list(terms(config))
            shown = " ".join(str(t) for t in found[:20])
            more = f" … ({len(found)} terms)" if len(found) > 20 else ""
            lines.append(f"  terms          {shown}{more}")
        except (ConfspecError, ValueError) as err:
            lines.append(f"  terms          not available ({_first(err)})")
    zeff = _chemistry("effective_charge")
    if zeff is not None and species is not None:
        lines.extend(_shielding_lines(zeff, config, species))
    if not lines:
        lines.append("  (ground states, terms and shielding: not in this build)")
    for line in lines:
        _out(line)


def _element_symbol(z: int) -> str:
    from . import Element

    return str(Element.model_validate(z).symbol)


def _first(err: BaseException) -> str:
    if isinstance(err, ConfspecError):
        return f"{err.message} [{err.code}]"
    text = str(err).splitlines()
    return text[0] if text else type(err).__name__


def _provenance(level: Any) -> str:
    """Where a ground level comes from, in words: measured, predicted or rule-based."""
    parts = [str(getattr(level, "provenance", "") or "")]
    source = getattr(level, "source", None)
    if source:
        parts.append(f"source: {source}")
    hund_term = getattr(level, "hund_term", None)
    if hund_term is not None:
        parts.append(f"Hund's rules would give {hund_term}")
    caution = getattr(level, "caution", None)
    if caution:
        parts.append(f"caution: {caution}")
    return "; ".join(p for p in parts if p)


def _shielding_lines(zeff: Callable[..., Any], config: Any, species: Any) -> list[str]:
    lines = [f"  shielding      Slater's rules for {species} (an estimate; Z_eff = Z - S):"]
    for sub in config.subshells:
        try:
            result = zeff(species, sub.label, configuration=config, model="slater")
        except (ConfspecError, ValueError, TypeError) as err:
            return [f"  shielding      not available ({_first(err)})"]
        parts = " + ".join(str(c) for c in getattr(result, "contributions", ()))
        lines.append(f"    {sub.label:<4} Z_eff = {result.zeff:6.2f}   S = {result.sigma:6.2f}"
                     + (f" = {parts}" if parts else ""))
    return lines


def _cmd_ground(args: argparse.Namespace) -> int:
    ground_level = _chemistry("ground_level")
    if ground_level is None:
        raise InputError("ground states are not in this build of confspec")
    status = 0
    for text in args.species:
        try:
            species = parse_species(text)
        except ConfspecError as err:
            _out(f"{text}:")
            _out(_indent(err.render(), 2))
            status = 1
            continue
        try:
            level = ground_level(species)
        except (ConfspecError, LookupError, ValueError) as err:
            _out(f"{species!s:<7} not known: {_first(err)}")
            status = 1
            continue
        config = level.configuration
        shown = config.format(style=args.style) if config.subshells else "(no electrons)"
        term = f"  {level.term}" if getattr(level, "term", None) is not None else ""
        _out(f"{species!s:<7} {shown}{term}")
        _out(f"{'':<7} {_provenance(level)}")
    return status


def _cmd_codes(args: argparse.Namespace) -> int:
    for code, info in ERROR_CODES.items():
        _out(f"{code}  ({info.kind})")
        _out(f"    when: {info.trigger}")
        _out(f"    fix:  {info.fix}")
    return 0


# ===================================================================== entry point
def _is_database_error(err: BaseException) -> bool:
    return isinstance(err, sqlite3.Error) or type(err).__module__.split(".")[0] in (
        "sqlalchemy", "psycopg", "duckdb")


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit status."""
    parser = _build_parser()
    args = parser.parse_args(argv)
    handler: Callable[[argparse.Namespace], int] = args.handler
    try:
        return handler(args)
    except InputError as err:
        _out(f"{PROG} {args.command}: error: {err}", sys.stderr)
        return 2
    except ConfspecError as err:  # an option the library refuses (style, core, order)
        _out(f"{PROG} {args.command}: error: {err.message}", sys.stderr)
        return 2
    except KeyboardInterrupt:
        _out(f"{PROG} {args.command}: interrupted; no output was left half-written",
             sys.stderr)
        return 130
    except BrokenPipeError:
        # the reader of our stdout went away (e.g. `| head`): stop quietly
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 1
    except OSError as err:
        where = f"{err.filename}: " if getattr(err, "filename", None) else ""
        _out(f"{PROG} {args.command}: error: {where}{err.strerror or err}", sys.stderr)
        return 2
    except Exception as err:
        if _is_database_error(err):
            lines = str(getattr(err, "orig", None) or err).strip().splitlines()
            first = lines[0] if lines else type(err).__name__
            _out(f"{PROG} {args.command}: database error: {first}", sys.stderr)
            return 2
        raise


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
