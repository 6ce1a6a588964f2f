"""Starting shopterm at boot on a Raspberry Pi's console: the files, filled in for this user.

``shopterm --pi-boot [unit|getty|profile]`` prints one of them (README.md, "On a Raspberry Pi
at the lathe", says where each goes):

- ``unit``: ``shopterm@.service``, a systemd unit that runs shopterm on a console (``tty1``
  by ``shopterm@tty1.service``) as this user, with the console's blanking turned off;
- ``getty`` and ``profile``: the other way, autologin on tty1 (a drop-in for
  ``getty@tty1.service``) and a login-shell snippet that starts shopterm there.

The templates sit beside this file (shipped in the wheel); ``{user}`` and ``{command}`` are
filled in. Pure standard library.
References: systemd.exec(5) (TTYPath, StandardInput=tty, PAMName, Environment),
systemd.service(5) (Restart=on-failure), systemd.unit(5) (%I, Conflicts), agetty(8)
(--autologin), setterm(1) (--blank, --powersave), the kernel's ``consoleblank=`` parameter.
"""

from __future__ import annotations

import getpass
import shlex
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
#: What ``--pi-boot`` can print, and the template file of each.
FILES = {"unit": "shopterm@.service", "getty": "autologin.conf", "profile": "profile.sh"}


def shopterm_command() -> str:
    """Return the path of the ``shopterm`` command running now (the one in its venv)."""
    beside = Path(sys.executable).parent / "shopterm"
    if beside.is_file():
        return str(beside)
    return str(Path(sys.argv[0]).resolve())


def boot_file(kind: str, *, user: str | None = None, command: str | None = None) -> str:
    """Return the text of the boot file ``kind`` ('unit', 'getty', 'profile') filled in.

    user: who shopterm runs as (default: whoever runs this); command: the shopterm command
    (default: the one running now).
    """
    if kind not in FILES:
        raise ValueError(f"kind must be one of {', '.join(FILES)}")
    user = user or getpass.getuser()
    command = command or shopterm_command()
    if kind == "unit":          # systemd's quoting: double quotes around a path with spaces
        command = f'"{command}"' if " " in command else command
    else:
        command = shlex.quote(command)
    text = (HERE / FILES[kind]).read_text(encoding="utf-8")
    return text.replace("{user}", user).replace("{command}", command)


def print_boot_file(kind: str) -> int:
    """Print the boot file ``kind`` for this user and command; return 0."""
    sys.stdout.write(boot_file(kind))
    return 0
