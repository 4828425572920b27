"""Reading a catalog file's bytes safely and decoding them to text.

Shared by the CSV and YAML readers: the size cap, the "is this a text file at all" test
(spreadsheets, archives and binaries are refused with a one-line reason), and the
encoding fallback chain UTF-8 (with or without BOM) -> UTF-16 (with BOM) ->
Windows-1252 -> Latin-1, decided per line when a file mixes encodings.
"""

from __future__ import annotations

import os
import stat
from dataclasses import dataclass
from pathlib import Path
from typing import Final

from catalog.problems import CatalogError, Problem
from catalog.rawtable import Limits

__all__ = ["DecodedText", "decode_catalog_bytes", "read_capped", "read_catalog_bytes"]

# File signatures of things people save instead of a CSV, with what to tell them.
_SIGNATURES: Final[tuple[tuple[bytes, str], ...]] = (
    (b"PK\x03\x04", "a ZIP archive (an .xlsx/.ods workbook?); export the sheet as CSV"),
    (b"\xd0\xcf\x11\xe0", "an old Excel workbook (.xls); export the sheet as CSV"),
    (b"%PDF", "a PDF document, not a table"),
    (b"\x1f\x8b", "a gzip archive; unpack it first"),
    (b"\x7fELF", "a program file, not a table"),
    (b"SQLite format 3", "an SQLite database, not a table"),
    (b"PAR1", "a Parquet file, not a text table"),
)
_TEXT_CONTROLS: Final[frozenset[str]] = frozenset("\t\n\r\f\v")
#: Above this share of control characters in the sample, the file is binary.
_BINARY_SHARE: Final[float] = 0.02
_SAMPLE_CHARS: Final[int] = 65536


@dataclass(frozen=True)
class DecodedText:
    """A decoded file: the text, the encoding used, and warnings about the decoding."""

    text: str
    encoding: str
    problems: tuple[Problem, ...]


def read_catalog_bytes(path: Path, limits: Limits) -> bytes:
    """Read a whole catalog file, refusing directories, missing files and huge files.

    Raises CatalogError with the path and the reason. The file is opened read-only and
    never modified.
    """
    shown = str(path)
    try:
        status = os.stat(path)
        size = status.st_size
    except FileNotFoundError:
        raise CatalogError(f"{shown}: no such file") from None
    except OSError as error:
        raise CatalogError(f"{shown}: cannot read ({error.strerror or error})") from None
    if stat.S_ISDIR(status.st_mode):
        raise CatalogError(f"{shown}: is a directory")
    if size > limits.max_file_bytes:
        raise CatalogError(
            f"{shown}: {size / 1e6:.1f} MB is larger than the {limits.max_file_bytes / 1e6:.0f} MB "
            "a catalog file may have; split it into several files"
        )
    try:
        data = read_capped(path, limits.max_file_bytes + 1)
    except OSError as error:
        raise CatalogError(f"{shown}: cannot read ({error.strerror or error})") from None
    if len(data) > limits.max_file_bytes:  # grew while we looked, or a device file
        raise CatalogError(f"{shown}: larger than {limits.max_file_bytes / 1e6:.0f} MB")
    if not data and stat.S_ISFIFO(os.stat(path).st_mode):
        raise CatalogError(f"{shown}: a named pipe with nothing written to it")
    return data


def read_capped(path: Path, most: int) -> bytes:
    """Up to ``most`` bytes of a file, a pipe or a device.

    Opened non-blocking: a named pipe with no writer would otherwise block open() forever;
    with the flag it opens at once and reads as empty. Reads are blocking again after the
    open, so a pipe whose writer is still producing (``--catalog <(command)``) is read whole.
    """
    descriptor = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    try:
        if getattr(os, "O_NONBLOCK", 0):
            os.set_blocking(descriptor, True)
        with os.fdopen(descriptor, "rb") as handle:
            descriptor = -1
            return handle.read(most)
    finally:
        if descriptor >= 0:
            os.close(descriptor)


def _utf16_without_bom(data: bytes) -> str | None:
    """Spot BOM-less UTF-16 (every other byte NUL in ASCII text); return its codec."""
    sample = data[:4096]
    if len(sample) < 4:
        return None
    even, odd = sample[0::2], sample[1::2]
    even_nul = even.count(0) / len(even)
    odd_nul = odd.count(0) / len(odd)
    if odd_nul > 0.4 and even_nul < 0.05:
        return "utf-16-le"
    if even_nul > 0.4 and odd_nul < 0.05:
        return "utf-16-be"
    return None


def _decode_lines(data: bytes, path: str) -> DecodedText:
    """Decode line by line: UTF-8 where it is valid, else Windows-1252, else Latin-1."""
    pieces: list[str] = []
    fallback_lines: list[int] = []
    lossy_lines: list[int] = []
    utf8_lines = 0
    for number, raw in enumerate(data.split(b"\n"), start=1):
        try:
            pieces.append(raw.decode("utf-8"))
            if not raw.isascii():
                utf8_lines += 1
            continue
        except UnicodeDecodeError:
            pass
        try:
            pieces.append(raw.decode("cp1252"))
            fallback_lines.append(number)
        except UnicodeDecodeError:
            # Bytes Windows-1252 leaves undefined: Latin-1 keeps them as control characters.
            pieces.append(raw.decode("latin-1"))
            lossy_lines.append(number)
    problems: list[Problem] = []
    encoding = "cp1252"
    if utf8_lines:
        encoding = "mixed"
        problems.append(
            Problem(
                path,
                fallback_lines[0] if fallback_lines else None,
                None,
                None,
                f"file mixes encodings: {len(fallback_lines)} line(s) are not UTF-8 and were read "
                f"as Windows-1252 (first: line {_first(fallback_lines)}); check symbols such as "
                "° and Ω on those lines",
                "warning",
            )
        )
    if lossy_lines:
        encoding = "latin-1" if not utf8_lines else encoding
        problems.append(
            Problem(
                path,
                lossy_lines[0],
                None,
                None,
                f"{len(lossy_lines)} line(s) hold bytes that are neither UTF-8 nor Windows-1252 "
                f"(first: line {lossy_lines[0]}); read as Latin-1, some characters may be wrong",
                "warning",
            )
        )
    return DecodedText("\n".join(pieces), encoding, tuple(problems))


def _first(lines: list[int]) -> str:
    return str(lines[0]) if lines else "?"


def decode_catalog_bytes(data: bytes, path: str) -> DecodedText:
    """Decode a catalog file's bytes, or raise CatalogError when it is not text.

    UTF-8 (a BOM is dropped) and UTF-16 with a BOM are read silently; a file that is not
    valid UTF-8 is read as Windows-1252 (the usual spreadsheet export on Windows) without
    a problem; mixed or partly undecodable files get a warning. NUL bytes inside an
    otherwise textual file are turned into U+FFFD, so the cell holding one fails to parse
    instead of silently losing a character, and reported.
    """
    for signature, what in _SIGNATURES:
        if data.startswith(signature):
            raise CatalogError(f"{path}: not a text table: this looks like {what}")
    encoding: str | None = None
    if data.startswith(b"\xef\xbb\xbf"):
        encoding = "utf-8-sig"
    elif data.startswith((b"\xff\xfe", b"\xfe\xff")):
        encoding = "utf-16"
    else:
        encoding = _utf16_without_bom(data)
    problems: list[Problem] = []
    if encoding is not None:
        try:
            text = data.decode(encoding)
        except UnicodeDecodeError:
            raise CatalogError(f"{path}: not a text table: invalid {encoding} text") from None
        decoded = DecodedText(text, encoding, ())
    else:
        try:
            decoded = DecodedText(data.decode("utf-8"), "utf-8", ())
        except UnicodeDecodeError:
            decoded = _decode_lines(data, path)
    problems.extend(decoded.problems)
    text = decoded.text
    sample = text[:_SAMPLE_CHARS]
    if sample:
        controls = sum(
            1
            for char in sample
            if (char < " " and char not in _TEXT_CONTROLS) or char in "\ufffd\x7f"
        )
        if controls / len(sample) > _BINARY_SHARE:
            raise CatalogError(f"{path}: not a text table: the file holds binary data")
    if "\x00" in text:
        nul_lines = sorted({text.count("\n", 0, index) + 1 for index in _find_all(text, "\x00")})
        problems.append(
            Problem(
                path,
                nul_lines[0],
                None,
                None,
                f"NUL bytes on {len(nul_lines)} line(s) (first: line {nul_lines[0]}); "
                "cells holding them cannot be read",
                "warning",
            )
        )
        text = text.replace("\x00", "\ufffd")
    return DecodedText(text, decoded.encoding, tuple(problems))


def _find_all(text: str, char: str, *, limit: int = 1000) -> list[int]:
    found: list[int] = []
    start = text.find(char)
    while start != -1 and len(found) < limit:
        found.append(start)
        start = text.find(char, start + 1)
    return found
