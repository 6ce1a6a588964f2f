"""The real start path (``run_app``): the record opened on a thread is the one the app uses,
and a config that stops the start leaves the record unlocked.

Check values are shopterm's own behaviour (DEVELOPERS.md, the store's docstring); no
published source applies.
"""

from __future__ import annotations

from shopterm.job.store import Store
from shopterm.resources import sample_config_path
from tests.ui.conftest import screen_text


def test_bad_config_stops_the_start_and_frees_the_record(tmp_path, capsys):
    from shopterm.ui.app import run_app
    bad = tmp_path / "config.toml"
    text = sample_config_path().read_text(encoding="utf-8")
    assert 'units = "in"' in text                   # else the config stays good and the app runs
    bad.write_text(text.replace('units = "in"', 'units = "cm"', 1), encoding="utf-8")
    data = tmp_path / "data"
    assert run_app(config_path=str(bad), data_dir=str(data)) == 2
    assert "check-config" in capsys.readouterr().err           # says what to do
    with Store.open(data) as s:                                # nobody holds the lock
        assert not s.read_only and s.message is None


async def test_app_takes_the_store_opened_in_the_background(sample_config, tmp_path):
    from shopterm.ui.app import ShoptermApp
    data = tmp_path / "data"
    opening = Store.open_in_background(data)
    app = ShoptermApp(sample_config, data_dir=data, store_opening=opening)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.store is not None and app.store.path == data / "jobs.sqlite3"
        assert app.store is opening.result()                    # the same object, not a second
        assert "saved" in screen_text(app).splitlines()[0]
        assert "Thread family" in screen_text(app)
    app.store.close()


async def test_background_refusal_shows_not_saving_and_the_app_goes_on(sample_config, tmp_path):
    from shopterm.ui.app import ShoptermApp
    blocker = tmp_path / "a-file"
    blocker.write_text("x")
    opening = Store.open_in_background(blocker / "data")        # no folder can be made there
    app = ShoptermApp(sample_config, data_dir=blocker / "data", store_opening=opening)
    said: list[tuple[str, str]] = []
    real = app.notify

    def notify(message, *args, **kw):
        said.append((str(message), kw.get("severity", "information")))
        return real(message, *args, **kw)

    app.notify = notify
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert app.store is None
        assert "NOT SAVING" in screen_text(app).splitlines()[0]
        assert any(sev == "error" and "Nothing will be saved" in m for m, sev in said), said
        assert "Thread family" in screen_text(app)              # still usable


def test_user_themes_are_still_tried_whole_but_shipped_ones_only_in_use(tmp_path, monkeypatch):
    # load_themes leaves Textual's colour-system derivation out for the shipped themes only;
    # a user's theme that Textual cannot use is still refused (and reported) at start.
    from textual.theme import Theme

    from shopterm.ui import themes as th
    tried: list[str] = []
    real = Theme.to_color_system

    def spy(self):
        tried.append(self.name)
        if self.name == "workshop":
            raise ValueError("no colour system")
        return real(self)

    monkeypatch.setattr(Theme, "to_color_system", spy)
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "cfg"))
    folder = tmp_path / "cfg" / "shopterm" / "themes"
    folder.mkdir(parents=True)
    (folder / "workshop.toml").write_text('name = "workshop"\nprimary = "#224488"\n',
                                          encoding="utf-8")
    found, problems = th.load_themes()
    assert tried == ["workshop"]
    assert "workshop" not in [t.name for t in found]
    assert {"shop-bright", "shop-dark", "shop-console"} <= {t.name for t in found}
    assert len(problems) == 1 and "Textual cannot use this theme" in problems[0]
    assert "workshop.toml" in problems[0]
