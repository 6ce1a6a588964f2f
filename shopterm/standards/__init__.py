"""Thread standards: designations, series tables, tolerance systems and limits of size.

Each family lives in its own module and offers the same five functions:

``parse(text) -> ThreadSpec | None``
    None when ``text`` is not written in the family's way; raises ``UnknownThread``,
    ``UnsupportedClass`` or ``InvalidEntry`` when it is, but names no valid thread.
``limits(spec) -> Limits``
``format(spec) -> str``
    the designation as the family's standard prints it.
``catalogue() -> list[ThreadSpec]``
    every standard size, external, in the family's usual class.
``classes(spec) -> list[str]``
    the classes the family's tables give for this size and kind (for the list walk).

A family may also offer ``cautions(spec) -> tuple[str, ...]`` (see ``cautions`` below).

The registry below strips what all families share (``LH``, a trailing ``internal``/``external``)
and asks each family in turn. A family with ``WRITES_HAND = True`` writes the hand in its own
``format`` (``Tr20x4LH``, ``3/4-6 ACME-2G-LH``); the registry adds `` LH`` for the others.
"""

from __future__ import annotations

import difflib
import re
from functools import lru_cache
from types import ModuleType

from typing import TYPE_CHECKING

from shopterm.errors import InvalidEntry, UnknownThread

if TYPE_CHECKING:
    from shopterm.standards.spec import Limits, ThreadSpec

__all__ = ["parse", "limits", "catalogue", "format_designation", "classes", "cautions",
           "usual_class", "family_module",
           "ThreadSpec", "Limits", "FAMILIES"]

#: Family keys in the order they are asked to parse, with the module that implements each.
FAMILIES: dict[str, str] = {
    "iso": "shopterm.standards.iso",
    "unified": "shopterm.standards.unified",
    "whitworth": "shopterm.standards.whitworth",
    "ba": "shopterm.standards.ba",
    "trapezoidal": "shopterm.standards.trapezoidal",
    "acme": "shopterm.standards.acme",
    "square": "shopterm.standards.square",
    "pipe": "shopterm.standards.pipe",
    "special": "shopterm.standards.special",
}

FAMILY_TITLES: dict[str, str] = {
    "iso": "ISO metric",
    "unified": "Unified inch",
    "whitworth": "Whitworth form (BSW, BSF, ME)",
    "ba": "BA",
    "trapezoidal": "ISO metric trapezoidal (Tr)",
    "acme": "Acme and stub Acme",
    "square": "Square (no standard)",
    "pipe": "Pipe threads (G, R, NPT)",
    "special": "Special",
}

def __getattr__(name: str):
    """Return ``ThreadSpec`` / ``Limits`` from ``spec`` on first use (not imported at start:
    the first screen lists thread families before any thread is made)."""
    if name in ("ThreadSpec", "Limits"):
        from shopterm.standards import spec
        return getattr(spec, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


_HAND = re.compile(r"\s*[-\s]\s*(LH|RH)\s*$", re.IGNORECASE)
_KIND = re.compile(r"\s+(internal|external|int|ext|nut|bolt)\.?\s*$", re.IGNORECASE)
_KIND_WORDS = {"internal": "internal", "int": "internal", "nut": "internal",
               "external": "external", "ext": "external", "bolt": "external"}


def family_module(family: str) -> ModuleType:
    """Return the module implementing ``family``."""
    import importlib
    try:
        return importlib.import_module(FAMILIES[family])
    except KeyError:
        raise UnknownThread(f"No thread family {family!r}.") from None


def parse(text: str, kind: str | None = None) -> ThreadSpec:
    """Return the thread a designation names, e.g. ``M10x1.5-6g`` or ``1/4-20 UNC-2A``.

    ``kind`` ('external'/'internal') applies where the class does not say it (BSW, BA, ME).
    Raises ``UnknownThread`` (with suggestions) or ``InvalidEntry``.
    """
    if not isinstance(text, str) or not text.strip():
        raise InvalidEntry("Type a thread designation such as M10x1.5-6g, 1/4-20 UNC-2A, "
                           "3/8 BSW, 2BA, 1/4x40 ME, Tr20x4-7e, 1-5 ACME-2G, G1/2A or "
                           "1/2-14 NPT.")
    s = " ".join(text.strip().split())
    hand = None
    for _ in range(2):
        if m := _HAND.search(s):
            hand = m.group(1).upper()
            s = s[: m.start()].rstrip()
        if m := _KIND.search(s):
            word_kind = _KIND_WORDS[m.group(1).lower()]
            if kind is not None and kind != word_kind:
                raise InvalidEntry(f"{text!r} says {word_kind} but {kind} was asked for.")
            kind = word_kind
            s = s[: m.start()].rstrip()
    for family in FAMILIES:
        spec = family_module(family).parse(s)
        if spec is None:
            continue
        if kind is not None and spec.kind != kind:
            if spec.tol_class is not None and family in _CLASS_SAYS_KIND:
                raise InvalidEntry(f"Class {spec.tol_class} is for an {spec.kind} thread, not "
                                   f"{kind}: {_CLASS_SAYS_KIND[family]}")
            spec = spec.with_(kind=kind)
            _check_class(spec)
        return spec.with_(hand=hand) if hand is not None and hand != spec.hand else spec
    raise UnknownThread(f"{text.strip()!r} is not a thread designation shopterm knows.",
                        suggest(s))


#: Families whose class letter says the kind, and how to write the other kind.
_CLASS_SAYS_KIND = {
    "iso": "use a lower-case letter (6g) for external, capital (6H) for internal.",
    "unified": "use A for external, B for internal.",
    "pipe": "ISO 228-1 classes A and B are external; write an internal G with no letter (G1/2).",
}


def _check_class(spec: ThreadSpec) -> None:
    if spec.tol_class is None:
        return
    valid = classes(spec)
    if not valid:
        limits(spec)   # the family says why this kind has no class (or accepts it)
    elif spec.tol_class not in valid:
        raise InvalidEntry(f"Class {spec.tol_class!r} is not given for an {spec.kind} "
                           f"{spec.size} thread; use one of: {', '.join(valid)}.")


def limits(spec: ThreadSpec) -> Limits:
    """Return the limits of size of ``spec``."""
    return family_module(spec.family).limits(spec)


def format_designation(spec: ThreadSpec) -> str:
    """Return the designation of ``spec`` written as its standard writes it."""
    module = family_module(spec.family)
    text = module.format(spec)
    if getattr(module, "WRITES_HAND", False):   # the family writes the hand its standard's way
        return text
    return text + " LH" if spec.hand == "LH" else text


def classes(spec: ThreadSpec) -> list[str]:
    """Return the classes the standard gives for this thread's size and kind."""
    return family_module(spec.family).classes(spec)


def cautions(spec: ThreadSpec) -> tuple[str, ...]:
    """Return the cautions to show with this thread (a family may have none).

    Pipe threads: a pressure fitting's fitness for service is not settled by its dimensions.
    """
    return tuple(getattr(family_module(spec.family), "cautions", lambda s: ())(spec))


def usual_class(spec: ThreadSpec) -> str | None:
    """Return the class a family's limits use when none is given (its ``DEFAULT_CLASS``, a
    class or one per kind), or None when the family has none (basic sizes)."""
    default = getattr(family_module(spec.family), "DEFAULT_CLASS", None)
    return default.get(spec.kind) if isinstance(default, dict) else default


@lru_cache(maxsize=1)
def catalogue() -> tuple[ThreadSpec, ...]:
    """Return every standard thread in every family (external, usual class)."""
    out: list[ThreadSpec] = []
    for family in FAMILIES:
        out.extend(family_module(family).catalogue())
    return tuple(out)


@lru_cache(maxsize=1)
def _designations() -> dict[str, str]:
    return {d.upper(): d for d in (s.designation for s in catalogue())}


def suggest(text: str, n: int = 3) -> tuple[str, ...]:
    """Return up to ``n`` catalogue designations that look like ``text``."""
    names = _designations()
    hits = difflib.get_close_matches(text.upper(), list(names), n=n, cutoff=0.5)
    return tuple(names[h] for h in hits)
