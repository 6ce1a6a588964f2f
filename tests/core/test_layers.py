"""The core never loads Textual or Rich, and numpy only when the gear search needs it."""

import subprocess
import sys

CORE = ["shopterm.units", "shopterm.errors", "shopterm.standards", "shopterm.standards.walk",
        "shopterm.lathe.machine", "shopterm.config", "shopterm.cutting", "shopterm.job"]


def _loaded_after(code: str) -> set[str]:
    out = subprocess.run([sys.executable, "-c", code + "\nimport sys\nprint(' '.join(sys.modules))"],
                         capture_output=True, text=True, check=True)
    return set(out.stdout.split())


def test_core_does_not_import_textual_or_rich():
    code = "\n".join(f"import {m}" for m in CORE)
    code += "\nimport shopterm.standards as s\nfor t in s.catalogue(): s.limits(t)"
    mods = _loaded_after(code)
    assert "textual" not in mods
    assert "rich" not in mods


def test_limits_do_not_import_numpy():
    mods = _loaded_after("import shopterm.standards as s\ns.limits(s.parse('M10x1.5-6g'))")
    assert "numpy" not in mods


def test_cli_limits_does_not_import_textual():
    mods = _loaded_after("from shopterm.cli import main\nmain(['calc', 'limits', 'M6x1-6g'])")
    assert "textual" not in mods
