"""The checklist before the first pass: the items that apply to this job, ticked with Enter.

The items come from ``shopterm.lathe.checklist.build_checklist`` with this job's set-up: how the
work is held and where the tool runs out (the set-up screen), the compound setting as this
lathe's scale reads it (from the set-up when the counter has recorded it, else worked out for
the default modified-flank method), and the half-nut plan from the thread dial. Each Enter
records one ``checklist_item`` whose ``item`` is the item's text as shown, so a tick stands
for exactly what was checked: if the set-up changes what an item says (another compound
setting, another half-nut plan), that item comes back unchecked. ``/`` takes the last one back
(asking first).
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.markup import escape
from textual.widgets import Static

from shopterm.cutting.infeed import infeed_method
from shopterm.errors import ShoptermError
from shopterm.lathe.checklist import ChecklistItem, build_checklist
from shopterm.lathe.taper import checklist_lines
from shopterm.ui.screens.taperview import is_tapered
from shopterm.ui import keys
from shopterm.ui.screens.base import ShopScreen

DONE_MARK = "[■]"
TODO_MARK = "[ ]"
HERE_MARK = "▸"
#: The infeed method assumed until the counter records one.
DEFAULT_METHOD = "modified"


def compound_setting(spec, lathe, setup: dict) -> tuple[float, float]:
    """Return (what to set on this lathe's compound scale [deg], true angle [deg]).

    From the set-up when the counter recorded it; else from its method; else the default
    modified-flank method for the thread's form angle.
    References: US Navy machinery training manual (via ``shopterm.cutting.infeed``).
    """
    true = setup.get("compound_angle_deg")
    scale = setup.get("compound_angle_set")
    if isinstance(true, (int, float)) and not isinstance(true, bool):
        if not isinstance(scale, (int, float)) or isinstance(scale, bool):
            scale = lathe.compound_scale_reading(float(true))
        return float(scale), float(true)
    method = setup.get("method") if setup.get("method") in (
        "radial", "flank", "modified", "alternating") else DEFAULT_METHOD
    m = infeed_method(method, spec.form.angle_deg, lathe=lathe,
                      internal=spec.kind == "internal", hand=spec.hand)
    return m.scale_reading_deg, m.true_angle_deg


def items_for(spec, lathe, setup: dict) -> tuple[ChecklistItem, ...]:
    """Return the checklist items for this thread on this lathe with the set-up in force."""
    plan = setup.get("dial_plan") or {}
    scale, true = compound_setting(spec, lathe, setup)
    return build_checklist(
        between_centres=bool(setup.get("between_centres")),
        internal=spec.kind == "internal",
        compound_setting_deg=round(scale, 3), compound_true_deg=round(true, 3),
        half_nut_plan=str(plan.get("text", "")),
        half_nut_stays_closed=bool(plan.get("keep_half_nut_closed")),
        has_relief=bool(setup.get("relief")),
        starts=spec.starts, indexing=setup.get("indexing") or None,
        left_hand=spec.hand == "LH",
        taper=checklist_lines(setup.get("taper")) if is_tapered(spec) else ())


def setup_problem(spec, setup: dict) -> str:
    """Return why the checklist cannot be built yet (what to do), or '' when it can."""
    if spec is None:
        return "Choose a thread first: * opens the menu, 1 the thread screen."
    if not setup.get("dial_plan") or "between_centres" not in setup:
        return "Record the lathe set-up first: - goes back to it, Enter there records it."
    if setup.get("for_thread") not in (None, spec.designation) or \
            setup.get("starts", spec.starts) != spec.starts:
        return (f"The set-up in force was for {setup.get('for_thread')}; record the set-up "
                f"for {spec.designation} first (- goes back to it).")
    if is_tapered(spec) and not isinstance(setup.get("taper"), dict):
        return ("Say how the taper is made (set-over or taper attachment) on the set-up "
                "screen and record it: - goes back to it.")
    return ""


class ChecklistScreen(ShopScreen):
    SCREEN_NAME = "checklist"
    TITLE = "Checklist"
    BINDINGS = [keys.bind(keys.CONFIRM, "tick", "checked")]
    HELP = (("Enter", "the highlighted item is checked: record it and go to the next"),
            ("/", "take back the last item checked (asks first)"),
            ("+", "when every item is checked: on to the pass counter"),
            ("-", "back to the set-up"))

    DEFAULT_CSS = """
    ChecklistScreen #head { height: 1; padding: 0 1; text-style: bold;
                            text-wrap: nowrap; text-overflow: ellipsis; }
    ChecklistScreen #items { height: auto; padding: 0 1; margin-top: 1;
                             text-wrap: nowrap; text-overflow: ellipsis; }
    ChecklistScreen #detail { height: auto; max-height: 3; padding: 0 1; margin-top: 1; }
    """

    def compose_body(self) -> ComposeResult:
        yield Static("", id="head")
        yield Static("", id="items")
        yield Static("", id="detail")
        yield Static("", id="message", classes="message")

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        self.say("")
        self.redraw()

    def job_changed(self) -> None:
        """An entry was taken back: redraw from the record."""
        self.refresh_chrome()
        self.say("")
        self.redraw()

    # -- from the record -----------------------------------------------------------------------
    def items(self) -> tuple[ChecklistItem, ...]:
        """Return the items for this job, or () when the set-up is not recorded yet."""
        spec, setup = self.app.spec, self.app.setup_values()
        if setup_problem(spec, setup):
            return ()
        try:
            return items_for(spec, self.app.lathe, setup)
        except ShoptermError as exc:      # shown by redraw(); nothing to tick meanwhile
            self.say(str(exc), error=True)
            return ()

    def done(self) -> frozenset[str]:
        state = self.app.state
        return state.checklist_done() if state is not None else frozenset()

    def current(self) -> ChecklistItem | None:
        """Return the first item not yet checked, or None when all are."""
        done = self.done()
        return next((it for it in self.items() if it.text not in done), None)

    # -- drawing -------------------------------------------------------------------------------
    def redraw(self) -> None:
        head = self.query_one("#head", Static)
        body = self.query_one("#items", Static)
        detail = self.query_one("#detail", Static)
        spec = self.app.spec
        try:
            problem = setup_problem(spec, self.app.setup_values())
            items = self.items()
        except ShoptermError as exc:
            problem, items = f"{exc}", ()
        if problem:
            head.update("Checklist")
            body.update(problem)
            detail.update("")
            return
        done = self.done()
        here = self.current()
        n_done = sum(it.text in done for it in items)
        head.update(f"{spec.designation}: {n_done} of {len(items)} checked   (! = safety)")
        lines = []
        for it in items:
            is_here = here is not None and it.key == here.key
            mark = escape(DONE_MARK if it.text in done else TODO_MARK)
            text = escape(it.text)
            if is_here:
                text = f"[reverse]{text}[/]"
            elif it.text in done:
                text = f"[dim]{text}[/]"
            if it.caution:
                text = f"[$warning]{text}[/]"
            flag = "[b $warning]![/]" if it.caution else " "
            lines.append(f"[b]{HERE_MARK if is_here else ' '}[/] {mark} {flag} {text}")
        out = "\n".join(lines)
        body.update(out)
        if here is None:
            detail.update(Text("Every item is checked. + goes on to the pass counter.",
                               style="bold"))
        else:
            detail.update(f"{here.detail}\nEnter: checked, next item.   /: take the last one back."
                          if here.detail else "Enter: checked, next item.   /: take the last "
                                              "one back.")

    # -- keys ----------------------------------------------------------------------------------
    def action_tick(self) -> None:
        problem = setup_problem(self.app.spec, self.app.setup_values())
        if problem:
            self.say(problem, error=True)
            return
        here = self.current()
        if here is None:
            self.say("Every item is checked: + goes on to the pass counter.")
            return
        if self.app.record("checklist_item", {"item": here.text, "done": True}) is None:
            self.say("Not recorded (see the note); the item stays unchecked.", error=True)
            return
        self.redraw()
        self.say("All checked: + goes on to the pass counter." if self.current() is None
                 else f"Checked: {here.text}")

    def action_forward(self) -> None:
        problem = setup_problem(self.app.spec, self.app.setup_values())
        if problem:
            self.say(problem, error=True)
            return
        left = [it for it in self.items() if it.text not in self.done()]
        if left:
            self.say(f"{len(left)} still to check: Enter checks the highlighted one "
                     "(* opens the menu to go elsewhere).", error=True)
            return
        self.app.go_forward(self.SCREEN_NAME)
