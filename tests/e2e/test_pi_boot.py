"""Starting at boot on a Pi: the systemd unit ``shopterm --pi-boot`` prints, read key by key,
checked by ``systemd-analyze verify``, and its commands run the way systemd would run them
(ExecStartPre's blanking off, then ExecStart with the unit's Environment on a terminal in tmux).
The autologin drop-in and the login-shell snippet are checked the same way, as text and by sh.
"""

from __future__ import annotations

import os
import shlex
import shutil
import subprocess
from pathlib import Path

import pytest

from shopterm.pi import FILES, boot_file
from tests.e2e import tmux

pytestmark = pytest.mark.e2e

USER = "machinist"


def read_unit(text: str) -> dict[str, list[tuple[str, str]]]:
    """Return {section: [(key, value), ...]} of a systemd unit; repeated keys are all kept
    (``Environment=`` may appear several times). Comments and blank lines are skipped.
    References: systemd.syntax(7)."""
    out: dict[str, list[tuple[str, str]]] = {}
    section = None
    for n, line in enumerate(text.splitlines(), 1):
        line = line.strip()
        if not line or line[0] in "#;":
            continue
        if line.startswith("[") and line.endswith("]"):
            section = line[1:-1]
            out.setdefault(section, [])
            continue
        assert section is not None and "=" in line, f"line {n} is not key=value: {line!r}"
        key, value = line.split("=", 1)
        out[section].append((key.strip(), value.strip()))
    return out


def one(unit, section: str, key: str) -> str:
    values = [v for k, v in unit[section] if k == key]
    assert len(values) == 1, f"[{section}] {key}= appears {len(values)} times"
    return values[0]


def environment(unit) -> dict[str, str]:
    env: dict[str, str] = {}
    for k, v in unit["Service"]:
        if k == "Environment":
            for word in shlex.split(v):
                name, value = word.split("=", 1)
                env[name] = value
    return env


@pytest.fixture
def unit_text():
    return boot_file("unit", user=USER)


def test_unit_keys(unit_text):
    unit = read_unit(unit_text)
    assert set(unit) == {"Unit", "Service", "Install"}
    assert one(unit, "Service", "User") == USER
    # the console is the program's: keys in, screen out (Textual draws on stderr)
    assert one(unit, "Service", "TTYPath") == "/dev/%I"
    for key in ("StandardInput", "StandardOutput", "StandardError"):
        assert one(unit, "Service", key) == "tty"
    env = environment(unit)
    assert env["TERM"] == "linux"          # systemd sets no TERM for a service
    assert env["LANG"].endswith("UTF-8")
    assert one(unit, "Service", "Restart") == "on-failure"
    assert one(unit, "Service", "PAMName") == "login"     # a logind session: poweroff allowed
    assert one(unit, "Unit", "Conflicts") == "getty@%i.service"
    assert one(unit, "Install", "WantedBy") == "multi-user.target"
    pre = shlex.split(one(unit, "Service", "ExecStartPre").lstrip("-"))
    assert Path(pre[0]).name == "setterm" and pre[1:] == ["--blank", "0", "--powersave", "off"]
    start = shlex.split(one(unit, "Service", "ExecStart"))
    assert start == [str(tmux.shopterm_command())] or Path(start[0]).name == "shopterm"
    assert "{" not in unit_text, "a template field was left unfilled"


def test_unit_command_is_the_running_shopterm_quoted_when_it_has_a_space():
    unit = read_unit(boot_file("unit", user=USER, command="/opt/my tools/bin/shopterm"))
    assert shlex.split(one(unit, "Service", "ExecStart")) == ["/opt/my tools/bin/shopterm"]


def test_unknown_kind_is_refused():
    with pytest.raises(ValueError):
        boot_file("inittab")


def _verify(unit_dir: Path) -> str:
    run = subprocess.run(["systemd-analyze", "verify", str(unit_dir / "shopterm@tty1.service")],
                         capture_output=True, text=True, timeout=60)
    return "\n".join(line for line in (run.stdout + run.stderr).splitlines()
                     if "shopterm@" in line)


@pytest.mark.skipif(shutil.which("systemd-analyze") is None, reason="no systemd-analyze here")
def test_systemd_analyze_finds_nothing_wrong(tmp_path):
    cmd = tmux.shopterm_command()
    if not cmd.is_file():
        pytest.skip(f"no installed shopterm command at {cmd}")
    good, bad = tmp_path / "good", tmp_path / "bad"
    for d in (good, bad):
        d.mkdir()
    text = boot_file("unit", user="root", command=str(cmd))
    (good / "shopterm@.service").write_text(text)
    assert _verify(good) == ""
    # the check can fail: a mistyped value is reported against the file
    (bad / "shopterm@.service").write_text(text.replace("StandardInput=tty", "StandardInput=tyy"))
    assert "tyy" in _verify(bad)


def test_exec_start_pre_turns_the_blanking_off(unit_text):
    setterm = shutil.which("setterm")
    if setterm is None:
        pytest.skip("setterm (util-linux) is not installed")
    unit = read_unit(unit_text)
    pre = shlex.split(one(unit, "Service", "ExecStartPre").lstrip("-"))
    run = subprocess.run([setterm, *pre[1:]], capture_output=True, timeout=10,
                         env={"PATH": os.environ.get("PATH", ""), **environment(unit)})
    # console_codes(4): ESC [ 9 ; n ] sets the screen blank timeout to n minutes (0: never)
    assert b"\x1b[9;0]" in run.stdout


def test_exec_start_brings_shopterm_up_on_a_console_terminal(tmux_shopterm, unit_text):
    unit = read_unit(unit_text)
    argv = shlex.split(one(unit, "Service", "ExecStart"))
    assert Path(argv[0]) == tmux.shopterm_command()
    env = environment(unit)
    # the unit's own command line and Environment, on a terminal that says it is the console
    pane = tmux_shopterm(*argv[1:], term=env.pop("TERM"), env=env, ready="Thread family")
    text = pane.capture()
    assert "shopterm │ Thread" in text
    pane.send("*")
    assert "Go to" in pane.wait_for("Go to")


def test_autologin_drop_in_and_profile_snippet():
    getty = read_unit(boot_file("getty", user=USER))
    starts = [v for k, v in getty["Service"] if k == "ExecStart"]
    assert starts[0] == ""                           # clears the packaged getty command
    args = shlex.split(starts[1].lstrip("-"))
    assert args[args.index("--autologin") + 1] == USER and "%I" in args
    profile = boot_file("profile", user=USER, command="/home/machinist/st/bin/shopterm")
    assert "/dev/tty1" in profile and "SSH_CONNECTION" in profile
    assert "setterm --blank 0 --powersave off" in profile
    # it is valid sh, and off the console (no tty1 here) it starts nothing
    run = subprocess.run(["sh", "-n", "-c", profile], capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    run = subprocess.run(["sh", "-c", profile], capture_output=True, text=True,
                         stdin=subprocess.DEVNULL, timeout=10)
    assert run.returncode == 0 and run.stdout == ""


def test_every_template_ships_in_the_package():
    from shopterm import pi
    for name in FILES.values():
        assert (Path(pi.__file__).parent / name).is_file()
