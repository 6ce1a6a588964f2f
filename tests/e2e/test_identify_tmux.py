"""'What thread is this?' end to end: the installed ``shopterm`` in tmux at 80x24, keypad keys
only (digits, ``.``, ``*``, ``-`` and keypad Enter). A 1/2 in pipe fitting is measured, the
taper tells the tapered pipe threads from the parallel one, and the tapered candidate handed to
"Cut to fit a sample" is refused there (a taper fits along its length, not to one band). Run with ``pytest -s tests/e2e`` to see every captured screen.
"""

from __future__ import annotations

import re

import pytest

from tests.e2e import tmux
from tests.e2e.test_thread_tmux import pick, show
from tests.glyphs import missing_glyphs

pytestmark = pytest.mark.e2e

CANDIDATES = "Could be any of these"


def names(text: str) -> list[str]:
    """Return the candidates listed on the pane, in order (``1 R1/2   fit 100%``)."""
    return re.findall(r"^\s*\d (\S+(?: \S+)?)\s+fit\s+\d+%", text, flags=re.M)


def entry(pane: tmux.Pane, question: str, typed: str) -> None:
    pane.wait_for(question)
    pane.send(typed, tmux.KEYPAD_ENTER)


def test_a_pipe_fitting_is_told_by_its_taper_and_not_cut_to_a_sample(tmux_shopterm):
    pane = tmux_shopterm()
    pane.send("*")
    pick(pane, "Go to", "What thread is this?")
    pick(pane, "What is the part?", "a bolt (external), diameters in mm")
    # 1/2 in pipe is 14 tpi at about 21 mm (common practice, no source)
    entry(pane, "Major diameter of the bolt", "21")
    pick(pane, "How was the pitch taken?", "pitch gauge in tpi")
    entry(pane, "Threads per inch", "14")
    pick(pane, "Flank angle", "not gauged")
    pick(pane, "Readings over wires", "show the candidates")
    text = pane.wait_for(CANDIDATES)
    show("a 1/2 in pipe fitting: 21 mm, 14 tpi", text)
    # ISO 7-1 R1/2, ASME B1.20.1 1/2-14 NPT, ISO 228-1 G1/2: all 14 tpi near 21 mm (from memory)
    assert names(text)[:3] == ["R1/2", "1/2-14 NPT", "G1/2 external"]
    assert "To tell them apart:" in text and "two places 10 mm apart" in text
    assert missing_glyphs(text) == set()
    pick(pane, CANDIDATES, "→ measure the taper (tapered or parallel?)")
    entry(pane, "Taper: the crest diameter at one place", "21")
    # ISO 7-1 / ASME B1.20.1: 1 in 16 on diameter, 0.625 mm over 10 mm (computed)
    entry(pane, "Taper: the crest diameter at a second place", "20.375")
    pane.wait_for("Taper: how far apart")
    show("the taper: how far apart", pane.capture())
    pane.send("10", tmux.KEYPAD_ENTER)
    text = pane.wait_for(lambda t: "taper 21.000 to 20.375 mm" in t and "fit" in t)
    show("after the taper", text)
    assert set(names(text)[:2]) == {"R1/2", "1/2-14 NPT"}
    assert "G1/2 external" not in names(text)[:2]
    pick(pane, "Could be any of these", "R1/2           fit 100%")
    pick(pane, "R1/2: what now?", "cut to fit a sample: a nut to fit the sample bolt")
    text = pane.wait_for("is a tapered thread")
    show("cut to fit a sample, handed R1/2: refused, it fits along its taper", text)
    assert "sample: R1/2" in text and "check it hand-tight" in " ".join(text.split())
    pane.send("-")
    text = pane.wait_for("R1/2: what now?")
    assert "Traceback" not in text
