"""The app's screens. ``REGISTRY`` maps a screen name to its module and class (loaded on first use)."""

REGISTRY: dict[str, tuple[str, str, str]] = {
    # name: (module, class, title in the menu)
    "thread": ("shopterm.ui.screens.thread", "ThreadScreen", "Thread"),
    "special": ("shopterm.ui.screens.special", "SpecialThreadScreen", "Special thread"),
    "setup": ("shopterm.ui.screens.setup", "SetupScreen", "Lathe set-up"),
    "checklist": ("shopterm.ui.screens.checklist", "ChecklistScreen", "Checklist"),
    "prepare": ("shopterm.ui.screens.prepare", "PrepareScreen", "Prepare the cut"),
    "counter": ("shopterm.ui.screens.counter", "CounterScreen", "Pass counter"),
    "pickup": ("shopterm.ui.screens.pickup", "PickupScreen", "Pick up the thread"),
    "wires": ("shopterm.ui.screens.wires", "WiresScreen", "Wire reading"),
    "wirechoice": ("shopterm.ui.screens.wirechoice", "WireChoiceScreen", "Choose the wire"),
    "caliper": ("shopterm.ui.screens.caliper", "CaliperScreen", "Caliper reading"),
    "fitcheck": ("shopterm.ui.screens.fitcheck", "FitCheckScreen", "Fit check"),
    "handtight": ("shopterm.ui.screens.handtight", "HandTightScreen", "Hand-tight check"),
    "toolform": ("shopterm.ui.screens.toolform", "ToolFormScreen", "Tool form"),
    "identify": ("shopterm.ui.screens.identify", "IdentifyScreen", "What thread is this?"),
    "fitsample": ("shopterm.ui.screens.fitsample", "FitSampleScreen", "Cut to fit a sample"),
    "jobs": ("shopterm.ui.screens.jobs", "JobsScreen", "Jobs and export"),
}

#: The order a job goes through; ``+`` and ``-`` move along it, stepping over a screen that
#: sends the user elsewhere at this stage of the job (its ``route()``: 'prepare' once the cut is
#: prepared, 'counter' before).
FLOW: tuple[str, ...] = ("thread", "setup", "checklist", "prepare", "counter", "wires")
