"""Which characters the Linux console can draw: a PSF font's Unicode table, and a check on text.

The committed lists in ``tests/data/console_glyphs_<font>.txt`` were derived with ``parse_psf``
from the Debian package ``console-setup-linux`` (header of each file names version and font).
Re-derive one with ``python tests/glyphs.py /usr/share/consolefonts/Lat15-Fixed16.psf.gz``.

References: the PSF1/PSF2 font formats as documented with the Linux kbd package
(PSF1 magic 36 04, 16-bit table entries, FFFF ends a glyph, FFFE starts a sequence;
PSF2 magic 72 b5 4a 86, UTF-8 table entries, FF ends a glyph, FE starts a sequence).
"""

from __future__ import annotations

import gzip
import struct
import sys
from functools import lru_cache
from pathlib import Path

DATA_DIR = Path(__file__).resolve().parent / "data"

#: The fonts whose lists are committed: the Fixed face at 8x16 (FONTFACE="Fixed",
#: FONTSIZE="8x16" in /etc/default/console-setup as Debian installs it) in the Lat15 code set
#: (what CODESET="guess" picks for Western-European locales, from memory) and in the wider Uni2
#: set. ``console_glyphs`` is what both can draw.
FONTS = ("Lat15-Fixed16", "Uni2-Fixed16")
#: Where Debian puts the fonts.
FONT_DIR = Path("/usr/share/consolefonts")

PSF1_MAGIC = b"\x36\x04"
PSF2_MAGIC = b"\x72\xb5\x4a\x86"
_PSF1_MODE512 = 0x01
_PSF1_MODEHASTAB = 0x02
_PSF1_MODESEQ = 0x04
_PSF2_HAS_UNICODE_TABLE = 0x01


def parse_psf(data: bytes) -> set[str]:
    """Return every single character the PSF font's Unicode table maps to a glyph.

    ``data`` may be gzip-compressed (``.psf.gz``). Sequences (a base character plus combining
    marks, after FFFE / FE) are not single characters and are left out.
    """
    if data[:2] == b"\x1f\x8b":
        data = gzip.decompress(data)
    if data[:4] == PSF2_MAGIC:
        return _parse_psf2(data)
    if data[:2] == PSF1_MAGIC:
        return _parse_psf1(data)
    raise ValueError("not a PSF font: the file starts with neither 36 04 nor 72 b5 4a 86")


def _parse_psf1(data: bytes) -> set[str]:
    mode, charsize = data[2], data[3]
    if not mode & (_PSF1_MODEHASTAB | _PSF1_MODESEQ):
        raise ValueError("this PSF1 font has no Unicode table")
    count = 512 if mode & _PSF1_MODE512 else 256
    pos = 4 + count * charsize
    chars: set[str] = set()
    glyphs = 0
    in_sequence = False
    while pos + 2 <= len(data) and glyphs < count:
        (u,) = struct.unpack_from("<H", data, pos)
        pos += 2
        if u == 0xFFFF:
            glyphs += 1
            in_sequence = False
        elif u == 0xFFFE:
            in_sequence = True
        elif not in_sequence:
            chars.add(chr(u))
    return chars


def _parse_psf2(data: bytes) -> set[str]:
    _magic, _version, headersize, flags, length, charsize, _h, _w = struct.unpack_from(
        "<4sIIIIIII", data, 0)
    if not flags & _PSF2_HAS_UNICODE_TABLE:
        raise ValueError("this PSF2 font has no Unicode table")
    pos = headersize + length * charsize
    chars: set[str] = set()
    for entry in data[pos:].split(b"\xff")[:length]:
        singles = entry.split(b"\xfe")[0]          # what follows FE are sequences
        chars.update(singles.decode("utf-8"))
    return chars


def write_list(font_path: Path, package_version: str, out: Path) -> None:
    """Write the code-point list of the font at ``font_path`` to ``out`` with a header."""
    chars = sorted(parse_psf(font_path.read_bytes()))
    lines = [
        f"# Characters with a glyph in {font_path.name}, from the Unicode table of the font",
        f"# in the Debian package console-setup-linux {package_version}",
        "# (/usr/share/consolefonts), derived with tests/glyphs.py parse_psf.",
        "# One code point a line: U+XXXX then the character (spaces/controls shown as U+ only).",
    ]
    for c in chars:
        shown = c if c.isprintable() and not c.isspace() else ""
        lines.append(f"U+{ord(c):04X} {shown}".rstrip())
    out.write_text("\n".join(lines) + "\n", encoding="utf-8")


def read_list(path: Path) -> frozenset[str]:
    """Return the characters listed in a committed ``console_glyphs_*.txt`` file."""
    chars = set()
    for line in path.read_text(encoding="utf-8").splitlines():
        if line.startswith("#") or not line.strip():
            continue
        chars.add(chr(int(line.split()[0][2:], 16)))
    return frozenset(chars)


def list_path(font: str) -> Path:
    """Return where the committed list for ``font`` is kept."""
    return DATA_DIR / f"console_glyphs_{font}.txt"


@lru_cache(maxsize=None)
def console_glyphs() -> frozenset[str]:
    """Return the characters every committed console font can draw (their intersection)."""
    sets = [read_list(list_path(font)) for font in FONTS]
    return frozenset.intersection(*sets)


def missing_glyphs(text: str) -> set[str]:
    """Return the characters in ``text`` the console fonts cannot draw (newlines are fine)."""
    have = console_glyphs()
    return {c for c in set(text) if c not in have and c not in "\n\r"}


if __name__ == "__main__":      # re-derive a list: python tests/glyphs.py FONT.psf.gz VERSION
    font = Path(sys.argv[1])
    version = sys.argv[2] if len(sys.argv) > 2 else "unknown"
    name = font.name.split(".")[0]
    write_list(font, version, list_path(name))
    print(list_path(name))
