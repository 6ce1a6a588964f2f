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


# ---- each layer imports only the layers above it (DEVELOPERS.md, Layers), read from the source ---------

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[2] / "shopterm"


def _imported(path: Path) -> set[str]:
    """Return every module name ``path`` imports, at the top or inside a function."""
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module)
            names.update(f"{node.module}.{alias.name}" for alias in node.names)
    return names


def _crossings(layer: str, below: tuple[str, ...]) -> list[str]:
    out = []
    for path in sorted((PACKAGE / layer).rglob("*.py")):
        for name in sorted(_imported(path)):
            if any(name == b or name.startswith(b + ".") for b in below):
                out.append(f"{path.relative_to(PACKAGE.parent)} imports {name}")
    return out


def test_imported_reads_function_level_imports(tmp_path):
    # The checker must see an import tucked inside a function and a package-level one,
    # or it would miss the very crossings it is for.
    probe = tmp_path / "probe.py"
    probe.write_text("def f():\n    from shopterm.cutting.wires import over_wires\n"
                     "from shopterm import job\n", encoding="utf-8")
    names = _imported(probe)
    assert "shopterm.cutting.wires" in names and "shopterm.job" in names


def test_standards_import_no_lower_layer():
    below = ("shopterm.lathe", "shopterm.cutting", "shopterm.job")
    assert _crossings("standards", below) == []


def test_lathe_imports_no_lower_layer():
    assert _crossings("lathe", ("shopterm.cutting", "shopterm.job")) == []
