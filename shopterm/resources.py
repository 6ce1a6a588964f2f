"""Where the files shipped with shopterm are: the theme folder and the sample config.

In an installed wheel they sit inside the package (``shopterm/themes/``,
``shopterm/sample_config.toml``, force-included by pyproject.toml); in a checkout (editable
install or running from the source tree) they sit at the repository root.
"""

from __future__ import annotations

from pathlib import Path

# The package folder itself (what ``importlib.resources.files("shopterm")`` gives for a package
# installed as files; importing ``importlib.resources`` cost ~2 ms of start-up for this).
_PACKAGE = Path(__file__).resolve().parent
_REPO_ROOT = _PACKAGE.parent


def _bundled(name: str, want_dir: bool) -> Path:
    """Return the path of a bundled file or folder: inside the package, else the repo root."""
    inside = _PACKAGE / name
    if inside.is_dir() if want_dir else inside.is_file():
        return inside
    return _REPO_ROOT / name


def bundled_themes_dir() -> Path:
    """Return the folder of the theme files shipped with shopterm."""
    return _bundled("themes", want_dir=True)


def sample_config_path() -> Path:
    """Return the path of the commented sample config shipped with shopterm."""
    return _bundled("sample_config.toml", want_dir=False)
