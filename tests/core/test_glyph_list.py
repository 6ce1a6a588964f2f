"""The committed console-glyph lists: what they hold, and that they match the fonts when present."""

from __future__ import annotations

import gzip
import struct
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from tests.glyphs import (FONT_DIR, FONTS, console_glyphs, list_path, missing_glyphs,  # noqa: E402
                          parse_psf, read_list)

# Present in the Debian console fonts: the box-drawing block, full block, light/medium shade,
# bullet. # Debian console-setup-linux fonts Lat15-Fixed16, Uni2-Fixed16
PRESENT = "█░▒•─│┌┐└┘├┤┬┴┼"
# Missing from them (print as a diamond). # the same fonts' Unicode tables
ABSENT = "▁▔▊▎▏▌"


@pytest.mark.parametrize("char", PRESENT)
def test_listed_glyphs_present(char):
    assert char in console_glyphs()


@pytest.mark.parametrize("char", ABSENT)
def test_listed_glyphs_absent(char):
    assert char not in console_glyphs()


@pytest.mark.parametrize("font", FONTS)
def test_each_list_has_ascii_and_a_header(font):
    path = list_path(font)
    head = path.read_text(encoding="utf-8").splitlines()[:3]
    assert font in head[0] and "console-setup-linux" in head[1]
    chars = read_list(path)
    # printable ASCII is in every Linux console font # common practice, no source
    assert {chr(c) for c in range(0x20, 0x7F)} <= chars


def test_missing_glyphs_reports_only_the_missing():
    assert missing_glyphs("┌──┐\n│ok│\n└──┘ 1.25 mm") == set()
    assert missing_glyphs("pass ▁▂ done ▌") == {"▁", "▂", "▌"}


@pytest.mark.parametrize("font", FONTS)
def test_list_matches_installed_font(font):
    path = FONT_DIR / f"{font}.psf.gz"
    if not path.exists():
        pytest.skip(f"{path} not installed (apt-get install console-setup-linux)")
    assert parse_psf(path.read_bytes()) == set(read_list(list_path(font)))


def _psf1(table: list[list[int]], charsize: int = 2) -> bytes:
    """Build a small PSF1 font by hand: 256 glyphs, a Unicode table for the first entries."""
    body = bytes(256 * charsize)
    tab = b""
    for i in range(256):
        for u in (table[i] if i < len(table) else []):
            tab += struct.pack("<H", u)
        tab += struct.pack("<H", 0xFFFF)
    return b"\x36\x04" + bytes([0x02, charsize]) + body + tab


def _psf2(table: list[bytes], length: int = 3, charsize: int = 4) -> bytes:
    header = struct.pack("<4sIIIIIII", b"\x72\xb5\x4a\x86", 0, 32, 1, length, charsize, 2, 2)
    return header + bytes(length * charsize) + b"".join(e + b"\xff" for e in table)


def test_parse_psf1_by_hand_singles_and_sequence():
    # glyph 0 = 'A' and U+0391; glyph 1 = 'B' then a sequence (B + U+0301) that is not a single
    font = _psf1([[0x41, 0x391], [0x42, 0xFFFE, 0x42, 0x301]])
    assert parse_psf(font) == {"A", "\u0391", "B"}
    assert parse_psf(gzip.compress(font)) == {"A", "\u0391", "B"}


def test_parse_psf2_by_hand():
    font = _psf2(["█".encode(), "░▒".encode(), "e".encode() + b"\xfe" + "é".encode()])
    assert parse_psf(font) == {"█", "░", "▒", "e"}


def test_parse_psf_refuses_other_files():
    with pytest.raises(ValueError):
        parse_psf(b"not a font at all")
    with pytest.raises(ValueError):
        parse_psf(b"\x36\x04\x00\x02" + bytes(512))     # PSF1 without a Unicode table
