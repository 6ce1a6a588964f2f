"""The config: the sample loads, every kind of mistake gives one message with key and line,
the search order, and ``--check-config``'s exit codes."""

from __future__ import annotations

import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shopterm import config as cfg
from shopterm.cli import main as cli_main
from shopterm.config import (HOW_ENV, HOW_EXPLICIT, HOW_SAMPLE, HOW_USER, ConfigError,
                             check_config_command, find_config, key_lines, load_config,
                             read_config_text)
from shopterm.lathe.machine import ToolTip
from shopterm.resources import bundled_themes_dir, sample_config_path

SAMPLE = sample_config_path().read_text(encoding="utf-8")
INCH = Fraction(254, 10)      # NIST SP 811: 1 in = 25.4 mm exactly


def edited(old: str, new: str) -> str:
    """Return the sample with ``old`` (which must occur once) replaced by ``new``."""
    assert SAMPLE.count(old) == 1, old
    return SAMPLE.replace(old, new, 1)


def line_with(text: str, fragment: str) -> int:
    """Return the line number (from 1) of the one line of ``text`` that starts with ``fragment``."""
    hits = [n for n, line in enumerate(text.splitlines(), 1) if line.lstrip().startswith(fragment)]
    assert len(hits) == 1, (fragment, hits)
    return hits[0]


def read(text: str, tmp_path: Path | None = None):
    path = (tmp_path or Path("/nowhere")) / "config.toml"
    return read_config_text(text, path)


# --- the sample ---------------------------------------------------------------------------------

def test_sample_loads_with_what_it_says():
    c = load_config(sample_config_path())
    assert c.how_found == HOW_EXPLICIT
    assert c.lathe.name == "Pellingham 260 (demo)"
    # 8 tpi leadscrew: pitch 25.4/8 mm exactly # computed from 1 in = 25.4 mm, NIST SP 811
    assert c.lathe.leadscrew.tpi == 8
    assert c.lathe.leadscrew.pitch_exact == INCH / 8
    assert (127, 1) in c.lathe.gears and (20, 2) in c.lathe.gears
    assert c.lathe.fixed_ratio == Fraction(1) and c.lathe.clearance_margin == 15
    assert c.lathe.gearbox == ()
    # one division of 0.001 in on radius moves the slide 0.0254 mm # computed, NIST SP 811
    assert c.lathe.cross_dial.travel_per_division == pytest.approx(float(INCH / 1000), abs=1e-12)
    assert c.lathe.cross_dial.divisions == 100 and not c.lathe.cross_dial.reads_diameter
    assert c.lathe.compound_zero == "cross_slide"
    assert c.lathe.thread_dial.teeth == 16 and c.lathe.thread_dial.numbered == (1, 3, 5, 7)
    assert c.lathe.spindle_gear == 60 and c.lathe.faceplate_slots == 4
    assert c.shop.display_units == "in" and c.shop.theme == "shop-bright"
    # 0.029 in wire = 0.7366 mm # computed from 0.029 x 25.4, NIST SP 811
    assert c.shop.wires[0].marked == pytest.approx(float(Fraction("0.029") * INCH), abs=1e-12)
    assert c.shop.wires[0].label == "0.029 in"
    measured = [w for w in c.shop.wires if w.measured is not None]
    assert len(measured) == 1 and measured[0].size == pytest.approx(float(Fraction("0.0401") * INCH))
    assert c.shop.wires[-1].marked == pytest.approx(0.866)
    assert c.shop.micrometer_resolution == pytest.approx(float(Fraction("0.0001") * INCH))
    assert c.shop.tool.kind == "radius"
    assert c.shop.tool.size == pytest.approx(float(Fraction("0.004") * INCH))


def test_bundled_files_are_found():
    assert sample_config_path().is_file()
    assert (bundled_themes_dir() / "shop-bright.toml").is_file()


def test_bundled_files_found_inside_an_installed_package(tmp_path):
    """The wheel layout: themes/ and sample_config.toml inside the shopterm package."""
    import shutil
    pkg = tmp_path / "site" / "shopterm"
    pkg.mkdir(parents=True)
    src = Path(cfg.__file__).parent
    for name in ("__init__.py", "resources.py"):
        shutil.copy(src / name, pkg / name)
    shutil.copytree(bundled_themes_dir(), pkg / "themes")
    shutil.copy(sample_config_path(), pkg / "sample_config.toml")
    code = ("import shopterm.resources as r; "
            "print(r.bundled_themes_dir()); print(r.sample_config_path())")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         env={"PYTHONPATH": str(tmp_path / "site")}, cwd=tmp_path)
    assert out.stdout.split() == [str(pkg / "themes"), str(pkg / "sample_config.toml")]


def test_config_module_does_not_import_textual():
    code = "import sys, shopterm.config; print('textual' in sys.modules or 'rich' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


@pytest.mark.parametrize("old,new,check", [
    # the compound scale zeroed along the bed: 29.5 is set as 60.5 # common practice, no source
    ('angle_zero = "cross_slide"', 'angle_zero = "bed"',
     lambda c: c.lathe.compound_scale_reading(29.5) == pytest.approx(60.5)),
    ('angle_zero = "cross_slide"', 'angle_zero = "Cross-Slide"',
     lambda c: c.lathe.compound_scale_reading(29.5) == pytest.approx(29.5)),
    # 2 mm metric leadscrew
    ("tpi = 8\n", 'pitch = "2 mm"\n',
     lambda c: c.lathe.leadscrew.pitch_exact == 2 and not c.lathe.leadscrew.is_inch),
    # a pitch written in inches is kept as tpi: 1/8 in -> 8 tpi # computed from 1/(1/8)
    ("tpi = 8\n", 'pitch = "1/8 in"\n',
     lambda c: c.lathe.leadscrew.tpi == 8 and c.lathe.leadscrew.pitch_exact == INCH / 8),
    ('reads = "radius"', 'reads = "diameter"',
     lambda c: c.lathe.cross_dial.travel_per_division
     == pytest.approx(float(INCH / 1000) / 2)),
    ('nose_radius = "0.004 in"', 'flat = "0,2 mm"',
     lambda c: (c.shop.tool.kind, c.shop.tool.size) == ("flat", pytest.approx(0.2))),
    # the tool's side clearance: optional, 15 degrees when left out (common practice, no source)
    ("side_clearance = 15\n", "side_clearance = 12.5\n",
     lambda c: c.shop.tool_side_clearance_deg == 12.5 and c.shop.tool.kind == "radius"),
    ("side_clearance = 15\n", "", lambda c: c.shop.tool_side_clearance_deg == 15.0),
    ('nose_radius = "0.004 in"', "", lambda c: c.shop.tool == ToolTip("radius", 0.1)
     and c.shop.tool_side_clearance_deg == 15),
    ('fixed_ratio = "1/1"', 'fixed_ratio = "40:127"', lambda c: c.lathe.fixed_ratio
     == Fraction(40, 127)),
    ('# [gearbox]\n# "A1" = "1/2"\n# "A2" = "4/7"',
     '[gearbox]\n"A1" = "1/2"\n"A2" = "4/7"',
     lambda c: [(p.label, p.ratio) for p in c.lathe.gearbox]
     == [("A1", Fraction(1, 2)), ("A2", Fraction(4, 7))]),
    ('units = "in"', 'units = "mm"', lambda c: c.shop.display_units == "mm"),
    # [pi]: the sample leaves it commented out, so nothing is offered; uncommented it is split
    ('# [pi]', '# [pi]', lambda c: c.shutdown_command == ()),
    ('# [pi]', '[pi]', lambda c: c.shutdown_command == ()),
    ('# [pi]', '[pi]\nshutdown_command = "sudo /sbin/shutdown -h now"',
     lambda c: c.shutdown_command == ("sudo", "/sbin/shutdown", "-h", "now")),
])
def test_sample_variants_read_right(old, new, check):
    assert check(read(edited(old, new)))


def test_minimal_config_gets_defaults():
    text = """
[leadscrew]
pitch = "3 mm"
[change_gears]
30 = 1
[cross_slide]
division = "0.02 mm"
divisions = 200
reads = "diameter"
[compound]
division = "0.02 mm"
divisions = 100
angle_zero = "bed"
"""
    c = read(text)
    assert c.lathe.thread_dial is None and c.shop.wires == ()
    assert c.shop.display_units == "mm" and c.shop.theme == "shop-bright"
    assert c.lathe.clearance_margin == 15 and c.lathe.spindle_gear is None


def test_theme_dir_relative_to_the_config(tmp_path):
    c = read(edited('theme = "shop-bright"', 'theme = "shop-bright"\ntheme_dir = "my-themes"'),
             tmp_path)
    assert c.theme_dirs == (tmp_path / "my-themes",)


# --- one message, naming key and line, for each kind of mistake -----------------------------------

BAD = [
    # (what, old, new, key, fragment on the line to be named)
    ("unknown key", "divisions = 100           # divisions in one turn of the dial",
     "divisions = 100\ndivison = 4", "cross_slide.divison", "divison = 4"),
    ("unknown section", "[micrometer]", "[micrometre]", "micrometre", "[micrometre]"),
    ("unknown key in a wire set", 'marked = "0.032 in"', 'marked = "0.032 in"\nmesured = "1 mm"',
     "wires[2].mesured", "mesured"),
    ("wrong type: text for a count", "divisions = 100           # divisions in one turn",
     'divisions = "100"  # divisions in one turn', "cross_slide.divisions", 'divisions = "100"'),
    ("wrong type: float for a count", "teeth = 16 ", "teeth = 16.5 ", "thread_dial.teeth",
     "teeth = 16.5"),
    ("wrong type: bool for a count", "lines = 8 ", "lines = true ", "thread_dial.lines",
     "lines = true"),
    ("wrong type: text tpi", "tpi = 8\n", 'tpi = "8"\n', "leadscrew.tpi", 'tpi = "8"'),
    ("length without unit", 'division = "0.001 in"     # the value engraved',
     "division = 0.001  # the value engraved", "cross_slide.division", "division = 0.001 "),
    ("negative pitch", "tpi = 8\n", 'pitch = "-3 mm"\n', "leadscrew.pitch", "pitch ="),
    ("zero pitch", "tpi = 8\n", 'pitch = "0 mm"\n', "leadscrew.pitch", "pitch ="),
    ("zero tpi", "tpi = 8\n", "tpi = 0\n", "leadscrew.tpi", "tpi = 0"),
    ("negative tpi", "tpi = 8\n", "tpi = -8\n", "leadscrew.tpi", "tpi = -8"),
    ("tpi and pitch both", "tpi = 8\n", 'tpi = 8\npitch = "3 mm"\n', "leadscrew", "[leadscrew]"),
    ("zero-tooth gear", "25 = 1\n", "0 = 1\n", "change_gears.0", "0 = 1"),
    ("gear count zero", "25 = 1\n", "25 = 0\n", "change_gears.25", "25 = 0"),
    ("gear not a number", "25 = 1\n", "big = 1\n", "change_gears.big", "big = 1"),
    ("zero divisions", "divisions = 100\n# How", "divisions = 0\n# How", "compound.divisions",
     "divisions = 0"),
    ("zero division value", 'division = "0.001 in"\ndivisions = 100\n# How',
     'division = "0 in"\ndivisions = 100\n# How', "compound.division", 'division = "0 in"'),
    ("bad unit on a length", 'division = "0.001 in"     # the value engraved',
     'division = "0.001 ft"  # engraved', "cross_slide.division", 'division = "0.001 ft"'),
    ("bad display unit", 'units = "in"', 'units = "cm"', "display.units", 'units = "cm"'),
    ("bad zero choice", 'angle_zero = "cross_slide"', 'angle_zero = "headstock"',
     "compound.angle_zero", 'angle_zero = "headstock"'),
    ("bad reads choice", 'reads = "radius"', 'reads = "both"', "cross_slide.reads",
     'reads = "both"'),
    ("missing required key", "reads = \"radius\"", "# no reads", "cross_slide", "[cross_slide]"),
    ("numbered line not on the dial", "numbered = [1, 3, 5, 7]", "numbered = [1, 3, 9]",
     "thread_dial.numbered", "numbered = [1, 3, 9]"),
    ("negative measured wire", 'measured = "0.0401 in"', 'measured = "-0.04 in"',
     "wires[3].measured", 'measured = "-0.04 in"'),
    ("zero micrometer resolution", 'resolution = "0.0001 in"', 'resolution = "0 in"',
     "micrometer.resolution", 'resolution = "0 in"'),
    ("bad ratio", 'fixed_ratio = "1/1"', 'fixed_ratio = "1/0"', "gear_train.fixed_ratio",
     "fixed_ratio"),
    ("negative clearance", "\nclearance = 15", "\nclearance = -1", "gear_train.clearance",
     "clearance = -1"),
    ("both tool tips", 'nose_radius = "0.004 in"', 'nose_radius = "0.004 in"\nflat = "0.1 mm"',
     "tool", "[tool]"),
    ("side clearance in quotes", "side_clearance = 15", 'side_clearance = "15 deg"',
     "tool.side_clearance", "side_clearance"),
    ("side clearance too large", "side_clearance = 15", "side_clearance = 50",
     "tool.side_clearance", "side_clearance = 50"),
    ("empty lathe name", 'name = "Pellingham 260 (demo)"', 'name = " "', "lathe.name", 'name = " "'),
    ("zero spindle gear", "spindle_gear = 60 ", "spindle_gear = 0 ", "indexing.spindle_gear",
     "spindle_gear = 0"),
    ("unknown key in favourites", "threads = [", "thread = [", "favourites.thread", "thread = ["),
    ("favourites not a list", 'threads = ["M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A"]',
     'threads = "M12x1.75-6g"', "favourites.threads", "threads ="),
    ("a favourite not text", 'threads = ["M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A"]',
     'threads = ["M12x1.75-6g", 10]', "favourites.threads", "threads ="),
    ("unknown key in [pi]", "# [pi]", '[pi]\nshutdown = "now"', "pi.shutdown", 'shutdown = "now"'),
    ("shutdown command not text", "# [pi]", "[pi]\nshutdown_command = true",
     "pi.shutdown_command", "shutdown_command = true"),
    ("shutdown command unclosed quote", "# [pi]", "[pi]\nshutdown_command = \"sh -c 'x\"",
     "pi.shutdown_command", "shutdown_command ="),
    ("empty shutdown command", "# [pi]", '[pi]\nshutdown_command = " "', "pi.shutdown_command",
     "shutdown_command ="),
]


@pytest.mark.parametrize("what,old,new,key,fragment", BAD, ids=[b[0] for b in BAD])
def test_each_mistake_names_key_and_line(what, old, new, key, fragment):
    text = edited(old, new)
    with pytest.raises(ConfigError) as info:
        read(text)
    err = info.value
    assert err.key == key
    assert err.line == line_with(text, fragment)      # computed by scanning the test text
    message = str(err)
    assert "\n" not in message
    assert f"line {err.line}" in message and f"key '{key}'" in message


def test_a_value_where_a_section_belongs():
    start = SAMPLE.index("[tool]")
    end = SAMPLE.index("[indexing]")
    text = "tool = 3\n" + SAMPLE[:start] + SAMPLE[end:]
    with pytest.raises(ConfigError) as info:
        read(text)
    assert info.value.key == "tool" and info.value.line == 1
    assert "must be a section [tool]" in str(info.value)


def test_missing_section_is_named():
    text = edited("[compound]\n", "[compound_x]\n")
    with pytest.raises(ConfigError) as info:
        read(text)
    assert info.value.key == "compound_x" and "unknown key" in str(info.value)
    start = SAMPLE.index("[compound]")
    end = SAMPLE.index("[thread_dial]")
    without = SAMPLE[:start] + SAMPLE[end:]
    with pytest.raises(ConfigError, match=r"\[compound\] section is missing"):
        read(without)


def test_no_gears_and_no_gearbox():
    start = SAMPLE.index("[change_gears]")
    end = SAMPLE.index("# A quick-change")
    with pytest.raises(ConfigError, match="no change gears and no gearbox"):
        read(SAMPLE[:start] + SAMPLE[end:])


@pytest.mark.parametrize("bad_line", ["divisions = = 100", "[oops", 'name = "open'])
def test_toml_syntax_error_gives_its_line(bad_line):
    text = edited("divisions = 100           # divisions in one turn of the dial", bad_line)
    with pytest.raises(ConfigError) as info:
        read(text)
    assert info.value.line == line_with(text, bad_line)    # tomllib's own line
    assert "not valid TOML" in str(info.value)


def test_duplicate_key_is_a_syntax_error():
    text = edited("lines = 8 ", "lines = 8\nlines = 9 ")
    with pytest.raises(ConfigError) as info:
        read(text)
    assert info.value.line == line_with(text, "lines = 9")


def test_not_utf8_file(tmp_path):
    p = tmp_path / "c.toml"
    p.write_bytes(b"[lathe]\nname = \"caf\xe9\"\n")
    with pytest.raises(ConfigError) as info:
        load_config(p)
    assert info.value.line == 2 and "UTF-8" in str(info.value)


# --- key_lines: the scan that finds a key's line ----------------------------------------------------

def test_key_lines_handles_quotes_arrays_and_strings():
    text = '\n'.join([
        '# a comment with key = 1',              # 1
        'top = 1',                                # 2
        '[a]',                                    # 3
        'x = """',                                # 4
        'y = 2 inside a string',                  # 5
        '"""',                                    # 6
        'list = [',                               # 7
        '  1, 2,  # z = 3',                       # 8
        ']',                                      # 9
        '"quoted key" = 1',                       # 10
        'p.q = 2',                                # 11
        '[[w]]',                                  # 12
        'm = 1',                                  # 13
        '[[w]]',                                  # 14
        'm = 2',                                  # 15
    ])
    lines = key_lines(text)
    assert lines[("top",)] == 2 and lines[("a",)] == 3 and lines[("a", "x")] == 4
    assert ("a", "y") not in lines and ("a", "z") not in lines
    assert lines[("a", "list")] == 7 and lines[("a", "quoted key")] == 10
    assert lines[("a", "p", "q")] == 11
    assert lines[("w", 0, "m")] == 13 and lines[("w", 1, "m")] == 15


_NAMES = st.builds(lambda a, b: a + b, st.sampled_from("abcxyz"),
                   st.text("abcdefxyz019_-", max_size=6))


@settings(max_examples=40, deadline=None)
@given(st.dictionaries(_NAMES, st.dictionaries(_NAMES, st.integers(), min_size=1, max_size=4),
                       min_size=1, max_size=4))
def test_key_lines_finds_every_key_where_it_was_written(tables):
    out, expected = [], {}
    for name, keys in tables.items():
        out.append(f"[{name}]  # section")
        expected[(name,)] = len(out)
        for k, v in keys.items():
            out.append(f"{k} = {v}")
            expected[(name, k)] = len(out)
    assert key_lines("\n".join(out)) == expected


# --- where the config is found ----------------------------------------------------------------------

@pytest.fixture
def clean_env(monkeypatch, tmp_path):
    home = tmp_path / "home"
    home.mkdir()
    monkeypatch.setenv("HOME", str(home))
    monkeypatch.delenv("XDG_CONFIG_HOME", raising=False)
    monkeypatch.delenv("SHOPTERM_CONFIG", raising=False)
    return home


def _write(path: Path) -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(SAMPLE.replace("Pellingham 260 (demo)", path.parent.name), encoding="utf-8")
    return path


def test_nothing_found_uses_the_sample(clean_env):
    assert find_config() == (sample_config_path(), HOW_SAMPLE)
    assert load_config().how_found == HOW_SAMPLE


def test_default_user_config_under_home(clean_env):
    p = _write(clean_env / ".config" / "shopterm" / "config.toml")
    assert find_config() == (p, HOW_USER)


def test_xdg_config_home_wins_over_home(clean_env, monkeypatch, tmp_path):
    _write(clean_env / ".config" / "shopterm" / "config.toml")
    p = _write(tmp_path / "xdg" / "shopterm" / "config.toml")
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "xdg"))
    assert find_config() == (p, HOW_USER)
    assert cfg.user_themes_dir() == tmp_path / "xdg" / "shopterm" / "themes"


def test_relative_xdg_config_home_is_ignored(clean_env, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", "relative/dir")   # XDG Base Directory Spec 0.8
    assert cfg.config_home() == clean_env / ".config" / "shopterm"


def test_env_var_wins_over_user_config(clean_env, monkeypatch, tmp_path):
    _write(clean_env / ".config" / "shopterm" / "config.toml")
    p = _write(tmp_path / "envdir" / "c.toml")
    monkeypatch.setenv("SHOPTERM_CONFIG", str(p))
    assert find_config() == (p, HOW_ENV)
    assert load_config().lathe.name == "envdir"


def test_explicit_wins_over_env(clean_env, monkeypatch, tmp_path):
    monkeypatch.setenv("SHOPTERM_CONFIG", str(_write(tmp_path / "envdir" / "c.toml")))
    p = _write(tmp_path / "given" / "c.toml")
    assert find_config(str(p)) == (p, HOW_EXPLICIT)
    assert load_config(p).lathe.name == "given"


@pytest.mark.parametrize("how", ["explicit", "env"])
def test_named_config_that_is_missing(clean_env, monkeypatch, tmp_path, how):
    missing = tmp_path / "nope.toml"
    if how == "env":
        monkeypatch.setenv("SHOPTERM_CONFIG", str(missing))
        with pytest.raises(ConfigError, match="SHOPTERM_CONFIG"):
            find_config()
    else:
        with pytest.raises(ConfigError, match="--config"):
            find_config(missing)
    with pytest.raises(ConfigError):     # a directory is not a config file either
        find_config(tmp_path)


# --- favourites -------------------------------------------------------------------------------------

def test_sample_favourites_load_as_designations():
    c = load_config(sample_config_path())
    assert c.favourites == ("M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A")
    assert c.problems == ()


def test_favourites_are_written_as_the_standard_writes_them():
    c = read(edited('threads = ["M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A"]',
                    'threads = ["m12x1.75-6g", "M12x1.75-6g", "2BA normal"]'))
    assert c.favourites == ("M12x1.75-6g", "2BA normal")      # one each, as parse prints it


def test_a_bad_favourite_is_reported_and_the_others_kept(tmp_path, capsys):
    text = edited('threads = ["M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A"]',
                  'threads = [\n  "M12x1.75-6g",\n  "M10x1.6-6g",\n  "3/8-16 UNC-2A",\n]')
    c = read(text)
    assert c.favourites == ("M12x1.75-6g", "3/8-16 UNC-2A")
    assert len(c.problems) == 1
    problem = c.problems[0]
    assert "key 'favourites.threads'" in problem and "'M10x1.6-6g'" in problem
    line = line_with(text, '"M10x1.6-6g"')
    assert f"line {line}" in problem                      # the item's own line
    assert "not in ISO 261" in problem                     # what the standard says is wrong
    p = tmp_path / "config.toml"
    p.write_text(text, encoding="utf-8")
    assert check_config_command(str(p)) == 2               # --check-config says so
    assert "M10x1.6-6g" in capsys.readouterr().err


def test_no_favourites_section_is_fine():
    start = SAMPLE.index("[favourites]")
    c = read(SAMPLE[:start])
    assert c.favourites == () and c.problems == ()


# --- where the config is, in one line ---------------------------------------------------------------

def test_short_path_names_the_home_and_shopterm_folders(monkeypatch, tmp_path):
    monkeypatch.setenv("HOME", str(tmp_path))
    assert cfg.short_path(tmp_path / ".config" / "shopterm" / "config.toml") == \
        "~/.config/shopterm/config.toml"
    assert cfg.short_path(sample_config_path()) == "<shopterm>/sample_config.toml"
    assert cfg.short_path("/etc/shopterm.toml") == "/etc/shopterm.toml"


# --- shopterm --check-config ------------------------------------------------------------------------

def test_check_config_ok(capsys):
    assert check_config_command(str(sample_config_path())) == 0
    assert capsys.readouterr().out.strip() == \
        f"OK: {sample_config_path()} (Pellingham 260 (demo))"


def test_check_config_bad(capsys, tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text(edited("25 = 1\n", "0 = 1\n"), encoding="utf-8")
    assert check_config_command(str(p)) == 2
    err = capsys.readouterr().err
    assert "change_gears.0" in err and f"line {line_with(p.read_text(), '0 = 1')}" in err
    assert "Traceback" not in err


def test_check_config_default_and_cli(capsys, clean_env, tmp_path):
    assert check_config_command(None) == 0
    assert str(sample_config_path()) in capsys.readouterr().out
    p = tmp_path / "bad.toml"
    p.write_text("[leadscrew\n", encoding="utf-8")
    assert cli_main(["--check-config", str(p)]) == 2
    assert cli_main(["--config", str(sample_config_path()), "--check-config"]) == 0
    assert cli_main(["--check-config", str(tmp_path / "missing.toml")]) == 2


# --- the taper set-up: [tailstock], [taper_attachment], compound.travel ---------------------------

def test_sample_taper_kit():
    c = load_config(sample_config_path())
    t, a = c.lathe.tailstock, c.lathe.taper_attachment
    assert (t.division, t.unit, t.max_set_over) == (1.0, "mm", 12.0)
    assert (a.scale, a.max_setting) == ("in_per_ft", 3.0)
    # 10 in and 2.75 in travel # computed from 1 in = 25.4 mm, NIST SP 811
    assert a.max_travel == pytest.approx(254.0) and c.lathe.compound_travel == pytest.approx(69.85)


def test_taper_kit_is_optional():
    start = SAMPLE.index("[tailstock]")
    end = SAMPLE.index("[thread_dial]")
    c = read(SAMPLE[:start] + SAMPLE[end:])
    assert c.lathe.tailstock is None and c.lathe.taper_attachment is None
    c = read(edited('set_over_division = "1 mm"', '# no lines to set by'))
    assert c.lathe.tailstock.division is None and c.lathe.tailstock.max_set_over == 12.0
    c = read(edited('max_set_over = "12 mm"', 'max_set_over = "0.5 in"'))
    assert c.lathe.tailstock.max_set_over == pytest.approx(12.7)   # 0.5 x 25.4, NIST SP 811
    c = read(edited('scale = "in_per_ft"', 'scale = "mm_per_100mm"'))
    assert c.lathe.taper_attachment.scale == "mm_per_100mm"


TAPER_BAD = [
    ("unknown key in tailstock", 'max_set_over = "12 mm"', 'max_setover = "12 mm"',
     "tailstock.max_setover", "max_setover"),
    ("set-over without unit", 'set_over_division = "1 mm"', "set_over_division = 1",
     "tailstock.set_over_division", "set_over_division = 1"),
    ("negative set-over", 'max_set_over = "12 mm"', 'max_set_over = "-12 mm"',
     "tailstock.max_set_over", "max_set_over ="),
    ("bad attachment scale", 'scale = "in_per_ft"', 'scale = "inches"',
     "taper_attachment.scale", 'scale = "inches"'),
    ("missing attachment scale", 'scale = "in_per_ft"', "# no scale", "taper_attachment",
     "[taper_attachment]"),
    ("attachment range as text", "max_setting = 3 ", 'max_setting = "3" ',
     "taper_attachment.max_setting", "max_setting ="),
    ("attachment range zero", "max_setting = 3 ", "max_setting = 0 ",
     "taper_attachment.max_setting", "max_setting = 0"),
    ("missing attachment range", "max_setting = 3 ", "# no range ", "taper_attachment",
     "[taper_attachment]"),
    ("unknown key in attachment", 'max_travel = "10 in"', 'max_travl = "10 in"',
     "taper_attachment.max_travl", "max_travl"),
    ("compound travel without unit", 'travel = "2.75 in"', "travel = 2.75",
     "compound.travel", "travel = 2.75"),
]


@pytest.mark.parametrize("what,old,new,key,fragment", TAPER_BAD, ids=[b[0] for b in TAPER_BAD])
def test_each_taper_mistake_names_key_and_line(what, old, new, key, fragment):
    test_each_mistake_names_key_and_line(what, old, new, key, fragment)
