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


GROUPS: tuple[Group, ...] = (
    Group("iso", "ISO metric", ("iso",)),
    Group("unified", "Unified inch", ("unified",)),
    Group("whitworth", "Whitworth (BSW, BSF)", ("whitworth",), ("BSW", "BSF")),
    Group("ba", "BA", ("ba",)),
    Group("me", "Model engineer (32/40 tpi)", ("whitworth",), ("ME",)),
    Group("pipe", "Pipe threads: G, R, NPT", ("pipe",)),
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
