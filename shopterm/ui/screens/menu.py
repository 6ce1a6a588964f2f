"""The menu of screens (``*``) and the yes/no question (undo, finish, shut down)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Static

from shopterm.ui import keys
from shopterm.ui.screens import REGISTRY
from shopterm.ui.widgets.picklist import PickList


#: Screens reached from another screen rather than from the menu (keeps the menu to nine
#: entries, one digit each): the tool form opens from the pass counter (8), the pick-up from
#: the counter (1), the wire choice from the wire screen (Enter on an empty entry); the
#: preparation is where "Pass counter" goes until the cut is prepared, the fit check where
#: "Wire reading" goes for an internal thread, the gear-tooth caliper where a power thread is
#: measured with one; cutting to fit a sample opens from a candidate on "What thread is this?",
#: the special thread's entry from the "Special thread" family.
NOT_IN_MENU = ("toolform", "prepare", "pickup", "wirechoice", "fitcheck", "caliper", "fitsample",
               "special", "handtight")


class MenuScreen(ModalScreen[str | None]):
    """Numbered list of screens; a digit goes there."""

    DEFAULT_CSS = """
    MenuScreen { align: center middle; }
    MenuScreen > Vertical { width: 44; height: auto; border: round $primary; background: $surface; padding: 0 1; }
    """
    BINDINGS = [keys.bind(keys.MENU + "," + keys.BACK, "dismiss_menu", "close")]

    def compose(self) -> ComposeResult:
        items = [(title, name) for name, (_, _, title) in REGISTRY.items()
                 if name not in NOT_IN_MENU]
        items += [("Help", "help"), ("Quit (the record is saved)", "quit")]
        if self.app.config.shutdown_command:          # [pi] shutdown_command in the config
            items.append(("Shut the Pi down", "shutdown"))
        with Vertical():
            yield Static("[b]Go to[/b]  (digit, or ↑↓ Enter;  * or - closes)")
            yield PickList(items, columns=1, id="menu-list")

    def on_mount(self) -> None:
        self.query_one(PickList).focus()

    def on_pick_list_picked(self, event: PickList.Picked) -> None:
        self.dismiss(event.value)

    def action_dismiss_menu(self) -> None:
        self.dismiss(None)


class ConfirmScreen(ModalScreen[bool]):
    """A question answered with Enter (yes) or - (no)."""

    DEFAULT_CSS = """
    ConfirmScreen { align: center middle; }
    ConfirmScreen > Vertical { width: 60; height: auto; border: round $warning; background: $surface; padding: 0 1; }
    """
    BINDINGS = [keys.bind(keys.CONFIRM, "answer(True)", "yes"),
                keys.bind(keys.BACK + "," + keys.UNDO, "answer(False)", "no")]

    def __init__(self, question: str) -> None:
        super().__init__()
        self.question = question

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(self.question)
            yield Static("[b] Enter [/b] yes     [b] - [/b] no")

    def action_answer(self, yes: bool) -> None:
        self.dismiss(yes)
