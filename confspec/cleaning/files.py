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
import io
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
from collections.abc import Iterator
from typing import IO, Any, cast

from .check import MISSING, InputError, first_line
from .job import Chunk

__all__ = [
    "FORMATS",
    "STDIN",
    "STREAM_NAMES",
    "CsvSink",
    "CsvSource",
    "JsonLinesSink",
    "JsonLinesSource",
    "ParquetSink",
    "ParquetSource",
    "abort_unfinished",
    "format_of",
    "is_special_output",
    "refuse_mixed_types",
    "stale_temporary_files",
    "write_text_output",
]

#: File formats by name; chosen from the extension unless given.
FORMATS = ("csv", "tsv", "jsonl", "parquet")
_EXTENSIONS = {".csv": "csv", ".tsv": "tsv", ".tab": "tsv", ".jsonl": "jsonl",
               ".ndjson": "jsonl", ".parquet": "parquet", ".pq": "parquet"}



def format_of(path: str, given: str | None) -> str:
    """The file format from ``given`` or from the extension (``.gz`` is looked through)."""
    if given:
        if given not in FORMATS:
            raise InputError(f"unknown format {given!r}; use one of: {', '.join(FORMATS)}")
        return given
    if path in STREAM_NAMES or path == STDIN:
        return "csv"  # a stream has no extension: CSV unless a format option says otherwise
    name = path.lower()
    if name.endswith(".gz"):
        name = name[:-3]
    suffix = os.path.splitext(name)[1]
    if suffix in _EXTENSIONS:
        return _EXTENSIONS[suffix]
    raise InputError(f"{path}: cannot tell the format from the extension {suffix or '(none)'!r}; "
                     f"give it with a format option ({', '.join(FORMATS)})")


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


