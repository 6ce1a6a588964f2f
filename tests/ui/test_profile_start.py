"""``shopterm --profile-start``: the report's structure (never its timings)."""

import re
import subprocess
import sys

import pytest

from shopterm.startprofile import PHASES, import_group

LINE = re.compile(r"^(?P<name>\s*\S.*?)\s{2,}(?P<ms>\d+\.\d)(?:\s+\((?P<note>.*)\))?$")


def _profile(tmp_path, *args):
    env = {"PATH": "/usr/bin:/bin", "HOME": str(tmp_path), "XDG_CONFIG_HOME": str(tmp_path / "c"),
           "LANG": "C.UTF-8", "TERM": "xterm-256color"}
    # stdout is a pipe, not a terminal: the app runs headless and stops at its first screen
    return subprocess.run([sys.executable, "-c", "import sys\nfrom shopterm.cli import main\n"
                           "sys.exit(main(sys.argv[1:]))", "--profile-start",
                           "--data-dir", str(tmp_path / "data"), *args],
                          capture_output=True, text=True, env=env, timeout=120)


def _phases(stdout: str) -> dict[str, float]:
    out = {}
    for line in stdout.splitlines():
        m = LINE.match(line)
        if m:
            out[m["name"]] = float(m["ms"])
    return out


def test_one_line_per_phase_in_order_then_imports(tmp_path):
    run = _profile(tmp_path)
    assert run.returncode == 0, run.stderr
    lines = run.stdout.splitlines()
    assert lines[0].startswith("shopterm start-up profile: Python ")
    names = [LINE.match(l)["name"] for l in lines if LINE.match(l)]
    assert names[:len(PHASES)] == list(PHASES)
    got = _phases(run.stdout)
    # the phases in the main thread follow on from each other; "ready" is their whole
    sequential = [p for p in PHASES if p not in ("record open", "ready")]
    assert sum(got[p] for p in sequential) <= got["ready"] + 0.5
    assert "imports by package (self time, inside the phases above):" in lines
    groups = names[len(PHASES):]
    assert {"  import textual", "  import shopterm core", "  import shopterm app"} <= set(groups)
    assert "never" not in run.stdout


def test_profile_with_a_job_to_resume_still_ends(tmp_path):
    # a job left open: the app asks to carry on over the thread screen; the profile must still
    # see the first screen and stop, not wait for an answer
    from shopterm.job.store import Store
    with Store.open(tmp_path / "data") as store:
        store.new_job("M10x1.5-6g")
    run = _profile(tmp_path)
    assert run.returncode == 0, run.stderr
    assert set(PHASES) <= set(_phases(run.stdout))


def test_a_bad_config_is_refused_before_any_profile(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text("[lathe]\nname = 3\n")
    run = _profile(tmp_path, "--config", str(bad))
    assert run.returncode == 2
    assert "shopterm:" in run.stderr and "Traceback" not in run.stderr


@pytest.mark.parametrize("module, group", [
    ("textual.widgets._static", "textual"), ("rich.text", "rich"),
    ("shopterm.job.store", "shopterm core"), ("shopterm", "shopterm core"),
    ("shopterm.ui.screens.thread", "shopterm app"), ("shopterm.cli", "shopterm app"),
    ("sqlite3.dbapi2", "python standard library"), ("_sqlite3", "python standard library"),
    ("markdown_it", "other packages"),
])
def test_import_groups(module, group):
    assert import_group(module) == group
