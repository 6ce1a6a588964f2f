"""``shopterm calc identify``: which standard thread a part could be, from bench measurements."""

from __future__ import annotations

from shopterm.commands import add_json_option, emit_json
from shopterm.errors import InvalidEntry
from shopterm.cutting.identify import COUNTED, Identification, identify
from shopterm.units import parse_length, parse_number, parse_positive_length


def register(subparsers) -> None:
    p = subparsers.add_parser(
        "identify", help="which thread is this? (from measurements)",
        description="Rank the standard threads against what was measured: the major diameter "
                    "of a bolt or the minor diameter of a nut (calipers), the pitch (gauge in mm "
                    "or tpi, or a count over a length), optionally the flank angle, the crest flat, "
                    "a taper and readings over wires. Lengths in mm unless typed with 'in'.")
    p.add_argument("--major", metavar="D", help="major diameter (a bolt's crests)")
    p.add_argument("--minor", metavar="D", help="minor diameter (a nut's crests; a bolt's root "
                                                "when --major is given too)")
    p.add_argument("--pitch", metavar="P", help="pitch from a gauge, mm")
    p.add_argument("--tpi", metavar="N", help="threads per inch from a gauge")
    p.add_argument("--count", metavar="N", help="threads counted over --length")
    p.add_argument("--length", metavar="L", help="length the counted threads span")
    p.add_argument("--counted", metavar="WHAT", default="crests",
                   help="what --count counts: 'crests' (both end crests included, the default) "
                        "or 'spaces' (whole pitches)")
    p.add_argument("--angle", metavar="A", help="included flank angle from a gauge: 60, 55, "
                   "47.5, 30 (trapezoidal), 29 (Acme), 0 (square)")
    p.add_argument("--crest-flat", metavar="F", dest="crest_flat",
                   help="width of a bolt's crest flat (0 for a rounded crest)")
    p.add_argument("--taper", metavar="D1,D2,L",
                   help="crest diameter at two places and the distance between them, e.g. "
                        "21,20.375,10: tells a tapered pipe thread (R, NPT) from a parallel one (G)")
    p.add_argument("--wire", metavar="W", action="append", default=[],
                   help="wire size used for an --over-wires reading (repeat for two sizes)")
    p.add_argument("--over-wires", metavar="M", action="append", default=[], dest="over_wires",
                   help="reading over the wires, in the order of --wire")
    p.add_argument("--internal", action="store_const", const="internal", dest="kind",
                   help="the part is a nut (default when only --minor is given)")
    p.add_argument("--limit", metavar="N", default="8", help="most candidates shown (default 8)")
    add_json_option(p)
    p.set_defaults(func=run)


def _length(text: str | None, what: str) -> float | None:
    return None if text is None else parse_positive_length(text, "mm", what)


def _whole(text: str | None, flag: str) -> int | None:
    if text is None:
        return None
    try:
        return int(str(text).strip())
    except ValueError:
        raise InvalidEntry(f"{flag} {text!r}: give a whole number, e.g. {flag} 10.") from None


def _taper(text: str | None) -> tuple[float, float, float] | None:
    if text is None:
        return None
    parts = [t for t in str(text).replace(";", ",").split(",")]
    if len(parts) != 3:
        raise InvalidEntry(f"--taper {text!r}: give two crest diameters and the distance "
                           "between them, e.g. --taper 21,20.375,10.")
    names = ("first diameter of the taper", "second diameter of the taper",
             "distance between the two diameters")
    d1, d2, apart = (parse_positive_length(t, "mm", what) for t, what in zip(parts, names))
    return d1, d2, apart


def identification_dict(result: Identification) -> dict:
    """Return the identification as the JSON object ``calc identify --json`` prints (mm)."""
    return {
        "candidates": [{"designation": c.designation, "score": round(c.score, 4), "why": c.why,
                        "family": c.spec.family, "series": c.spec.series,
                        "pitch_mm": round(c.spec.pitch, 6), "tpi": c.spec.tpi,
                        "angle_deg": c.spec.form.angle_deg, "kind": c.spec.kind}
                       for c in result.candidates],
        "ambiguous": result.ambiguous,
        "to_tell_apart": [{"between": list(t.between), "measure": t.measure, "how": t.how,
                           "expected": [{"designation": e.designation, "quantity": e.quantity,
                                         "low": round(e.low, 4), "high": round(e.high, 4)}
                                        for e in t.expected]}
                          for t in result.to_tell_apart],
        "note": result.note,
        "units": "mm",
    }


def run(args) -> int:
    if args.counted not in COUNTED:
        raise InvalidEntry(f"--counted {args.counted!r}: say 'crests' (both end crests counted) "
                           "or 'spaces' (whole pitches counted).")
    if len(args.wire) != len(args.over_wires):
        raise InvalidEntry("Give each --over-wires reading with its --wire size "
                           "(as many of one as of the other).")
    wires = [(_length(w, "wire size"), _length(m, "reading over wires"))
             for w, m in zip(args.wire, args.over_wires)]
    limit = _whole(args.limit, "--limit")
    result = identify(
        major=_length(args.major, "major diameter"), minor=_length(args.minor, "minor diameter"),
        pitch=_length(args.pitch, "pitch"),
        tpi=None if args.tpi is None else parse_number(args.tpi),
        count=_whole(args.count, "--count"), length=_length(args.length, "length"),
        counted=args.counted,
        angle=None if args.angle is None else parse_number(args.angle),
        wires=wires, kind=args.kind, limit=limit if limit is not None else 8,
        crest_flat=None if args.crest_flat is None else parse_length(args.crest_flat, "mm"),
        taper=_taper(args.taper))
    if args.json:
        emit_json(identification_dict(result))
        return 0
    for i, c in enumerate(result.candidates, 1):
        print(f"{i}. {c.designation:<14} score {c.score:.3f}  {c.why}")
    if result.note:
        print(f"note: {result.note}")
    if result.ambiguous:
        print("Close candidates; to tell them apart:")
        for t in result.to_tell_apart:
            print(f"  {' / '.join(t.between)}: {t.measure}: {t.how}")
    return 0
