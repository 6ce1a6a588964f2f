"""Starting the app: it says which config it uses; a theme it cannot load never stops it.

Configs are written as files and read with ``load_config`` (the search order of issue 3:
``--config``, ``$SHOPTERM_CONFIG``, ``$XDG_CONFIG_HOME/shopterm/config.toml``, the sample), so
the message the user sees is the one the real start-up gives.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from shopterm.config import HOW_ENV, HOW_SAMPLE, HOW_USER, load_config
from shopterm.resources import sample_config_path
from shopterm.ui.themes import DEFAULT_THEME
from tests.ui.conftest import screen_text

SAMPLE_THEME_LINE = 'theme = "shop-bright"'


def _sample_with_theme(theme: str) -> str:
    text = sample_config_path().read_text(encoding="utf-8")
    assert SAMPLE_THEME_LINE in text
    return text.replace(SAMPLE_THEME_LINE, f'theme = "{theme}"', 1)


@pytest.fixture
def xdg(tmp_path, monkeypatch):
    """Return the (config home, data home) the app sees, both empty, no $SHOPTERM_CONFIG."""
    cfg, data = tmp_path / "cfg", tmp_path / "data"
    monkeypatch.setenv("XDG_CONFIG_HOME", str(cfg))
    monkeypatch.setenv("XDG_DATA_HOME", str(data))
    monkeypatch.delenv("SHOPTERM_CONFIG", raising=False)
    monkeypatch.delenv("SHOPTERM_DATA", raising=False)
    return cfg, data


def _app(config, data: Path):
    """Return (app, the notifications it gives, as (message, severity) pairs)."""
    from shopterm.ui.app import ShoptermApp
    app = ShoptermApp(config, data_dir=data, start_screen="thread")
    said: list[tuple[str, str]] = []
    real = app.notify

    def notify(message, *args, **kw):
        said.append((str(message), kw.get("severity", "information")))
        return real(message, *args, **kw)

    app.notify = notify
    return app, said


def _user_theme(cfg: Path, name: str, text: str) -> Path:
    folder = cfg / "shopterm" / "themes"
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


# -- which config ------------------------------------------------------------------------------
@pytest.mark.parametrize("how", ["sample", "user", "env"])
async def test_start_says_which_config_file_is_in_use(xdg, tmp_path, monkeypatch, how):
    cfg, data = xdg
    if how == "user":
        path = cfg / "shopterm" / "config.toml"
        path.parent.mkdir(parents=True)
        path.write_text(_sample_with_theme("shop-dark"), encoding="utf-8")
        phrase = HOW_USER
    elif how == "env":
        path = tmp_path / "bench-lathe.toml"
        path.write_text(_sample_with_theme("shop-dark"), encoding="utf-8")
        monkeypatch.setenv("SHOPTERM_CONFIG", str(path))
        phrase = HOW_ENV
    else:
        path, phrase = sample_config_path(), HOW_SAMPLE
    config = load_config()                       # the search, as a start without --config
    assert config.path == path and config.how_found == phrase
    app, said = _app(config, data)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        status = screen_text(app).splitlines()[0]
        assert f"cfg {path.name}" in status      # the status line names the file, always
        started = [m for m, _ in said if m.startswith("Config:")]
        if how == "sample":                     # the package folder shortened: one line
            assert started == ["Config: <shopterm>/sample_config.toml\n"
                               "the shipped sample: none of your own"], said
            # a toast at 80 columns is 40 wide with a cell of padding each side (Textual 8.2.8
            # Toast max-width 50%, app.tcss padding 0 1): each line fits in 38
            assert all(len(line) <= 38 for line in started[0].splitlines())
        else:
            assert started == [f"Config: {path}\n{phrase}"], said   # and the start-up message
        assert app.theme == ("shop-dark" if how != "sample" else DEFAULT_THEME)


# -- theme fallback ----------------------------------------------------------------------------
async def test_unknown_theme_starts_with_the_default_and_says_so(xdg, tmp_path):
    cfg, data = xdg
    path = tmp_path / "config.toml"
    path.write_text(_sample_with_theme("shop-nonesuch"), encoding="utf-8")
    config = load_config(path)                   # a theme name is not checked against files
    assert config.shop.theme == "shop-nonesuch"
    app, said = _app(config, data)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.theme == DEFAULT_THEME
        text = screen_text(app)
        assert "Thread family" in text           # started and usable
        warnings = [m for m, sev in said if sev == "warning"]
        assert any("'shop-nonesuch'" in m and f"using '{DEFAULT_THEME}'" in m
                   for m in warnings), said
        assert any("display.theme" in m for m in warnings)   # says what to change


async def test_broken_user_theme_file_is_reported_and_the_app_starts(xdg):
    cfg, data = xdg
    broken = _user_theme(cfg, "workshop.toml", 'name = "workshop"\nprimary = "#12345"\n')
    config = load_config(sample_config_path())
    app, said = _app(config, data)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.theme == config.shop.theme == DEFAULT_THEME
        assert "Thread family" in screen_text(app)
        warnings = [m for m, sev in said if sev == "warning"]
        assert len(warnings) == 1, said
        assert str(broken) in warnings[0] and "'primary'" in warnings[0]   # file and key
        assert "skipped" in warnings[0]
        await pilot.press("1")                   # and the keypad still works: a favourite
        await pilot.pause()
        assert "This thread" in screen_text(app)


async def test_chosen_theme_in_a_broken_file_falls_back_with_both_messages(xdg, tmp_path):
    cfg, data = xdg
    broken = _user_theme(cfg, "my-shop.toml", 'name = "my-shop"\nprimary = \n')   # not TOML
    path = tmp_path / "config.toml"
    path.write_text(_sample_with_theme("my-shop"), encoding="utf-8")
    app, said = _app(load_config(path), data)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.theme == DEFAULT_THEME
        assert "Thread family" in screen_text(app)
        warnings = [m for m, sev in said if sev == "warning"]
        assert any(str(broken) in m and "line 2" in m for m in warnings), said
        assert any("'my-shop'" in m and f"using '{DEFAULT_THEME}'" in m for m in warnings), said


async def test_good_user_theme_named_in_the_config_is_used_quietly(xdg, tmp_path):
    cfg, data = xdg
    _user_theme(cfg, "my-shop.toml", 'name = "my-shop"\nprimary = "#224466"\ndark = true\n')
    path = tmp_path / "config.toml"
    path.write_text(_sample_with_theme("my-shop"), encoding="utf-8")
    app, said = _app(load_config(path), data)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.theme == "my-shop"
        assert [m for m, sev in said if sev != "information"] == [], said
