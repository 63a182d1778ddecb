"""File formats: streaming readers and writers for CSV, TSV, JSON Lines and Parquet.

Files are read in chunks (memory stays flat) and written to a temporary file in the
target's directory that is renamed into place only when the whole job succeeded.
Optional libraries (pyarrow, ftfy) are imported only where a format needs them.
"""

from __future__ import annotations

import codecs
import contextlib
import csv
import gzip
import html
import io
import itertools
import json
import os
import re
import secrets
import shutil
import signal
import socket
import stat
import sys
import tempfile
import threading
import time
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from typing import IO, Any, cast

from .check import MISSING, InputError, first_line
from .job import Chunk, RowMark

__all__ = [
    "FORMATS",
    "STDIN",
    "STREAM_NAMES",
    "WRITTEN_FORMATS",
    "CsvSink",
    "CsvSource",
    "JsonEnvelope",
    "JsonLinesSink",
    "JsonLinesSource",
    "JsonSink",
    "JsonSource",
    "ParquetSink",
    "ParquetSource",
    "PipeTableSource",
    "RstTableSource",
    "abort_unfinished",
    "format_of",
    "is_special_output",
    "refuse_mixed_types",
    "stale_temporary_files",
    "write_text_output",
]

#: File formats by name, all of them read; chosen from the extension unless given.
FORMATS = ("csv", "tsv", "jsonl", "json", "parquet", "nist-text", "markdown", "rst")
#: The formats that are also written (reports and normalized outputs).
WRITTEN_FORMATS = ("csv", "tsv", "jsonl", "json", "parquet")
_EXTENSIONS = {".csv": "csv", ".tsv": "tsv", ".tab": "tsv", ".jsonl": "jsonl",
               ".ndjson": "jsonl", ".json": "json", ".parquet": "parquet", ".pq": "parquet",
               ".txt": "nist-text", ".md": "markdown", ".markdown": "markdown", ".rst": "rst"}


def format_of(path: str, given: str | None, *, option: str = "--input-format",
              written: bool = False) -> str:
    """The file format from ``given`` or from the extension (``.gz`` is looked through).

    ``option`` is the command-line option that selects the format, named in the errors;
    ``written``: the file is an output, so only :data:`WRITTEN_FORMATS` will do.
    """
    formats = WRITTEN_FORMATS if written else FORMATS
    if given:
        if given not in formats:
            raise InputError(f"unknown format {given!r} for {option}; use one of: "
                             f"{', '.join(formats)}")
        return given
    if path in STREAM_NAMES or path == STDIN:
        return "csv"  # a stream has no extension: CSV unless a format option says otherwise
    name = path.lower()
    if name.endswith(".gz"):
        name = name[:-3]
    suffix = os.path.splitext(name)[1]
    kind = _EXTENSIONS.get(suffix)
    if kind is not None and kind in formats:
        return kind
    if kind is not None:
        raise InputError(f"{path}: {kind} ({suffix}) is read, not written; write one of "
                         f"{', '.join(formats)} (by extension, or with {option})")
    raise InputError(f"{path}: cannot tell the format from the extension {suffix or '(none)'!r}"
                     f"; give it with {option} (one of: {', '.join(formats)})")


def _open_binary(path: str, mode: str, *, compressed: bool | None = None) -> IO[bytes]:
    """A binary file (the caller closes it), through gzip when the name ends in ``.gz``."""
    if path.lower().endswith(".gz") if compressed is None else compressed:
        return cast(IO[bytes], gzip.open(path, mode))
    return cast(IO[bytes], open(path, mode))


def _open_text(path: str, encoding: str) -> IO[str]:
    if path.lower().endswith(".gz"):
        return io.TextIOWrapper(gzip.open(path, "rb"), encoding=encoding, newline="")
    return open(path, encoding=encoding, newline="")  # closed by the source


def _require_file(path: str) -> None:
    if not os.path.exists(path):
        raise InputError(f"{path}: no such file")
    if os.path.isdir(path):
        raise InputError(f"{path}: is a directory, not a file")
    if not os.access(path, os.R_OK):
        raise InputError(f"{path}: not readable (permission denied)")


def _first_bad_line(path: str, encoding: str) -> tuple[int, str]:
    """Line number and detail of the first line that does not decode (read again in binary)."""
    with _open_binary(path, "rb") as raw:
        for number, line in enumerate(raw, 1):
            try:
                line.decode(encoding)
            except UnicodeDecodeError as err:
                bad = line[err.start:err.start + 1]
                return number, f"byte 0x{bad.hex()} at column {err.start + 1}"
    return 0, "a byte sequence that does not decode"


#: The input name that reads standard input.
STDIN = "-"
#: Cells of any size are read (an over-long one is flagged ``too-long`` on its own row).
_FIELD_SIZE_LIMIT = 2**31 - 1


class _TextSource:
    """Shared by CSV/TSV and JSON Lines: progress from the byte position, decode errors.

    ``-`` reads standard input; with ``spool`` it is first copied to an anonymous temporary
    file (removed by the system even if the process is killed) so it can be read twice.
    """

    label: str
    columns: list[str]
    _handle: IO[str]

    def __init__(self, path: str, encoding: str, *, spool: bool = False) -> None:
        self.label, self.path, self.encoding = path, path, encoding
        self._stdin: IO[bytes] | None = None
        try:
            codecs.lookup(encoding)
        except LookupError:
            raise InputError(f"unknown encoding {encoding!r}") from None
        if path == STDIN:
            self.label = "standard input"
            self._size = 0
            self._stdin = _stdin_bytes(spool)
            self._handle = self._reopen()
            return
        _require_file(path)
        self._size = os.path.getsize(path)
        self._handle = _open_text(path, encoding)

    def _reopen(self) -> IO[str]:
        """A text stream from the start (standard input: only when spooled)."""
        if self._stdin is None:
            return _open_text(self.path, self.encoding)
        with contextlib.suppress(OSError, ValueError):
            self._stdin.seek(0)
        return io.TextIOWrapper(io.BufferedReader(_UnclosedReader(self._stdin)),
                                encoding=self.encoding, newline="")

    def fraction(self) -> float | None:
        if not self._size or self._stdin is not None or self.path.lower().endswith(".gz"):
            return None
        try:
            position = int(cast(Any, self._handle).buffer.tell())
            return min(1.0, position / self._size)
        except (OSError, ValueError, AttributeError):
            return None

    def close(self) -> None:
        self._handle.close()
        if self._stdin is not None:
            self._stdin.close()

    def _decode_error(self) -> InputError:
        if self._stdin is not None:
            return InputError(f"{self.label}: not readable as {self.encoding}; give the "
                              "encoding with --encoding")
        line, detail = _first_bad_line(self.path, self.encoding)
        where = f", line {line}" if line else ""
        return InputError(f"{self.path}{where}: not readable as {self.encoding} ({detail}); "
                          "give the file's encoding with --encoding")


def _stdin_bytes(spool: bool) -> IO[bytes]:
    """Standard input as bytes (the caller closes it; the process's own stdin stays open)."""
    buffer = getattr(sys.stdin, "buffer", None)
    if buffer is None:  # an in-memory text stream (tests, embedding)
        return io.BytesIO(sys.stdin.read().encode("utf-8"))
    if not spool:
        return cast(IO[bytes], io.BufferedReader(_UnclosedReader(buffer)))
    copy = tempfile.TemporaryFile()  # noqa: SIM115 - closed by the source
    shutil.copyfileobj(buffer, copy)
    copy.seek(0)
    return cast(IO[bytes], copy)


class _UnclosedReader(io.RawIOBase):
    """Standard input read through our own buffer, left open when that buffer closes."""

    def __init__(self, stream: IO[bytes]) -> None:
        super().__init__()
        self._stream = stream

    def readable(self) -> bool:
        return True

    def readinto(self, buffer: Any) -> int:
        data = self._stream.read1(len(buffer)) if hasattr(self._stream, "read1") else \
            self._stream.read(len(buffer))
        buffer[:len(data)] = data
        return len(data)


class CsvSource(_TextSource):
    """CSV (or TSV) with a header row; quoting errors and ragged rows are refused by line."""

    def __init__(self, path: str, *, delimiter: str = ",", encoding: str = "utf-8-sig") -> None:
        super().__init__(path, encoding)
        if csv.field_size_limit() < _FIELD_SIZE_LIMIT:
            csv.field_size_limit(_FIELD_SIZE_LIMIT)
        dialect = "excel-tab" if delimiter == "\t" else "excel"
        self._reader = csv.reader(self._handle, dialect=dialect, strict=True)
        self.blank_lines = 0
        try:
            header = self._next()
        except StopIteration:
            self.close()
            raise InputError(f"{self.label}: the file is empty (no header row)") from None
        except BaseException:
            self.close()  # a constructor that fails hands no source back to close
            raise
        self.columns = header

    def _next(self) -> list[str]:
        try:
            return next(self._reader)
        except UnicodeDecodeError:
            raise self._decode_error() from None
        except csv.Error as err:
            raise InputError(f"{self.label}, line {self._reader.line_num}: malformed "
                             f"{'TSV' if self._reader.dialect.delimiter == chr(9) else 'CSV'}"
                             f" ({err})") from None

    def chunks(self, size: int) -> Iterator[Chunk]:
        width, number = len(self.columns), 0
        rows: list[list[Any]] = []
        lines: list[int] = []
        reader = self._reader
        try:
            for row in reader:
                if len(row) != width:
                    if row:
                        raise InputError(
                            f"{self.label}, line {reader.line_num}: {len(row)} fields where "
                            f"the header has {width}")
                    if width != 1:
                        self.blank_lines += 1
                        continue
                    row = [""]
                rows.append(row)
                lines.append(reader.line_num)
                if len(rows) >= size:
                    number += len(rows)
                    yield Chunk(self.columns, rows, number - len(rows) + 1, lines, plain=True)
                    rows, lines = [], []
        except UnicodeDecodeError:
            raise self._decode_error() from None
        except csv.Error as err:
            kind = "TSV" if reader.dialect.delimiter == "\t" else "CSV"
            raise InputError(f"{self.label}, line {reader.line_num}: malformed {kind} ({err})"
                             ) from None
        if rows:
            number += len(rows)
            yield Chunk(self.columns, rows, number - len(rows) + 1, lines, plain=True)


class JsonLinesSource(_TextSource):
    """One JSON object per line. Keys missing from a row stay missing on output."""

    def __init__(self, path: str, *, encoding: str = "utf-8-sig",
                 scan_keys: bool = False) -> None:
        super().__init__(path, encoding, spool=scan_keys)
        self.columns = []
        self._index: dict[str, int] = {}
        self.blank_lines = 0
        try:
            if scan_keys:  # a tabular output needs every key before the first row is written
                for _, obj in self._objects():
                    self._add_keys(obj)
                self._handle.close()
                self._handle = self._reopen()
            # the first object names the columns before any chunk is read (for early errors)
            self._stream = self._objects()
            self._first = next(self._stream, None)
        except BaseException:
            self.close()  # a constructor that fails hands no source back to close
            raise
        if self._first is not None:
            self._add_keys(self._first[1])

    def _add_keys(self, obj: dict[str, Any]) -> None:
        for key in obj:
            if key not in self._index:
                self._index[key] = len(self.columns)
                self.columns.append(key)

    def _objects(self) -> Iterator[tuple[int, dict[str, Any]]]:
        self.blank_lines = 0
        try:
            for number, line in enumerate(self._handle, 1):
                if not line.strip():
                    self.blank_lines += 1
                    continue
                try:
                    obj = json.loads(line)
                except json.JSONDecodeError as err:
                    raise InputError(f"{self.label}, line {number}: not valid JSON "
                                     f"({err.msg} at column {err.colno})") from None
                if not isinstance(obj, dict):
                    raise InputError(f"{self.label}, line {number}: a JSON "
                                     f"{type(obj).__name__} where an object was expected")
                yield number, obj
        except UnicodeDecodeError:
            raise self._decode_error() from None

    def _all(self) -> Iterator[tuple[int, dict[str, Any]]]:
        if self._first is not None:
            yield self._first
        yield from self._stream

    def chunks(self, size: int) -> Iterator[Chunk]:
        rows: list[list[Any]] = []
        lines: list[int] = []
        count = 0
        for line, obj in self._all():
            self._add_keys(obj)
            rows.append([obj.get(c, MISSING) for c in self.columns])
            lines.append(line)
            count += 1
            if len(rows) >= size:
                yield Chunk(list(self.columns), _pad(rows, len(self.columns)),
                            count - len(rows) + 1, lines)
                rows, lines = [], []
        if rows:
            yield Chunk(list(self.columns), _pad(rows, len(self.columns)),
                        count - len(rows) + 1, lines)


def _pad(rows: list[list[Any]], width: int) -> list[list[Any]]:
    for row in rows:
        if len(row) < width:
            row.extend([MISSING] * (width - len(row)))
    return rows


# ===================================================================== plain JSON
_JSON_TYPES = {dict: "object", list: "array", str: "string", int: "number", float: "number",
               bool: "boolean", type(None): "null"}
_JSON_SPACE = re.compile(r"[ \t\r\n]*")


def _json_type(value: Any) -> str:
    return _JSON_TYPES.get(type(value), type(value).__name__)


class _JsonText:
    """A JSON text read block by block, one value at a time (memory holds one record, not
    the file), with the line number of every position kept."""

    _BLOCK = 1 << 16

    def __init__(self, handle: IO[str], label: str) -> None:
        self._handle, self._label = handle, label
        self._buffer, self._at, self.line, self._eof = "", 0, 1, False
        self._base = 0  # the column (from 0) of the first character held
        self._decoder = json.JSONDecoder()

    def _more(self) -> bool:
        if self._eof:
            return False
        block = self._handle.read(self._BLOCK)
        if not block:
            self._eof = True
            return False
        newline = self._buffer.rfind("\n", 0, self._at)
        self._base = self._at - newline - 1 if newline >= 0 else self._base + self._at
        self._buffer = self._buffer[self._at:] + block
        self._at = 0
        return True

    def _advance(self, to: int) -> None:
        self.line += self._buffer.count("\n", self._at, to)
        self._at = to

    def where(self, at: int | None = None) -> str:
        """``line N, column C`` of a position in the text held (default: the current one)."""
        at = self._at if at is None else at
        line = self.line + self._buffer.count("\n", self._at, at)
        newline = self._buffer.rfind("\n", 0, at)
        column = at - newline if newline >= 0 else self._base + at + 1
        return f"line {line}, column {column}"

    def peek(self) -> str:
        """The next character that is not white space ('' at the end of the text)."""
        while True:
            space = _JSON_SPACE.match(self._buffer, self._at)
            self._advance(space.end() if space else self._at)
            if self._at < len(self._buffer):
                return self._buffer[self._at]
            if not self._more():
                return ""

    def take(self, wanted: str, where: str) -> None:
        found = self.peek()
        if found != wanted:
            shown = repr(found) if found else "the end of the file"
            raise InputError(f"{self._label}, {self.where()}: not valid JSON ({wanted!r} "
                             f"expected {where}, found {shown})")
        self._advance(self._at + 1)

    def value(self) -> Any:
        """The next JSON value, decoded (read on until it is complete)."""
        self.peek()
        while True:
            try:
                value, end = self._decoder.raw_decode(self._buffer, self._at)
            except json.JSONDecodeError as err:
                # the value may run past the text read so far: read on, but only then (an
                # error in the middle of the text is reported without reading the rest)
                cut = err.pos >= len(self._buffer) - 6 or err.msg.startswith("Unterminated")
                if cut and self._more():
                    continue
                raise InputError(f"{self._label}, {self.where(err.pos)}: not valid JSON "
                                 f"({err.msg.removesuffix(' starting at')})") from None
            if end == len(self._buffer) and self._more():
                continue  # a number cut at the end of a block: read it whole
            self._advance(end)
            return value

    def rest_of_array(self, keep: bool) -> list[Any] | None:
        """After its ``[``: the elements of an array up to ``]``, read one at a time (kept
        and returned only with ``keep``: a long array that is not wanted never sits in
        memory whole)."""
        kept: list[Any] | None = [] if keep else None
        if self.peek() == "]":
            self.take("]", "")
            return kept
        while True:
            element = self.value()
            if kept is not None:
                kept.append(element)
            if self.peek() == "]":
                self.take("]", "")
                return kept
            self.take(",", "between the elements of an array")

    def skip(self) -> None:
        """Read past the next value."""
        if self.peek() == "[":
            self.take("[", "")
            self.rest_of_array(False)
        else:
            self.value()


@dataclass(frozen=True)
class JsonEnvelope:
    """The object around the array of records in a plain JSON file: the members before and
    after it (copied to a JSON output unchanged) and the key of the records."""

    key: str
    before: tuple[tuple[str, Any], ...] = ()
    after: tuple[tuple[str, Any], ...] = ()


class JsonSource(JsonLinesSource):
    """Plain JSON: an array of records, or an object holding one (``{"elements": [...]}``).

    The records are read one at a time, never the whole file at once. In an object, the
    array of records is the one member whose value is an array of objects, or the member
    ``records_key`` names (needed when there are several). Every other member is kept in
    :attr:`envelope` for a JSON output. A record that is not an object is refused with its
    number and line.
    """

    def __init__(self, path: str, *, encoding: str = "utf-8-sig", scan_keys: bool = False,
                 records_key: str | None = None) -> None:
        _TextSource.__init__(self, path, encoding, spool=True)  # read twice: layout, records
        self.columns = []
        self._index = {}
        self.blank_lines = 0
        self.records_key = records_key
        self.envelope: JsonEnvelope | None = None
        self._fresh = True
        try:
            self._layout()
            if scan_keys:  # a tabular output needs every key before the first row is written
                for _, obj in self._objects():
                    self._add_keys(obj)
            self._stream = self._objects()
            self._first = next(self._stream, None)
        except UnicodeDecodeError:
            self.close()
            raise self._decode_error() from None
        except BaseException:
            self.close()  # a constructor that fails hands no source back to close
            raise
        if self._first is not None:
            self._add_keys(self._first[1])

    def _text(self) -> _JsonText:
        if not self._fresh:
            self._handle.close()
            self._handle = self._reopen()
        self._fresh = False
        return _JsonText(self._handle, self.label)

    def _layout(self) -> None:
        """Where the records are: the top-level array, or which member of the object."""
        text = self._text()
        start = text.peek()
        if start == "":
            raise InputError(f"{self.label}: the file is empty (no JSON value)")
        if start == "[":
            if self.records_key is not None:
                raise InputError(f"{self.label}: --records-key {self.records_key!r} names a "
                                 "member of an object, but the file holds an array of records"
                                 "; leave the option out")
            return
        if start != "{":
            kind = _json_type(text.value())
            raise InputError(f"{self.label}, line {text.line}: a JSON {kind} at the top level;"
                             " expected an array of records or an object holding one")
        members: list[tuple[str, Any]] = []
        arrays: list[str] = []  # members whose value is an array of objects (or empty)
        text.take("{", "")
        while text.peek() != "}":
            if members:
                text.take(",", "between the members of an object")
            key = text.value()
            if not isinstance(key, str):
                raise InputError(f"{self.label}, line {text.line}: not valid JSON (a member "
                                 "name must be a string)")
            text.take(":", "after a member name")
            named = key == self.records_key
            if text.peek() != "[":
                line, value = text.line, text.value()
                if named:
                    raise InputError(f"{self.label}, line {line}: the member {key!r} holds a "
                                     f"JSON {_json_type(value)}, not an array of records")
                members.append((key, value))
                continue
            text.take("[", "")
            if named or (self.records_key is None and text.peek() in ("{", "]")):
                arrays.append(key)  # read past it: its records are read in the second pass
                members.append((key, text.rest_of_array(False)))
            else:  # any other array is kept, to be written back unchanged
                members.append((key, text.rest_of_array(True)))
        text.take("}", "at the end of the object")
        if text.peek() != "":
            raise InputError(f"{self.label}, line {text.line}: not valid JSON (text after the "
                             "end of the top-level value)")
        keys = [k for k, _ in members]
        if self.records_key is not None:
            if self.records_key not in keys:
                raise InputError(f"{self.label}: no member {self.records_key!r} in the "
                                 f"top-level object (members: {_listing(keys)})")
            chosen = self.records_key
        elif len(arrays) == 1:
            chosen = arrays[0]
        elif not arrays:
            raise InputError(f"{self.label}: the top-level object holds no array of records "
                             f"(members: {_listing(keys)}); a record is a JSON object")
        else:
            raise InputError(f"{self.label}: the top-level object holds several arrays of "
                             f"records ({_listing(arrays)}); choose one with --records-key")
        at = keys.index(chosen)
        self.envelope = JsonEnvelope(chosen, tuple(members[:at]), tuple(members[at + 1:]))

    def _objects(self) -> Iterator[tuple[int, dict[str, Any]]]:
        try:
            text = self._text()
            if self.envelope is not None:
                text.take("{", "")
                first = True
                while True:
                    if not first:
                        text.take(",", "between the members of an object")
                    first = False
                    key = text.value()
                    text.take(":", "after a member name")
                    if key == self.envelope.key:
                        break
                    text.skip()
            text.take("[", "")
            number = 0
            while text.peek() != "]":
                if number:
                    text.take(",", "between the records of the array")
                number += 1
                text.peek()
                line = text.line
                record = text.value()
                if not isinstance(record, dict):
                    raise InputError(f"{self.label}, record {number} (line {line}): a JSON "
                                     f"{_json_type(record)} where a record (an object) was "
                                     "expected")
                yield line, record
            text.take("]", "")
            if self.envelope is not None:  # the members after the records: well formed?
                while text.peek() == ",":
                    text.take(",", "")
                    text.value()
                    text.take(":", "after a member name")
                    text.skip()
                text.take("}", "at the end of the object")
            if text.peek() != "":
                raise InputError(f"{self.label}, line {text.line}: not valid JSON (text after "
                                 "the end of the top-level value)")
        except UnicodeDecodeError:
            raise self._decode_error() from None


def _listing(names: Sequence[str], most: int = 20) -> str:
    shown = ", ".join(repr(n) for n in list(names)[:most])
    return shown + (", …" if len(names) > most else "") if names else "none"


# ===================================================================== pipe tables (text)
#: A rule line: dashes (at least three), with pipes, '+', '=', ':' and spaces between.
_RULE = re.compile(r"[\s|+=:]*-{3,}[\s|+=:-]*")
#: Columns whose blank cell means "same as the row above" in a NIST ASD text export.
_REPEATED = re.compile(r"(?:^|\s)(?:configuration|conf\.?|term)$", re.IGNORECASE)
_LIMIT_CELL = re.compile(r"limit", re.IGNORECASE)
_LIMIT_LINE = re.compile(r"limit\b", re.IGNORECASE)
_MARKDOWN_ESCAPED_PIPE = re.compile(r"\\\|")
#: Header lines in a block before a rule line; a longer block is data.
_MAX_HEADER_LINES = 8


def _is_rule(line: str) -> bool:
    """A rule line: dashes in every cell (``----``, ``---|---``). A line of dashes and
    blank cells (``    |-------|    |``) underlines a spanning header cell: part of the
    header."""
    if _RULE.fullmatch(line) is None:
        return False
    cells = line.strip().strip("|").split("|")
    return all("-" in cell for cell in cells)


def _spans(line: str) -> list[tuple[int, int]]:
    """(start, end) of every cell of a pipe line, pipes excluded."""
    spans, start = [], 0
    for at, char in enumerate(line):
        if char == "|":
            spans.append((start, at))
            start = at + 1
    spans.append((start, len(line)))
    return spans


class _LineTableSource(_TextSource):
    """A table written as lines of text: one row per table row, its first line kept; what
    the reader knows beyond the cells goes into the chunk's marks."""

    def __init__(self, path: str, encoding: str) -> None:
        super().__init__(path, encoding)
        self.blank_lines = 0
        self.filled_cells = 0
        self.columns = []
        self._lines = self._numbered()

    def _numbered(self) -> Iterator[tuple[int, str]]:
        try:
            for number, line in enumerate(self._handle, 1):
                yield number, line.rstrip("\r\n")
        except UnicodeDecodeError:
            raise self._decode_error() from None

    def _rows(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        raise NotImplementedError

    def chunks(self, size: int) -> Iterator[Chunk]:
        rows: list[list[Any]] = []
        lines: list[int] = []
        marks: list[RowMark | None] = []
        marked = False
        count = 0
        for line, cells, mark in self._rows():
            rows.append(cells)
            lines.append(line)
            marks.append(mark)
            marked = marked or mark is not None
            count += 1
            if len(rows) >= size:
                yield Chunk(self.columns, rows, count - len(rows) + 1, lines, plain=True,
                            marks=marks if marked else None)
                rows, lines, marks, marked = [], [], [], False
        if rows:
            yield Chunk(self.columns, rows, count - len(rows) + 1, lines, plain=True,
                        marks=marks if marked else None)


class PipeTableSource(_LineTableSource):
    """A table of cells between ``|`` in a text file: a NIST ASD text export or a markdown
    pipe table. One row per table line; rule lines (``----``, ``---|---``) are not rows.

    ``nist-text``: the header is the block of lines above the first rule line; its lines are
    joined cell by cell, a cell spanning several columns naming each of them (``Lower level``
    over ``Conf. | Term | J`` gives ``Lower level Conf.`` ...). A header block repeated below a
    full-width rule is not data; rows under one that differs from the first record its line
    (``header-line:N``). A line of blank cells separates groups (counted as a blank line). In
    a configuration or term column (``Configuration``, ``Conf.``, ``Term``) a blank cell
    repeats the row above within its group: it is filled and the row records
    ``filled-from-above:COLUMN``. A row with a cell reading ``Limit`` (or a line starting with
    ``Limit``) is the series limit and is reported ``series-limit``.

    ``markdown``: a header line, a delimiter line (``|---|:---:|``), then rows; text around the
    table is not data, and a later table must have the same header. ``\\|`` and HTML entities
    (``&lt;``) in cells are decoded, as a markdown reader shows them.
    """

    def __init__(self, path: str, *, flavor: str = "nist-text",
                 encoding: str = "utf-8-sig") -> None:
        super().__init__(path, encoding)
        self.flavor = flavor
        self._header_lines: list[str] = []
        self._lead = self._trail = False
        self._pending: list[tuple[int, str]] = []
        try:
            self._read_header()
        except BaseException:
            self.close()  # a constructor that fails hands no source back to close
            raise
        self._fill_at = [i for i, c in enumerate(self.columns) if _REPEATED.search(c)] \
            if flavor == "nist-text" else []

    # -------------------------------------------------------------- the header
    def _read_header(self) -> None:
        if self.flavor == "markdown":
            self._markdown_header()
            return
        block: list[tuple[int, str]] = []
        for number, line in self._lines:
            if not line.strip():
                if block:  # a blank line ends a header that has no rule under it
                    break
                continue
            if _is_rule(line):
                if block:
                    self._set_header([text for _, text in block])
                    return
                continue
            if "|" not in line and not block:
                raise InputError(f"{self.label}, line {number}: not a pipe table (no '|' "
                                 "in its first line) as a NIST ASD text export (nist-text) is; "
                                 "give another format with --input-format (one of: "
                                 f"{', '.join(FORMATS)})")
            block.append((number, line))
            if len(block) > _MAX_HEADER_LINES:
                break
        if not block:
            raise InputError(f"{self.label}: the file is empty (no header row)")
        # no rule under the header: its first line is the header, the others are rows
        self._set_header([block[0][1]])
        self._pending = block[1:]

    def _markdown_header(self) -> None:
        previous: tuple[int, str] | None = None
        for number, line in self._lines:
            if previous is not None and "|" in previous[1] and _is_delimiter(line):
                self._set_header([previous[1]])
                return
            previous = (number, line)
        raise InputError(f"{self.label}: no markdown table (a header line, then a delimiter "
                         "line such as '|---|---|')")

    def _set_header(self, lines: list[str]) -> None:
        self._header_lines = lines
        self._lead, self._trail = _borders(lines)
        self.columns = self._names(lines)

    def _names(self, lines: list[str]) -> list[str]:
        """The column names of a header block: each column's words from top to bottom."""
        widest = max(lines, key=lambda text: text.count("|"))
        lead, trail = _borders(lines)
        bounds = _spans(widest.rstrip() if trail else widest)
        if lead:
            bounds = bounds[1:]
        if trail:
            bounds = bounds[:-1]
        parts: list[list[str]] = [[] for _ in bounds]
        for line in lines:
            for start, end in _spans(line):
                text = " ".join(line[start:end].split())
                if not text or _RULE.fullmatch(text):
                    continue
                for index, (low, high) in enumerate(bounds):
                    if start <= (low + high) / 2 < max(end, start + 1):
                        parts[index].append(text)
        names: list[str] = []
        for index, words in enumerate(parts):
            name = self._cell(" ".join(words)) or f"column {index + 1}"
            base, count = name, 1
            while name in names:
                count += 1
                name = f"{base} ({count})"
            names.append(name)
        return names

    # -------------------------------------------------------------- the rows
    def _cell(self, text: str) -> str:
        text = text.strip()
        if self.flavor == "markdown":
            text = html.unescape(_MARKDOWN_ESCAPED_PIPE.sub("|", text))
        return text

    def _cells(self, number: int, line: str) -> list[str]:
        if self.flavor == "markdown":
            line = _MARKDOWN_ESCAPED_PIPE.sub("\0", line)
        text = line.strip()
        if self._lead and text.startswith("|"):
            text = text[1:]
        if self._trail and text.endswith("|"):
            text = text[:-1]
        cells = [self._cell(c.replace("\0", "\\|")) for c in text.split("|")]
        if len(cells) != len(self.columns):
            raise InputError(f"{self.label}, line {number}: {len(cells)} fields where the "
                             f"header has {len(self.columns)}")
        return cells

    def _rows(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        return self._markdown_rows() if self.flavor == "markdown" else self._nist_rows()

    def _markdown_rows(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        in_table = True
        previous: tuple[int, str] | None = None
        for number, line in self._lines:
            if in_table and "|" in line and line.strip():
                yield number, self._cells(number, line), None
                continue
            if in_table:
                in_table = False
                previous = (number, line)
                continue
            if previous is not None and "|" in previous[1] and _is_delimiter(line):
                if self._names([previous[1]]) != self.columns:
                    raise InputError(
                        f"{self.label}, line {previous[0]}: a second table with other "
                        f"columns ({_listing(self._names([previous[1]]))}) than the first "
                        f"({_listing(self.columns)}); split the file, one table each")
                in_table = True
            previous = (number, line)

    def _nist_rows(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        above: dict[int, str] = {}  # the cells a blank cell repeats, in this group
        header_fix: tuple[str, ...] = ()
        back: list[tuple[int, str]] = list(self._pending)  # lines read ahead, to read again
        while True:
            if back:
                number, line = back.pop(0)
            else:
                item = next(self._lines, None)
                if item is None:
                    return
                number, line = item
            if not line.strip():
                self.blank_lines += 1
                above.clear()
                continue
            if _is_rule(line):
                above.clear()
                if "|" in line:
                    continue
                # a full-width rule: a repeated header block may follow, closed by a rule
                block, closed = self._block(back)
                if closed and self._repeats_header([text for _, text in block]):
                    names = self._names([text for _, text in block])
                    header_fix = () if names == self.columns else (
                        f"header-line:{block[0][0]}",)
                    continue
                back[:0] = block  # the lines were rows after all
                continue
            if "|" not in line:
                if _LIMIT_LINE.match(line.strip()):
                    above.clear()
                    cells = [line.strip()] + [""] * (len(self.columns) - 1)
                    yield number, cells, RowMark(header_fix, self.columns[0], line.strip())
                    continue
                raise InputError(f"{self.label}, line {number}: not a table row (no '|'): "
                                 f"{line.strip()[:60]!r}")
            cells = self._cells(number, line)
            if not any(cells):
                self.blank_lines += 1
                above.clear()
                continue
            limit = next((i for i, c in enumerate(cells) if _LIMIT_CELL.fullmatch(c)), None)
            if limit is not None:
                above.clear()
                yield number, cells, RowMark(header_fix, self.columns[limit], cells[limit])
                continue
            fixes = self._fill(cells, above)
            yield number, cells, (RowMark((*fixes, *header_fix)) if fixes or header_fix
                                  else None)

    def _block(self, back: list[tuple[int, str]]) -> tuple[list[tuple[int, str]], bool]:
        """The pipe lines after a full-width rule, up to the next rule line (``closed``) or
        the first line that cannot be a header line; the closing rule is consumed."""
        block: list[tuple[int, str]] = []
        while len(block) <= len(self._header_lines):
            if back:
                item: tuple[int, str] | None = back.pop(0)
            else:
                item = next(self._lines, None)
            if item is None:
                return block, False
            if _is_rule(item[1]):
                if block:
                    return block, True
                block.append(item)
                return block, False
            block.append(item)
            if "|" not in item[1] or not item[1].strip():
                return block, False
        return block, False

    def _repeats_header(self, lines: list[str]) -> bool:
        """A block is the header again when it has as many lines and columns as the first
        one and keeps at least half of its column names (NIST changes 'Vac' to 'Air')."""
        if len(lines) != len(self._header_lines):
            return False
        names = self._names(lines)
        same = sum(a == b for a, b in zip(names, self.columns, strict=False))
        return len(names) == len(self.columns) and 2 * same >= len(self.columns)

    def _fill(self, cells: list[str], above: dict[int, str]) -> list[str]:
        """Fill the blank configuration and term cells that repeat the row above: in each
        group of such columns (``Lower level Conf.``, ``Lower level Term`` ...) from the left,
        up to the first cell that is written (a new configuration starts a new term)."""
        fixes = []
        group: str | None = None
        open_group = True
        for index in self._fill_at:
            name = self.columns[index]
            prefix = name[:_REPEATED.search(name).start()]  # type: ignore[union-attr]
            if prefix != group:
                group, open_group = prefix, True
            if cells[index]:
                open_group = False
                above[index] = cells[index]
            elif open_group and index in above:
                cells[index] = above[index]
                fixes.append(f"filled-from-above:{name}")
                self.filled_cells += 1
        return fixes



_DELIMITER = re.compile(r"\s*\|?\s*:?-+:?\s*(?:\|\s*:?-+:?\s*)*\|?\s*")


def _borders(lines: list[str]) -> tuple[bool, bool]:
    """Whether a header's widest line opens with a border ``|`` and closes with one (that
    pipe then ends the last cell instead of starting a new one)."""
    widest = max(lines, key=lambda text: text.count("|"))
    return (widest.lstrip().startswith("|"),
            widest.rstrip().endswith("|") and widest.count("|") > 1)


def _is_delimiter(line: str) -> bool:
    """A markdown table's delimiter line: ``|---|:---:|``."""
    return "-" in line and _DELIMITER.fullmatch(line) is not None


# ===================================================================== reStructuredText
_RST_BORDER = re.compile(r"=+(?: +=+)*\s*")
_RST_UNDERLINE = re.compile(r"-+(?: +-+)*\s*")
_GRID_BORDER = re.compile(r"\+(?:[-=]+\+)+\s*")


class RstTableSource(_LineTableSource):
    """The tables of a reStructuredText file, simple and grid, read as one table.

    Simple tables: the ``=====  =====`` border gives the columns (the last one runs to the end
    of the line); the lines between the first two borders are the header (a table closed by
    its second border has none: its columns are ``column 1`` ...); a line whose first column
    is blank continues the row above (its cells are joined); text in the gap between two
    columns is refused, as reStructuredText refuses it. Grid tables: ``+----+----+`` borders,
    cells between ``|`` at the border's ``+`` positions, the rows above ``+====+`` the header;
    cells that span columns are refused. Text outside the tables (titles, prose) is not data;
    every table must have the columns of the first.
    """

    def __init__(self, path: str, *, encoding: str = "utf-8-sig") -> None:
        super().__init__(path, encoding)
        self._tables = self._read_tables()
        try:
            self._first = next(self._tables, None)
        except BaseException:
            self.close()  # a constructor that fails hands no source back to close
            raise
        if self._first is None:
            self.close()
            raise InputError(f"{self.label}: no reStructuredText table (a simple table "
                             "between '===  ===' borders or a grid table of '+---+---+')")

    def _rows(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        if self._first is not None:
            yield self._first
            self._first = None
        yield from self._tables

    def _read_tables(self) -> Iterator[tuple[int, list[str], RowMark | None]]:
        """The rows of every table; the first header names :attr:`columns`. A table starts
        after a blank line (or at the top of the file): a title's underline does not."""
        back: list[tuple[int, str]] = []
        blank_before = True
        while True:
            item = back.pop(0) if back else next(self._lines, None)
            if item is None:
                return
            number, line = item
            text = line.strip()
            if blank_before and _is_simple_border(text):
                yield from self._simple(number, line, back)
                blank_before = False
                continue
            if blank_before and _GRID_BORDER.fullmatch(text):
                yield from self._grid(number, line, back)
                blank_before = False
                continue
            blank_before = not text

    def _table_columns(self, number: int, names: list[str]) -> None:
        if not self.columns:
            self.columns = names
        elif names != self.columns:
            raise InputError(f"{self.label}, line {number}: a table with other columns "
                             f"({_listing(names)}) than the first ({_listing(self.columns)})"
                             "; split the file, one table each")

    # -------------------------------------------------------------- simple tables
    def _simple(self, number: int, border: str, back: list[tuple[int, str]]
                ) -> Iterator[tuple[int, list[str], RowMark | None]]:
        spans = [m.span() for m in re.finditer(r"=+", border)]
        head: list[tuple[int, str]] = []
        header = True
        for item in self._lines:  # up to the second border: the header, or a whole table
            if _is_simple_border(item[1].strip()):
                break
            head.append(item)
        else:
            raise InputError(f"{self.label}, line {number}: a table border with no border "
                             "under it")
        following = next(self._lines, None)
        if following is None or not following[1].strip():
            header = False  # the second border closed the table: no header
            if following is not None:
                back.append(following)
        if header:
            texts = [self._split(n, line, spans) for n, line in head
                     if not _RST_UNDERLINE.fullmatch(line.strip())]
            names = [" ".join(" ".join(t[i] for t in texts).split()) or f"column {i + 1}"
                     for i in range(len(spans))]
            self._table_columns(number, _unique(names))
            assert following is not None
            body: Iterator[tuple[int, str]] = self._until_border(following)
        else:
            self._table_columns(number, [f"column {i + 1}" for i in range(len(spans))])
            body = iter(head)
        row: tuple[int, list[str]] | None = None
        for line_number, line in body:
            if not line.strip():
                self.blank_lines += 1
                continue
            if _RST_UNDERLINE.fullmatch(line.strip()):
                continue  # a rule under spanning cells
            cells = self._split(line_number, line, spans)
            if row is not None and not cells[0]:  # a continuation line
                row[1][:] = [f"{a} {b}".strip() for a, b in zip(row[1], cells, strict=True)]
                continue
            if row is not None:
                yield row[0], row[1], None
            row = (line_number, cells)
        if row is not None:
            yield row[0], row[1], None

    def _until_border(self, first: tuple[int, str]) -> Iterator[tuple[int, str]]:
        for item in itertools.chain([first], self._lines):
            if _is_simple_border(item[1].strip()):
                return
            yield item
        raise InputError(f"{self.label}: a table is not closed by a border line before the "
                         "end of the file")

    def _split(self, number: int, line: str, spans: list[tuple[int, int]]) -> list[str]:
        if line[:spans[0][0]].strip():
            raise InputError(f"{self.label}, line {number}: text left of the first column "
                             f"(at column 1)")
        cells = []
        for index, (start, end) in enumerate(spans):
            if index + 1 == len(spans):
                cells.append(line[start:].strip())
                break
            gap = line[end:spans[index + 1][0]]
            if gap.strip():
                at = end + len(gap) - len(gap.lstrip()) + 1
                raise InputError(f"{self.label}, line {number}: text in the gap after column "
                                 f"{index + 1} (at column {at}); widen the column in the "
                                 "table's border lines")
            cells.append(line[start:end].strip())
        return cells

    # -------------------------------------------------------------- grid tables
    def _grid(self, number: int, border: str, back: list[tuple[int, str]]
              ) -> Iterator[tuple[int, list[str], RowMark | None]]:
        plus = [i for i, c in enumerate(border.rstrip()) if c == "+"]
        width = len(plus) - 1
        parts: list[list[str]] = [[] for _ in range(width)]
        first: int | None = None
        waiting: list[tuple[int, list[str]]] = []  # rows read before the header is known
        named = False
        for line_number, line in self._lines:
            text = line.rstrip()
            if _GRID_BORDER.fullmatch(text.strip()):
                if first is not None:
                    waiting.append((first, [" ".join(" ".join(p).split()) for p in parts]))
                parts, first = [[] for _ in range(width)], None
                if "=" in text and not named:  # the rows so far were the header
                    self._table_columns(number, _unique([
                        " ".join(" ".join(c[i] for _, c in waiting).split())
                        or f"column {i + 1}" for i in range(width)]))
                    named, waiting = True, []
                if named:
                    for row in waiting:
                        yield row[0], row[1], None
                    waiting = []
                continue
            if not text.strip() or not text.lstrip().startswith("|"):
                if first is not None:
                    raise InputError(f"{self.label}, line {line_number}: a grid table row "
                                     "not closed by a '+---+' border")
                back.append((line_number, line))
                break
            if any(len(text) <= p or text[p] not in "|+" for p in plus):
                raise InputError(f"{self.label}, line {line_number}: a grid table line whose "
                                 "'|' do not line up with the border's '+' (cells that span "
                                 "columns are not read)")
            first = line_number if first is None else first
            for index in range(width):
                parts[index].append(text[plus[index] + 1:plus[index + 1]].strip())
        if first is not None:
            raise InputError(f"{self.label}: a grid table row not closed by a '+---+' border "
                             "before the end of the file")
        if not named:  # no '+===+': a table without a header
            self._table_columns(number, [f"column {i + 1}" for i in range(width)])
            for row in waiting:
                yield row[0], row[1], None


def _is_simple_border(text: str) -> bool:
    """A simple table's border: two or more runs of '=' (one run underlines a title)."""
    return " " in text and _RST_BORDER.fullmatch(text) is not None


def _unique(names: list[str]) -> list[str]:
    out: list[str] = []
    for name in names:
        base, count = name, 1
        while name in out:
            count += 1
            name = f"{base} ({count})"
        out.append(name)
    return out


def _pyarrow() -> Any:
    try:
        import pyarrow  # type: ignore[import-untyped]
        import pyarrow.parquet  # type: ignore[import-untyped]
    except ImportError:
        raise InputError("Parquet needs pyarrow: pip install 'confspec[tables]'") from None
    return pyarrow


class ParquetSource:
    """Parquet read batch by batch; the column types are kept for a Parquet output."""

    def __init__(self, path: str) -> None:
        if path == STDIN:
            raise InputError("Parquet is not read from standard input; give the file's path "
                             "(or pipe CSV, TSV or JSON Lines with --input-format)")
        _require_file(path)
        pa = _pyarrow()
        self.label = path
        try:
            self._file = pa.parquet.ParquetFile(path)
        except (pa.ArrowException, OSError) as err:
            raise InputError(f"{path}: not a readable Parquet file ({first_line(err)})") from None
        self.schema = self._file.schema_arrow
        self.columns = list(self.schema.names)
        self._rows_total = self._file.metadata.num_rows
        self._done = 0

    def chunks(self, size: int) -> Iterator[Chunk]:
        pa = _pyarrow()
        first = 1
        try:
            for batch in self._file.iter_batches(batch_size=size):
                columns = [column.to_pylist() for column in batch.columns]
                rows = [list(r) for r in zip(*columns, strict=True)] if columns else []
                yield Chunk(self.columns, rows, first)
                first += len(rows)
                self._done += len(rows)
        except pa.ArrowException as err:
            raise InputError(f"{self.label}: cannot read row group ({first_line(err)})") from None

    def fraction(self) -> float | None:
        return self._done / self._rows_total if self._rows_total else None

    def close(self) -> None:
        self._file.close()


# ===================================================================== sinks
#: Output names written to the process's own stream (never opened by name, never renamed over).
STREAM_NAMES: dict[str, int] = {
    "-": 1, "/dev/stdout": 1, "/dev/fd/1": 1, "/proc/self/fd/1": 1,
    "/dev/stderr": 2, "/dev/fd/2": 2, "/proc/self/fd/2": 2,
}
#: A temporary file older than this, in the naming of earlier versions, is stale.
_LEGACY_STALE_SECONDS = 3600
_HOST = re.sub(r"[^A-Za-z0-9]+", "", socket.gethostname())[:32] or "host"


def is_special_output(path: str) -> bool:
    """True for ``-``, ``/dev/std*`` and existing non-regular files (FIFOs, devices): these
    are written directly, as a stream, and never replaced by a renamed temporary file."""
    if path in STREAM_NAMES:
        return True
    try:
        mode = os.stat(path).st_mode
    except OSError:
        return False
    return not stat.S_ISREG(mode) and not stat.S_ISDIR(mode)


def _pid_alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError, ValueError):
        return True  # another user's process, or a number we cannot ask about: keep the file
    return True


def stale_temporary_files(path: str) -> list[str]:
    """Temporary files an earlier run left beside ``path`` when it was killed: ours name the
    host and process (``.NAME.HOST-PID-XXXXXXXX.partial``) and are stale when that process is
    gone; those of earlier versions (``.NAME.XXXXXXXX.partial``) when untouched for an hour."""
    directory = os.path.dirname(os.path.abspath(path))
    prefix, suffix = f".{os.path.basename(path)}.", ".partial"
    ours = re.compile(r"(?P<host>[A-Za-z0-9]*)-(?P<pid>\d{1,10})-[0-9a-f]{8}")
    legacy = re.compile(r"[a-z0-9_]{8}")
    found = []
    try:
        names = os.listdir(directory)
    except OSError:
        return []
    for name in names:
        if not (name.startswith(prefix) and name.endswith(suffix)):
            continue
        middle = name[len(prefix):-len(suffix)]
        full = os.path.join(directory, name)
        match = ours.fullmatch(middle)
        if match:
            if match["host"] == _HOST and not _pid_alive(int(match["pid"])):
                found.append(full)
        elif legacy.fullmatch(middle):
            with contextlib.suppress(OSError):
                if time.time() - os.stat(full).st_mtime > _LEGACY_STALE_SECONDS:
                    found.append(full)
    return found


_STOP_SIGNALS = tuple(getattr(signal, n) for n in ("SIGINT", "SIGTERM", "SIGHUP")
                      if hasattr(signal, n))


@contextlib.contextmanager
def _signals_deferred() -> Iterator[None]:
    """Hold SIGINT, SIGTERM and SIGHUP for a few statements (they are delivered after)."""
    mask = getattr(signal, "pthread_sigmask", None)
    if mask is None or threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = mask(signal.SIG_BLOCK, _STOP_SIGNALS)
    try:
        yield
    finally:
        mask(signal.SIG_SETMASK, previous)


class _Target:
    """Where a file sink's bytes go, named in every message as the user gave it.

    A regular file (new, or existing with ``overwrite``) is written to a temporary file beside
    it, created with the mode the umask gives and renamed onto it by :meth:`commit`; stale
    temporary files of an earlier killed run of the same output are removed first. ``-``,
    ``/dev/std*`` and other special files (FIFOs, character devices) are written directly.
    """

    def __init__(self, path: str, *, overwrite: bool = True) -> None:
        self.path = path
        self.temp: str | None = None
        self.real = path
        self._layers: list[IO[Any]] = []
        self._stream = STREAM_NAMES.get(path)
        self.direct = is_special_output(path)
        if self.direct:
            return
        if os.path.isdir(path):
            raise InputError(f"{path}: is a directory")
        real = os.path.realpath(path)  # a symlink stays a symlink: its target is replaced
        directory = os.path.dirname(real)
        if not os.path.isdir(directory):
            raise InputError(f"{path}: the directory {os.path.dirname(os.path.abspath(path))} "
                             "does not exist")
        if os.path.exists(real) and not overwrite:
            raise InputError(f"{path}: exists already; pass --overwrite to replace it")
        for stale in stale_temporary_files(real):
            with contextlib.suppress(OSError):
                os.unlink(stale)
        self.real = real
        for _ in range(100):
            temp = os.path.join(directory, f".{os.path.basename(real)}.{_HOST}-{os.getpid()}-"
                                           f"{secrets.token_hex(4)}.partial")
            with _signals_deferred():  # a stop here must not orphan the file just created
                # known before it exists: a stop that lands just after os.open still finds it
                self.temp = temp
                _UNFINISHED.add(self)  # removed by abort_unfinished() if the job stops first
                try:
                    fd = os.open(temp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
                except FileExistsError:  # our own name (it holds our pid): draw another
                    self.temp = None
                    continue
                except OSError as err:
                    self.temp = None
                    _UNFINISHED.discard(self)
                    raise InputError(f"{path}: cannot write ({err.strerror or err})") from None
            os.close(fd)
            break
        else:  # pragma: no cover - 100 collisions of 32 random bits
            raise InputError(f"{path}: cannot create a temporary file beside it")

    def binary(self, *, compressed: bool = False) -> IO[bytes]:
        """The byte stream to write (closed by :meth:`commit` or :meth:`abort`)."""
        if self._stream is not None:
            stream = sys.stdout if self._stream == 1 else sys.stderr
            stream.flush()
            buffer = getattr(stream, "buffer", None)
            if buffer is None:
                raise InputError(f"{self.path}: this stream takes text only")
            raw: IO[bytes] = cast(IO[bytes], io.BufferedWriter(_Unclosed(buffer)))
        else:
            with self.guard(), _signals_deferred():  # the handle is kept before a stop lands
                raw = open(self.temp or self.path, "wb")  # noqa: SIM115 - closed by commit
                self._layers.insert(0, raw)
                return self._compressed(raw, compressed)
        self._layers.insert(0, raw)
        return self._compressed(raw, compressed)

    def _compressed(self, raw: IO[bytes], compressed: bool) -> IO[bytes]:
        if compressed:
            raw = cast(IO[bytes], gzip.GzipFile(fileobj=raw, mode="wb"))
            self._layers.insert(0, raw)
        return raw

    def text(self, *, encoding: str, newline: str, compressed: bool = False) -> IO[str]:
        """A text stream over :meth:`binary`."""
        if self._stream is not None and not compressed:
            stream = sys.stdout if self._stream == 1 else sys.stderr
            if getattr(stream, "buffer", None) is None:  # an in-memory stream (tests)
                handle: IO[str] = cast(IO[str], _UnclosedText(stream))
                self._layers.insert(0, handle)
                return handle
        raw = self.binary(compressed=compressed)
        handle = io.TextIOWrapper(raw, encoding=encoding, newline=newline)
        self._layers.insert(0, handle)
        return handle

    @contextlib.contextmanager
    def guard(self) -> Iterator[None]:
        """OS errors while writing, named by the output path the user gave."""
        try:
            yield
        except BrokenPipeError:
            raise
        except OSError as err:
            raise InputError(f"{self.path}: cannot write ({err.strerror or err})") from None

    def _close(self) -> None:
        layers, self._layers = self._layers, []
        with self.guard():
            for layer in layers:  # outermost first: each flushes into the next
                layer.close()

    def commit(self) -> None:
        self._close()
        if self.temp is not None:
            with self.guard():
                os.replace(self.temp, self.real)
            self.temp = None
        _UNFINISHED.discard(self)

    def abort(self) -> None:
        with contextlib.suppress(Exception):
            self._close()
        if self.temp is not None:
            with contextlib.suppress(FileNotFoundError):
                os.unlink(self.temp)
            self.temp = None
        _UNFINISHED.discard(self)


#: Targets whose temporary file exists and was neither committed nor aborted.
_UNFINISHED: set[_Target] = set()


def abort_unfinished() -> int:
    """Remove the temporary files of outputs neither committed nor aborted (a sink made but
    never handed to :func:`run`, or a stop between the two); returns how many."""
    targets = list(_UNFINISHED)
    for target in targets:
        target.abort()
    return len(targets)


class _Unclosed(io.RawIOBase):
    """A process stream that our close() flushes but leaves open."""

    def __init__(self, stream: IO[bytes]) -> None:
        super().__init__()
        self._stream = stream

    def writable(self) -> bool:
        return True

    def write(self, data: Any) -> int:
        self._stream.write(data)
        return len(data)

    def close(self) -> None:
        if not self.closed:
            self._stream.flush()
        super().close()


class _UnclosedText(io.TextIOBase):
    def __init__(self, stream: IO[str]) -> None:
        super().__init__()
        self._stream = stream

    def writable(self) -> bool:
        return True

    def write(self, text: str) -> int:
        return self._stream.write(text)

    def close(self) -> None:
        if not self.closed:
            self._stream.flush()
        super().close()


def write_text_output(path: str, text: str, *, overwrite: bool = True) -> None:
    """Write ``text`` (UTF-8) to ``path`` as the sinks do: atomically for a regular file,
    directly for ``-`` and special files."""
    target = _Target(path, overwrite=overwrite)
    try:
        handle = target.text(encoding="utf-8", newline="\n")
        with target.guard():
            handle.write(text)
        target.commit()
    except BaseException:
        target.abort()
        raise


def _text_cell(value: Any) -> Any:
    if value is None or value is MISSING:
        return ""
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    return value


class CsvSink:
    """CSV or TSV, header first; ``.gz`` targets are compressed."""

    def __init__(self, path: str, *, delimiter: str = ",", encoding: str = "utf-8",
                 overwrite: bool = True) -> None:
        self._atomic = _Target(path, overwrite=overwrite)
        self._handle = self._atomic.text(encoding=encoding, newline="",
                                         compressed=path.lower().endswith(".gz"))
        dialect = "excel-tab" if delimiter == "\t" else "excel"
        self._writer = csv.writer(self._handle, dialect=dialect, lineterminator="\n")
        self._header: list[str] | None = None

    def write(self, columns: list[str], rows: list[list[Any]], *, plain: bool = False) -> None:
        with self._atomic.guard():
            if self._header is None:
                self._header = list(columns)
                self._writer.writerow(columns)
            elif columns != self._header:
                raise InputError("a row has fields the first rows lack; write JSON Lines "
                                 "instead")
            if plain:  # the csv module writes None (and MISSING) as an empty field
                self._writer.writerows(rows)
            else:
                self._writer.writerows([_text_cell(v) for v in row] for row in rows)

    def commit(self) -> None:
        self._atomic.commit()

    def abort(self) -> None:
        self._atomic.abort()


class JsonLinesSink:
    """One JSON object per row; cells a row did not have stay absent."""

    def __init__(self, path: str, *, overwrite: bool = True) -> None:
        self._atomic = _Target(path, overwrite=overwrite)
        self._handle = self._atomic.text(encoding="utf-8", newline="\n",
                                         compressed=path.lower().endswith(".gz"))

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        dumps = json.dumps
        with self._atomic.guard():
            self._handle.write("".join(
                dumps({c: v for c, v in zip(columns, row, strict=True) if v is not MISSING},
                      ensure_ascii=False, default=str) + "\n" for row in rows))

    def commit(self) -> None:
        self._atomic.commit()

    def abort(self) -> None:
        self._atomic.abort()


class JsonSink:
    """Plain JSON in the shape it was read: an array of records, one per line, or, given the
    ``envelope`` of an object input, that object with its other members unchanged and the
    records under the same key. Cells a row did not have stay absent."""

    def __init__(self, path: str, *, envelope: JsonEnvelope | None = None,
                 overwrite: bool = True) -> None:
        self._atomic = _Target(path, overwrite=overwrite)
        self._handle = self._atomic.text(encoding="utf-8", newline="\n",
                                         compressed=path.lower().endswith(".gz"))
        self._envelope = envelope
        self._rows = 0
        self._started = False

    def _start(self) -> None:
        self._started = True
        envelope = self._envelope
        if envelope is None:
            self._handle.write("[")
            return
        dumps = json.dumps
        members = "".join(f"\n  {dumps(k, ensure_ascii=False)}: "
                          f"{dumps(v, ensure_ascii=False, default=str)}," for k, v in
                          envelope.before)
        self._handle.write(f"{{{members}\n  {dumps(envelope.key, ensure_ascii=False)}: [")

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        dumps = json.dumps
        with self._atomic.guard():
            if not self._started:
                self._start()
            if not rows:
                return
            indent = "\n  " if self._envelope is None else "\n    "
            self._handle.write(("," if self._rows else "") + ",".join(
                indent + dumps({c: v for c, v in zip(columns, row, strict=True)
                              if v is not MISSING}, ensure_ascii=False, default=str)
                for row in rows))
            self._rows += len(rows)

    def commit(self) -> None:
        with self._atomic.guard():
            if not self._started:
                self._start()
            close = "\n]" if self._envelope is None else "\n  ]"
            self._handle.write(close if self._rows else "]")
            if self._envelope is not None:
                dumps = json.dumps
                self._handle.write("".join(
                    f",\n  {dumps(k, ensure_ascii=False)}: "
                    f"{dumps(v, ensure_ascii=False, default=str)}"
                    for k, v in self._envelope.after) + "\n}")
            self._handle.write("\n")
        self._atomic.commit()

    def abort(self) -> None:
        self._atomic.abort()


class ParquetSink:
    """Parquet written row group by row group; input column types are kept when known."""

    def __init__(self, path: str, *, types: dict[str, Any] | None = None,
                 overwrite: bool = True) -> None:
        self._pa = _pyarrow()
        self._atomic = _Target(path, overwrite=overwrite)
        self._out = self._atomic.binary()
        self._types = dict(types or {})
        self._writer: Any = None
        self._schema: Any = None

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        pa = self._pa
        data = [list(c) for c in zip(*rows, strict=True)] if rows else [[] for _ in columns]
        if self._schema is None:
            fields = []
            for name, values in zip(columns, data, strict=True):
                values = [None if v is MISSING else v for v in values]
                kind = self._types.get(name)
                if kind is None:
                    try:
                        kind = pa.array(values).type
                    except (pa.ArrowException, TypeError):
                        kind = pa.string()
                    if pa.types.is_null(kind):
                        kind = pa.string()
                fields.append(pa.field(name, kind))
            self._schema = pa.schema(fields)
            self._writer = pa.parquet.ParquetWriter(self._out, self._schema)
        elif list(self._schema.names) != columns:
            raise InputError("a row has fields the first rows lack; write JSON Lines instead")
        arrays = []
        for spec, values in zip(self._schema, data, strict=True):
            values = [None if v is MISSING else v for v in values]
            try:
                arrays.append(pa.array(values, type=spec.type))
            except (pa.ArrowException, TypeError, ValueError):
                arrays.append(pa.array([None if v is None else _text_cell(v) for v in values],
                                       type=pa.string()).cast(spec.type, safe=False)
                              if pa.types.is_string(spec.type) else refuse_mixed_types(spec))
        with self._atomic.guard():
            self._writer.write_table(pa.Table.from_arrays(arrays, schema=self._schema))

    def commit(self) -> None:
        if self._writer is None:  # no rows at all: still write a valid (empty) file
            self._writer = self._pa.parquet.ParquetWriter(self._out, self._pa.schema([]))
        with self._atomic.guard():
            self._writer.close()
        self._atomic.commit()

    def abort(self) -> None:
        if self._writer is not None:
            with contextlib.suppress(Exception):
                self._writer.close()
        self._atomic.abort()



def refuse_mixed_types(spec: Any) -> Any:
    raise InputError(f"column {spec.name!r}: values of more than one type do not fit the "
                     f"Parquet type {spec.type}; write CSV or JSON Lines instead")


