"""Jobs and export: every job in the record; pick one to open, finish, archive or write it out.

Two steps on one numbered list: first the jobs (newest first, with "start a new job" at 1),
then, for the job picked, what to do with it. ``-`` goes back from the second step to the list,
and from the list to the job. Exports go to ``<data dir>/exports/`` and the path written is shown.
While the record is not being saved the store's warning stays on this screen, and the list
offers to try saving again.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.widgets import Static

from shopterm.errors import ShoptermError
from shopterm.job.export import write_whole
from shopterm.ui.screens.base import ShopScreen
from shopterm.ui.widgets.picklist import PickList

#: Export format → (file suffix, words on screen).
EXPORTS = {"card": ("txt", "job card"), "csv": ("csv", "CSV"), "json": ("json", "JSON")}
#: Column heads over the rows ``job_row`` makes (the pick list puts "N " before each row).
LIST_TITLE = f"  {'job':>4}  {'thread':<19}  {'status':<9}  {'passes':>6}  last entry"


def short_time(at: str | None) -> str:
    """Return an entry time as ``YYYY-MM-DD HH:MM`` (the record keeps seconds and offset)."""
    if not at:
        return "—"
    return at[:16].replace("T", " ")


def plural(n: int, one: str, many: str) -> str:
    """Return ``n`` with the word that fits it (``1 pass``, ``3 passes``)."""
    return f"{n} {one if n == 1 else many}"


def job_row(info, state) -> str:
    """Return one line of the list for job ``info`` with its folded ``state`` (or None)."""
    if state is None:
        return f"{info.id:>4}  {info.designation[:19]:<19}  {info.status:<9}  record does not add up"
    designation = state.current_designation or info.designation or "?"
    last = state.events[-1].at if state.events else info.created
    return (f"{info.id:>4}  {designation[:19]:<19}  {state.status:<9}  "
            f"{len(state.passes):>6}  {short_time(last)}")


class JobsScreen(ShopScreen):
    SCREEN_NAME = "jobs"
    TITLE = "Jobs and export"
    AUTO_FOCUS = "#jobs-list"
    CSS = """
    JobsScreen #health { height: auto; max-height: 3; padding: 0 1; color: $error;
                         text-style: bold; }
    JobsScreen #message { height: auto; max-height: 3; }
    JobsScreen #job-detail { height: auto; max-height: 3; padding: 0 1; }
    JobsScreen #written { height: auto; max-height: 3; padding: 0 1; }
    """
    HELP = (("1-9", "pick a job, then what to do with it; 0 = next page of jobs"),
            ("-", "from what to do: back to the list of jobs"),
            ("", "exports are written to the exports folder beside the record; the path is shown"),
            ("", "finish and archive can be taken back: pick the job again and carry on"))

    def __init__(self) -> None:
        super().__init__()
        self.picked_id: int | None = None      # None: the list of jobs is shown
        self.show_archived = False
        self.last_written: Path | None = None

    def compose_body(self) -> ComposeResult:
        yield Static("", id="health")
        yield Static("", id="message", classes="message")
        yield PickList(columns=1, id="jobs-list")
        yield Static("", id="job-detail")
        yield Static("", id="written")

    def on_mount(self) -> None:
        super().on_mount()
        self.show_list()
        self.set_interval(2.0, self.show_health)

    def on_screen_resume(self) -> None:
        super().on_screen_resume()
        if self.picked_id is None:
            self.show_list()
        else:
            self.show_job(self.picked_id)

    def job_changed(self) -> None:
        self.on_screen_resume()

    # -- what is shown -----------------------------------------------------------------------
    @property
    def store(self):
        return getattr(self.app, "store", None)

    def show_health(self) -> None:
        """Show the store's warning for as long as entries are not being saved."""
        health = self.store.health if self.store is not None else (
            "There is no job record: entries are NOT being saved. Start shopterm with "
            "--data-dir pointing at a folder you can write.")
        line = self.query_one("#health", Static)
        line.update(health or "")
        line.display = bool(health)
        self.refresh_chrome()

    def session(self, job_id: int):
        """Return the session on job ``job_id`` (the app's own if it is the open job)."""
        job = getattr(self.app, "job", None)
        if job is not None and job.job_id == job_id:
            return job
        return self.store.open_job(job_id)

    def list_items(self) -> list[tuple[str, object]]:
        """Return the numbered items of the list step: new job, the jobs, then the extras."""
        items: list[tuple[str, object]] = []
        if self.store is not None and self.store.health and not self.store.read_only:
            items.append(("try saving again now", ("retry", None)))
        items.append(("start a new job (choose its thread)", ("new", None)))
        if self.store is None:
            return items
        for info in self.store.jobs(include_archived=self.show_archived):
            try:
                state = self.session(info.id).state
            except ShoptermError:
                state = None
            row = job_row(info, state)
            if getattr(self.app, "job", None) is not None and self.app.job.job_id == info.id:
                row += "  (open now)"
            items.append((row, ("job", info.id)))
        items.append(("hide archived jobs" if self.show_archived else "show archived jobs too",
                      ("archived", None)))
        return items

    def show_list(self) -> None:
        self.picked_id = None
        picks = self.query_one("#jobs-list", PickList)
        picks.set_items(self.list_items(), LIST_TITLE)
        picks.focus()
        self.query_one("#job-detail", Static).update(
            Text("Pick a job by its number (left), not its job number.", style="dim"))
        self.show_health()

    def job_items(self, state) -> list[tuple[str, object]]:
        """Return what can be done with a job in ``state``."""
        finish = ("carry on with it (undo the finish)", "unfinish") if state.finished else \
            ("finish it", "finish")
        archive = ("bring it back (undo the archiving)", "unarchive") if state.archived else \
            ("archive it (leaves the usual list)", "archive")
        return [("open it where it stopped", "open"), finish, archive,
                ("export job card", "card"), ("export CSV", "csv"), ("export JSON", "json"),
                ("back to the list of jobs", "list")]

    def show_job(self, job_id: int) -> None:
        """Show what can be done with job ``job_id``; back to the list if it cannot be read."""
        try:
            session = self.session(job_id)
        except ShoptermError as exc:
            self.show_list()
            self.say(str(exc), error=True)
            return
        self.picked_id = job_id
        st = session.state
        picks = self.query_one("#jobs-list", PickList)
        picks.set_items(self.job_items(st), f"Job {job_id}: what to do")
        picks.focus()
        last = st.events[-1].at if st.events else None
        detail = Text()
        detail.append(f"Job {job_id}  {st.current_designation or '?'}", style="bold")
        detail.append(f"  {st.thread_kind or ''}  {st.status}\n")
        detail.append(f"{plural(len(st.passes), 'pass', 'passes')}, "
                      f"{plural(len(st.spring_passes), 'spring pass', 'spring passes')}, "
                      f"{plural(len(st.readings), 'reading', 'readings')}; "
                      f"last entry {short_time(last)}")
        self.query_one("#job-detail", Static).update(detail)
        self.show_health()

    # -- keys --------------------------------------------------------------------------------
    def action_forward(self) -> None:
        """``+`` goes back to the open job (there is no next step after the list of jobs)."""
        self.app.go_back(self.SCREEN_NAME)

    def action_back(self) -> None:
        if self.picked_id is not None:
            self.show_list()
            self.say("")
            return
        super().action_back()

    @on(PickList.Picked, "#jobs-list")
    def picked(self, event: PickList.Picked) -> None:
        event.stop()
        value = event.value
        try:
            if self.picked_id is None:
                self.list_picked(*value)
            else:
                self.job_picked(self.picked_id, value)
        except ShoptermError as exc:
            self.say(str(exc), error=True)
            self.show_health()

    def list_picked(self, what: str, job_id: int | None) -> None:
        if what == "new":
            self.app.new_job()
        elif what == "retry":
            self.retry_saving()
        elif what == "archived":
            self.show_archived = not self.show_archived
            self.show_list()
            self.say("Archived jobs are shown too." if self.show_archived
                     else "Archived jobs are hidden.")
        elif what == "job":
            self.say("")
            self.show_job(job_id)

    def retry_saving(self) -> None:
        job = getattr(self.app, "job", None)
        ok = job.retry() if job is not None else self.store.retry()
        self.show_list()
        if ok:
            self.say("Everything is saved now.")
        else:
            self.say("Still NOT saving: the disk did not take the entries. They are kept in "
                     "memory; fix the card or free space, then try again.", error=True)

    def job_picked(self, job_id: int, what: str) -> None:
        session = self.session(job_id)
        st = session.state
        if what == "list":
            self.show_list()
            self.say("")
            return
        if what == "open":
            if st.archived:
                self.say(f"Job {job_id} is archived: pick 'bring it back' first, then open it.",
                         error=True)
                return
            self.picked_id = None               # coming back here shows the list again
            if not self.app.open_job(job_id):
                self.show_list()
                self.say(f"Job {job_id} could not be opened.", error=True)
            return
        if what in EXPORTS:
            self.export(session, what)
            return
        if what == "finish":
            session.finish()
            done = f"Job {job_id} finished. To carry on with it, pick it and choose 2."
        elif what == "unfinish":
            session.undo(st.finished_seq)
            done = f"Job {job_id} is open again; pick 1 to open it."
        elif what == "archive":
            session.archive()
            done = (f"Job {job_id} archived; it is hidden from the list "
                    "(the last item shows archived jobs).")
        elif what == "unarchive":
            session.undo(st.archived_seq)
            done = f"Job {job_id} is back in the list."
        else:
            return
        self.refresh_chrome()
        if what == "archive" and not self.show_archived:
            self.show_list()
        else:
            self.show_job(job_id)
        self.say(done + ("" if session.health is None else "  (NOT saved yet; see above)"),
                 error=session.health is not None)

    def export(self, session, fmt: str) -> None:
        """Write job ``session`` out in ``fmt`` to the exports folder and show the path."""
        from shopterm.job.export import export
        suffix, words = EXPORTS[fmt]
        text = export(session.events, fmt, session.state.status)
        folder = Path(self.store.directory) / "exports"
        path = folder / f"job-{session.job_id}.{suffix}"
        try:
            write_whole(path, text, make_folder=True)
        except OSError as exc:
            self.say(f"Could not write the {words} ({exc.strerror or exc}) in {folder}. "
                     "Free some space or fix the card, then try again.", error=True)
            return
        self.last_written = path
        self.query_one("#written", Static).update(Text(f"Written: {path}", style="bold"))
        self.say(f"Job {session.job_id} written as {words} ({len(text.splitlines())} lines).")
