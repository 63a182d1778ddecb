"""The command-line grammar: the top-level parser, the options of each command and the
input, repair, notation and running options that ``check`` and ``normalize`` share.

A command's options are added only when that command is parsed, so ``confspec --version``,
``confspec --help`` and ``confspec codes`` never load the data-cleaning layer.
"""

from __future__ import annotations

import argparse
import os
from collections.abc import Callable, Iterable
from typing import Any, NoReturn, TypeVar, overload

from .. import __version__
from ..notation.render import CORE_MODES, ORDERS, STYLES

__all__ = ["PROG", "CommandParser", "build_parser"]

PROG = "confspec"

_N = TypeVar("_N")


class CommandParser(argparse.ArgumentParser):
    """argparse with one-line errors (``confspec check: error: ... (see --help)``) and
    options that may be added on first use (:meth:`defer`)."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self._pending: list[Callable[[argparse.ArgumentParser], None]] = []

    def defer(self, add_options: Callable[[argparse.ArgumentParser], None]) -> None:
        """Call ``add_options(self)`` just before this parser first parses."""
        self._pending.append(add_options)

    def error(self, message: str) -> NoReturn:
        self.exit(2, f"{self.prog}: error: {message} (see {self.prog} --help)\n")

    @overload
    def parse_known_args(self, args: Iterable[str] | None = None, namespace: None = None
                         ) -> tuple[argparse.Namespace, list[str]]: ...
    @overload
    def parse_known_args(self, args: Iterable[str] | None, namespace: _N
                         ) -> tuple[_N, list[str]]: ...
    @overload
    def parse_known_args(self, *, namespace: _N) -> tuple[_N, list[str]]: ...

    def parse_known_args(self, args: Iterable[str] | None = None, namespace: object = None
                         ) -> tuple[object, list[str]]:
        while self._pending:
            self._pending.pop(0)(self)
        return super().parse_known_args(args, namespace)


def build_parser() -> argparse.ArgumentParser:
    """A fresh parser for the whole command line (nothing is shared between calls)."""
    parser = CommandParser(prog=PROG, description="Validate and normalize atomic electron "
                           "configurations in files and databases.",
                           epilog="Exit status: 0 all valid, 1 some invalid, 2 usage or input "
                           "error.")
    parser.add_argument("--version", action="version", version=f"%(prog)s {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=CommandParser)
    sub.required = True

    check = sub.add_parser("check", help="validate every row and summarize the problems",
                           description="Validate every row of a column; print a summary and "
                           "optionally write a per-row report.")
    check.defer(_check_options)

    norm = sub.add_parser("normalize", help="rewrite a column in one notation",
                          description="Write every input row, in order, with the column "
                          "rewritten and status columns added. Unreadable values keep their "
                          "text and are flagged, never dropped. The input is never modified.")
    norm.defer(_normalize_options)

    show = sub.add_parser("show", help="everything about one configuration",
                          description="Canonical forms in every notation, electron count, "
                          "problems with carets, and chemistry where available.")
    show.defer(_show_options)

    ground = sub.add_parser("ground", help="ground configurations of species, with provenance",
                            description="The ground configuration (and level, where known) "
                            "of each species, saying where each value comes from.")
    ground.defer(_ground_options)

    codes = sub.add_parser("codes", help="the error codes, what triggers them, how to fix them",
                           description="Every error code, or only those named.")
    codes.defer(_codes_options)

    scf = sub.add_parser("scf", help="SCF total energies and ΔSCF ionization energies "
                         "(computed, spherically averaged LDA)",
                         description="Total energy of each species in its ground configuration "
                         "and its ΔSCF ionization energy E(X+) − E(X), computed by a spherically "
                         "averaged LDA calculation: approximations, never measured values. "
                         "Needs the scf extra (numpy, scipy).")
    scf.defer(_scf_options)
    return parser


# ===================================================================== value types
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


# ===================================================================== per command
def _check_options(p: argparse.ArgumentParser) -> None:
    _add_input(p)
    p.add_argument("--strict", action="store_true",
                   help="also flag valid values not written in the canonical notation (in the "
                        "chosen --style, --core and --order)")
    p.add_argument("--overwrite", action="store_true",
                   help="replace an existing report or summary file")
    _add_unattended(p)


#: --fail-on choices: which flagged rows make the exit status 1
FAIL_ON = ("any", "errors", "never")


def _add_unattended(p: argparse.ArgumentParser) -> None:
    group = p.add_argument_group("unattended runs")
    group.add_argument("--fail-on", choices=FAIL_ON, default="any",
                       help="exit 1 when any row is flagged (any, the default), only for rows "
                            "flagged other than 'empty' (errors: empty and NULL cells pass), "
                            "or never (0 unless the run itself fails)")
    group.add_argument("--quiet", "-q", action="store_true",
                       help="print no summary (errors still go to stderr)")
    group.add_argument("--summary-json", metavar="PATH",
                       help="write the summary as JSON (rows, valid, by code, fixes, examples) "
                            "to PATH, or to stdout with '-'")


def _normalize_options(p: argparse.ArgumentParser) -> None:
    from ..cleaning import WRITTEN_FORMATS

    _add_input(p)
    _add_unattended(p)
    out = p.add_argument_group("output")
    out.add_argument("--output", "-o", metavar="OUTPUT",
                     help="a file (format by extension), '-' for stdout (CSV unless "
                          "--output-format says otherwise), a FIFO or device (written "
                          "directly), or a database (a new table)")
    out.add_argument("--output-format", choices=WRITTEN_FORMATS,
                     help="override the output format")
    out.add_argument("--output-table", metavar="NAME",
                     help="table to create in a database output (default: the input table "
                          "name, '<table>_normalized' in the same database, or the file name)")
    out.add_argument("--overwrite", action="store_true",
                     help="replace an existing output file, report, summary file or table; with "
                          "--in-place-column, replace the values of existing columns")
    out.add_argument("--in-place-column", metavar="NAME",
                     help="for a database input: add the rewritten value as a new column NAME "
                          "of the input table (with NAME_status, NAME_code, NAME_fixes)")
    out.add_argument("--keep-original", metavar="NAME",
                     help="also keep the original text in a column NAME")
    out.add_argument("--status-column", metavar="NAME", help="name of the status column "
                     "(default 'status'; with --in-place-column, 'NAME_status')")
    out.add_argument("--code-column", metavar="NAME", help="name of the error-code column")
    out.add_argument("--fixes-column", metavar="NAME", help="name of the fixes column")


def _show_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("text", metavar="TEXT", help="a configuration, e.g. '[Ar] 3d6 4s2'")
    p.add_argument("--species", metavar="SP", help="check against a species (Fe, Fe2+, ...)")
    p.add_argument("--accept-uppercase", action="store_true",
                   help="read upper-case subshell letters")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--scf", action="store_true",
                   help="add an SCF section: orbital energies and radii computed by spherically "
                        "averaged LDA (an approximation; needs the scf extra)")


def _scf_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("species", metavar="SPECIES", nargs="+", help="e.g. Fe Fe+ Cu")
    p.add_argument("--json", action="store_true", help="print a JSON list, one object per "
                   "species")
    p.add_argument("--progress", choices=("auto", "always", "never"), default="auto",
                   help="progress display on stderr (auto: when it is a terminal)")


def _ground_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("species", metavar="SPECIES", nargs="+")
    p.add_argument("--style", choices=STYLES, default="plain")
    p.add_argument("--json", action="store_true", help="print a JSON list, one object per "
                   "species")


def _codes_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("code", metavar="CODE", nargs="*", help="only these codes (default: all)")
    p.add_argument("--json", action="store_true", help="print a JSON list")


# ===================================================================== shared by check, normalize
def _add_input(p: argparse.ArgumentParser) -> None:
    from ..cleaning import DEFAULT_CACHE_SIZE, DEFAULT_CHUNK_ROWS, FORMATS, WRITTEN_FORMATS

    p.add_argument("input", metavar="INPUT",
                   help="a file (CSV, TSV, JSON Lines, JSON, Parquet, NIST ASD text .txt, "
                        "markdown .md, reStructuredText .rst; by extension, .gz allowed), '-' "
                        "for stdin (CSV unless --input-format says otherwise) or a database: "
                        "sqlite:///file.db, a .db/.sqlite path, or any SQLAlchemy URL")
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
    levels.add_argument("--parity", choices=("auto", "marked", "unmarked"), default="auto",
                        help="how the table writes parity: marked (a term without ° is even, "
                             "as NIST writes), unmarked (no mark: parity not given, taken from "
                             "the configuration), auto (default: unmarked when no row of the "
                             "column writes an odd mark; the summary says which)")
    p.add_argument("--table", "-t", metavar="NAME", help="the table to read, for a database")
    p.add_argument("--input-format", choices=FORMATS, help="override the input file format")
    p.add_argument("--records-key", metavar="KEY",
                   help="plain JSON input: the member of the top-level object that holds the "
                        "array of records (needed when it holds several)")
    p.add_argument("--encoding", default="utf-8-sig",
                   help="text encoding of a text input: CSV, TSV, JSON Lines, JSON, NIST "
                        "text, markdown, reStructuredText (default: UTF-8, with or without a "
                        "byte-order mark)")
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
                        "normalized, fixes (CSV, TSV, JSON Lines, JSON or Parquet by extension)")
    p.add_argument("--report-format", choices=WRITTEN_FORMATS,
                   help="override the report format")
