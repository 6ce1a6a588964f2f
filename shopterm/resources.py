"""Where the files shipped with shopterm are: the theme folder and the sample config.

In an installed wheel they sit inside the package (``shopterm/themes/``,
``shopterm/sample_config.toml``, force-included by pyproject.toml); in a checkout (editable
install or running from the source tree) they sit at the repository root.
"""

from __future__ import annotations

from importlib import resources
from pathlib import Path

_REPO_ROOT = Path(__file__).resolve().parent.parent


def _bundled(name: str, want_dir: bool) -> Path:
    """Return the path of a bundled file or folder: inside the package, else the repo root."""
    try:
        inside = resources.files("shopterm") / name
        if isinstance(inside, Path) and (inside.is_dir() if want_dir else inside.is_file()):
            return inside
    except (ModuleNotFoundError, OSError):       # pragma: no cover - unusual installs
        pass
    return _REPO_ROOT / name


def bundled_themes_dir() -> Path:
    """Return the folder of the theme files shipped with shopterm."""
    return _bundled("themes", want_dir=True)


def sample_config_path() -> Path:
    """Return the path of the commented sample config shipped with shopterm."""
    return _bundled("sample_config.toml", want_dir=False)
