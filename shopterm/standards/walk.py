"""The thread catalogue arranged for choosing step by step: group → series → size → pitch.

Groups are what a person looks for first (the model-engineer series is its own group although it
shares the Whitworth form). Everything comes from ``catalogue()``; nothing is listed twice.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import TYPE_CHECKING

from shopterm.standards import catalogue

if TYPE_CHECKING:
    from shopterm.standards.spec import ThreadSpec


@dataclass(frozen=True)
class Group:
    key: str
    title: str
    families: tuple[str, ...]
    series: tuple[str, ...] | None = None   # None: every series of the families


#: In the order a shop asks for them: after up to three recent threads and the config's
#: favourites the first page of the thread screen holds six of them (nine digits a page).
GROUPS: tuple[Group, ...] = (
    Group("iso", "ISO metric", ("iso",)),
    Group("unified", "Unified inch", ("unified",)),
    Group("whitworth", "Whitworth (BSW, BSF)", ("whitworth",), ("BSW", "BSF")),
    Group("pipe", "Pipe threads: G, R, NPT", ("pipe",)),
    Group("power", "Leadscrew: trapezoidal, Acme", ("trapezoidal", "acme", "square")),
    Group("ba", "BA", ("ba",)),
    Group("me", "Model engineer (32/40 tpi)", ("whitworth",), ("ME",)),
    Group("special", "Special thread", ("special",)),
)


def group(key: str) -> Group:
    """Return the group with this key."""
    for g in GROUPS:
        if g.key == key:
            return g
    raise KeyError(key)


def _in_group(g: Group, spec: ThreadSpec) -> bool:
    return spec.family in g.families and (g.series is None or spec.series in g.series)


@lru_cache(maxsize=None)
def members(key: str) -> tuple[ThreadSpec, ...]:
    """Return every catalogue thread in the group, in catalogue order."""
    g = group(key)
    return tuple(s for s in catalogue() if _in_group(g, s))


def _unique(values):
    seen, out = set(), []
    for v in values:
        if v not in seen:
            seen.add(v)
            out.append(v)
    return out


def series(key: str) -> list[str]:
    """Return the series in the group, in catalogue order."""
    return _unique(s.series for s in members(key))


def sizes(key: str, series_name: str | None = None) -> list[str]:
    """Return the sizes (as written) in the group or one of its series, smallest first."""
    specs = [s for s in members(key) if series_name is None or s.series == series_name]
    specs.sort(key=lambda s: s.major)
    return _unique(s.size for s in specs)


def pitches(key: str, series_name: str | None, size: str) -> list[ThreadSpec]:
    """Return the threads of that size (one per pitch), coarsest first."""
    specs = [s for s in members(key)
             if s.size == size and (series_name is None or s.series == series_name)]
    specs.sort(key=lambda s: -s.pitch)
    return specs


# The sizes most often cut in a group, offered first as whole threads (the catalogue's external
# thread and usual class) before the rest of the group, which sits behind a "more" entry. Each
# entry is (series, size, pitch [mm] or None for the coarsest). Nine to a list: one page of the
# keypad's digits.
COMMON: dict[str, tuple[tuple[str, str, float | None], ...]] = {
    # ISO 262 selected sizes for screws, bolts and nuts, M4 to M24 (from memory); M3 and the
    # second-choice sizes (M14, M18, M22) are under "more"
    "iso": tuple(("M", size, None) for size in
                 ("M4", "M5", "M6", "M8", "M10", "M12", "M16", "M20", "M24")),
    # UNC and BSW fractional sizes 1/4 to 1 in (common practice, no source)
    "unified": tuple(("UNC", size, None) for size in
                     ("1/4", "5/16", "3/8", "7/16", "1/2", "5/8", "3/4", "7/8", "1")),
    "whitworth": tuple(("BSW", size, None) for size in
                       ("1/4", "5/16", "3/8", "7/16", "1/2", "5/8", "3/4", "7/8", "1")),
    # Leadscrews: ISO 2902 first-choice diameters with their preferred pitch (from memory) and
    # the Acme sizes most met on lathes and vices (common practice, no source)
    "power": (("Tr", "Tr12", 3.0), ("Tr", "Tr16", 4.0),
              ("Tr", "Tr20", 4.0), ("Tr", "Tr24", 5.0), ("Tr", "Tr32", 6.0),
              ("Tr", "Tr40", 7.0), ("ACME", "1/2", None), ("ACME", "3/4", None),
              ("ACME", "1", None)),
    # Pipe threads: the sizes most met on fittings, hoses and air lines, G and R 1/4 to 3/4 and
    # 1/2 NPT (common practice, no source)
    "pipe": (("G", "1/4", None), ("G", "3/8", None), ("G", "1/2", None), ("G", "3/4", None),
             ("R", "1/4", None), ("R", "3/8", None), ("R", "1/2", None), ("R", "3/4", None),
             ("NPT", "1/2", None)),
}

# The internal class that goes with a catalogue's usual external class: ISO 965-1 6H with 6g,
# ASME B1.1 2B with 2A (the classes for general use); a class both kinds share (BA normal) is
# kept. Anything else: the first class the tables give for the internal thread.
_INTERNAL_CLASS = {"6g": "6H", "2A": "2B"}


def common(key: str) -> list[ThreadSpec]:
    """Return the group's common threads (the listed pitch, else the coarsest), or [] if none."""
    if key not in COMMON:
        return []
    out = []
    for series_name, size, pitch in COMMON[key]:
        specs = [s for s in pitches(key, series_name, size)
                 if pitch is None or abs(s.pitch - pitch) < 1e-9]
        if specs:
            out.append(specs[0].with_(pitch_implied=False))
    return out


def with_kind(spec: ThreadSpec, kind: str) -> ThreadSpec:
    """Return ``spec`` as an external or internal thread, with the usual class for that kind."""
    from shopterm.standards import classes

    if kind == spec.kind:
        return spec
    base = spec.with_(kind=kind, tol_class=None)
    offered = classes(base)
    if not offered:
        return base
    if kind == "internal":
        want = _INTERNAL_CLASS.get(spec.tol_class)
    else:
        want = next((e for e, i in _INTERNAL_CLASS.items() if i == spec.tol_class), None)
    for cls in (want, spec.tol_class):
        if cls in offered:
            return base.with_(tol_class=cls)
    return base.with_(tol_class=offered[0])
