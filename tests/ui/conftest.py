"""Shared set-up for the pilot tests: the app on the bundled sample config, data in tmp."""

import pytest

from shopterm.config import load_config
from shopterm.resources import sample_config_path


@pytest.fixture
def sample_config():
    return load_config(sample_config_path())


@pytest.fixture
def make_app(sample_config, tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "cfg"))
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))

    def make(**kw):
        from shopterm.ui.app import ShoptermApp
        kw.setdefault("data_dir", tmp_path / "data")
        return ShoptermApp(sample_config, **kw)

    return make


def screen_lines(app) -> list[str]:
    """Return the current screen as the text lines it shows (private compositor API; textual pinned)."""
    return [strip.text for strip in app.screen._compositor.render_strips()]


def screen_text(app) -> str:
    return "\n".join(screen_lines(app))
