"""The thread-choice screen at 80x24, driven with keypad keys only."""

import pytest

from tests.ui.conftest import screen_text

pytestmark = pytest.mark.asyncio


def digit_of(app, label: str) -> str:
    """Return the digit that picks ``label`` on the list's page now shown."""
    labels = [lbl for lbl, _ in app.screen.query_one("#choices").page_items()]
    assert label in labels, labels
    return str(labels.index(label) + 1)


async def test_walk_iso_common_size_in_three_keys(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(digit_of(app, "ISO metric"))
        text = screen_text(app)
        assert "Common sizes, coarse pitch" in text
        # the common coarse sizes M4-M24 fill the first page; the rest is behind "more"
        labels = [lbl for lbl, _ in app.screen.query_one("#choices").page_items()]
        assert labels[0] == "M4x0.7-6g" and labels[-1] == "M24x3-6g" and len(labels) == 9
        await pilot.press(digit_of(app, "M10x1.5-6g"))
        text = screen_text(app)
        assert "M10x1.5-6g" in text and "external" in text
        assert "8.994" in text and "8.862" in text   # ISO 965-2, M10x1.5-6g d2 max/min
        assert "9.968" in text and "9.732" in text   # ISO 965-2, M10x1.5-6g d max/min
        await pilot.press("enter")  # use it
        assert app.spec is not None and app.spec.designation == "M10x1.5-6g"


async def test_this_thread_turns_internal_and_changes_class(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(digit_of(app, "ISO metric"))
        await pilot.press(digit_of(app, "M10x1.5-6g"))
        await pilot.press(digit_of(app, "make it internal (nut)"))
        text = screen_text(app)
        assert "M10x1.5-6H" in text and "internal" in text
        assert "9.206" in text and "9.026" in text   # ISO 965-2, M10x1.5-6H D2 max/min (from memory)
        await pilot.press(digit_of(app, "make it external (screw)"))
        assert "M10x1.5-6g" in screen_text(app)      # back to the usual external class
        await pilot.press(digit_of(app, "class: 6g"))
        assert "Class of fit (external)" in screen_text(app)
        await pilot.press(digit_of(app, "4h"))
        text = screen_text(app)
        assert "M10x1.5-4h" in text
        assert "9.026" in text and "8.941" in text   # ISO 965-2, M10x1.5-4h d2 max/min (from memory)
        await pilot.press("minus")                   # back: the class as it was
        assert "M10x1.5-6g" in screen_text(app)


async def test_more_leads_to_fine_pitches(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(digit_of(app, "ISO metric"), "0")
        await pilot.press(digit_of(app, "more sizes and pitches"))
        picks = app.screen.query_one("#choices")
        while "M10" not in [lbl for lbl, _ in picks.page_items()]:
            await pilot.press("0")
        await pilot.press(digit_of(app, "M10"))
        await pilot.press(digit_of(app, "1.25 mm"))
        text = screen_text(app)
        assert "M10x1.25-6g" in text
        assert "9.160" in text and "9.042" in text   # ISO 965-2, M10x1.25-6g d2 max/min (from memory)


async def test_favourite_then_enter_uses_it(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        assert app.config.favourites[0] == "M12x1.75-6g"      # the sample's first favourite
        await pilot.press("1")
        text = screen_text(app)
        assert "This thread" in text
        assert "10.829" in text and "10.679" in text  # ISO 965-2, M12x1.75-6g d2 max/min (from memory)
        await pilot.press("enter")
        assert app.spec.designation == "M12x1.75-6g"


async def test_recent_thread_comes_first(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(digit_of(app, "ISO metric"))
        await pilot.press(digit_of(app, "M10x1.5-6g"), "enter")
        app.new_job()
        await pilot.pause()
        await pilot.press(digit_of(app, "choose again"))
        labels = [lbl for lbl, _ in app.screen.query_one("#choices").page_items()]
        assert labels[:2] == ["recent M10x1.5-6g", "M12x1.75-6g"], labels
        await pilot.press("1", "enter")
        assert app.spec.designation == "M10x1.5-6g"


@pytest.mark.parametrize("typed, want, pd_max", [
    ("10", "M10x1.5-6g", "8.994"),            # ISO 965-2, M10x1.5-6g d2 max
    ("10.1.25", "M10x1.25-6g", "9.160"),      # ISO 965-2, M10x1.25-6g d2 max (from memory)
    ("3.8.16", "3/8-16 UNC-2A", "0.3331"),    # ASME B1.1 table, 3/8-16 UNC-2A PD max
])
async def test_numbers_typed_after_the_point_key(make_app, typed, want, pd_max):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        keys = ["full_stop" if c == "." else c for c in typed]
        await pilot.press("full_stop", *keys)
        assert "Size.pitch: " + typed in screen_text(app)
        await pilot.press("ctrl+j")                 # keypad Enter as tmux sends it
        text = screen_text(app)
        assert want in text and pd_max in text
        if want.endswith("UNC-2A"):
            assert "also 3/8 BSW" in text           # the same size and tpi in Whitworth
        await pilot.press("enter")                  # use it
        assert app.spec.designation == want


async def test_numbers_that_are_no_thread_keep_the_text_and_minus_leaves(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("full_stop", "1", "0", "full_stop", "1", "full_stop", "6", "enter")
        text = screen_text(app)
        assert "no thread in the tables is typed '10.1.6'" in text
        entry = app.screen.query_one("#designation")
        assert entry.value == "10.1.6"              # nothing typed is lost
        await pilot.press("minus")                  # the keypad's back key leaves the field
        assert not entry.has_focus and entry.text_mode
        assert "Thread family" in screen_text(app)


async def test_typed_designation_and_bad_one_keeps_text(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(*"M10x1.6-6g")
        await pilot.press("enter")
        text = screen_text(app)
        assert "not in ISO 261" in text
        entry = app.screen.query_one("#designation")
        assert entry.value == "M10x1.6-6g"          # nothing typed is lost
        await pilot.press("backspace", "backspace", "backspace", "backspace", "5", "-", "6", "g")
        await pilot.press("ctrl+j")                 # keypad Enter as tmux sends it
        text = screen_text(app)
        assert "8.994" in text                      # ISO 965-2, M10x1.5-6g d2 max


async def test_back_key_steps_back_in_walk(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(digit_of(app, "ISO metric"))
        assert "Common sizes" in screen_text(app)
        await pilot.press("minus")
        assert "Thread family" in screen_text(app)
        await pilot.press("plus")                   # forward refused without a thread
        assert "Choose a thread first" in screen_text(app)


async def test_enter_after_a_typed_designation_uses_it(make_app):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press(*"M6x1-6g")
        await pilot.press("enter")            # look it up
        assert "5.324" in screen_text(app)    # ISO 965-2, M6x1-6g d2 max
        await pilot.press("enter")            # use it
        assert app.spec is not None and app.spec.designation == "M6x1-6g"
        assert app.state.current_designation == "M6x1-6g"


async def test_favourites_are_checked_after_the_first_paint(tmp_path, monkeypatch):
    # the first list shows the favourites as written (no thread tables loaded before the first
    # paint); once checked, a refused one is left out with a warning and the others are shown
    # as the standards print them
    from shopterm.config import read_config_text
    from shopterm.resources import sample_config_path
    from shopterm.ui.app import ShoptermApp
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "cfg"))
    text = sample_config_path().read_text(encoding="utf-8").replace(
        'threads = ["M12x1.75-6g", "3/8-16 UNC-2A", "1/2-13 UNC-2A"]',
        'threads = ["m12x1.75-6g", "M10x1.6-6g"]')
    config = read_config_text(text, sample_config_path(), "test")
    assert [t for t, _ in config.favourites_written] == ["m12x1.75-6g", "M10x1.6-6g"]
    app = ShoptermApp(config, data_dir=tmp_path / "data")
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        await pilot.pause()
        assert app.favourite_threads() == ["M12x1.75-6g"]
        shown = [lbl for lbl, _ in app.screen.query_one("#choices").page_items()]
        assert shown[0] == "M12x1.75-6g" and "M10x1.6-6g" not in shown
        assert any("M10x1.6-6g" in n.message for n in app._notifications)
