"""Basic thread forms: the flank angle and the profile's proportions, as multiples of the pitch.

References: ISO 68-1 (60° basic profile); ASME B1.1 (Unified, same basic profile);
BS 84 (Whitworth form, 55°); BS 93 (BA form, 47.5°); ISO 2901 (trapezoidal, 30°);
ASME B1.5 (Acme, 29°); ASME B1.8 (stub Acme, 29°, from memory); square thread (no standard);
ASME B1.20.1 (NPT, 60°, h = 0.8p). Factors as printed in those standards.
"""

from __future__ import annotations

import math
from dataclasses import dataclass


@dataclass(frozen=True)
class ThreadForm:
    """A symmetric thread profile. All proportions are multiples of the pitch P.

    ``crest_trunc`` is the distance from the sharp-V apex at the external crest down to the
    basic major diameter line; ``root_trunc`` the distance from the sharp-V root up to the basic
    minor diameter line (the internal crest). ``crest_radius``/``root_radius`` are the basic
    rounding radii for rounded forms (0 for flat-crested forms: the power-screw forms).
    The crest flat of the basic profile is 2·crest_trunc·tan(angle/2)·P (0.366P trapezoidal,
    0.3707P Acme, 0.4224P stub Acme); the square form has angle 0 and flats of P/2.
    """

    key: str
    name: str
    angle_deg: float
    height: float            # H / P, sharp-V height
    crest_trunc: float       # / P
    root_trunc: float        # / P
    crest_radius: float = 0.0  # / P
    root_radius: float = 0.0   # / P

    @property
    def half_angle_rad(self) -> float:
        """Return half the included angle [rad]."""
        return math.radians(self.angle_deg / 2)

    @property
    def depth(self) -> float:
        """Return the basic depth of engagement h / P (major to basic minor, on radius)."""
        return self.height - self.crest_trunc - self.root_trunc

    @property
    def pd_offset(self) -> float:
        """Return (d − d2) / P: how far the basic pitch diameter lies under the basic major.

        The pitch line is H/2 below the sharp-V apex, so d − d2 = H − 2·crest_trunc.
        """
        return self.height - 2 * self.crest_trunc

    @property
    def minor_offset(self) -> float:
        """Return (d − D1) / P: basic major minus basic minor diameter, over the pitch."""
        return 2 * self.depth


def _sharp_height(angle_deg: float) -> float:
    return 0.5 / math.tan(math.radians(angle_deg / 2))


_H60 = _sharp_height(60.0)      # 0.866025 (ISO 68-1)
_H55 = _sharp_height(55.0)      # 0.960491 (BS 84)
_H475 = _sharp_height(47.5)     # 1.136337 (BS 93)

#: ISO 68-1 basic profile: crest truncation H/8, root truncation H/4.
ISO_60 = ThreadForm("iso60", "ISO metric 60°", 60.0, _H60, _H60 / 8, _H60 / 4)
#: ASME B1.1 Unified basic profile: identical proportions to ISO 68-1.
UNIFIED_60 = ThreadForm("unified60", "Unified 60°", 60.0, _H60, _H60 / 8, _H60 / 4)
#: BS 84 Whitworth form: H/6 rounded off at crest and root, radius 0.137329P.
WHITWORTH_55 = ThreadForm("whitworth55", "Whitworth 55°", 55.0, _H55, _H55 / 6, _H55 / 6,
                          0.137329, 0.137329)
#: BS 93 BA form: depth 0.6P, equal rounded truncations, radius 0.180835P.
BA_47_5 = ThreadForm("ba47.5", "BA 47.5°", 47.5, _H475, (_H475 - 0.6) / 2, (_H475 - 0.6) / 2,
                     0.180835, 0.180835)
#: ISO 2901 trapezoidal basic profile (30°): crest flat 0.366P, depth 0.5P.
TRAPEZOIDAL_30 = ThreadForm("trap30", "Trapezoidal 30°", 30.0, 1.866025, (1.866025 - 0.5) / 2,
                            (1.866025 - 0.5) / 2)
#: ASME B1.5 general-purpose Acme (29°): basic depth 0.5P.
ACME_29 = ThreadForm("acme29", "Acme 29°", 29.0, _sharp_height(29.0),
                     (_sharp_height(29.0) - 0.5) / 2, (_sharp_height(29.0) - 0.5) / 2)

#: ASME B1.20.1 NPT: 60°, flat crest and root, basic height h = 0.800p (equal truncations).
NPT_60 = ThreadForm("npt60", "NPT 60°", 60.0, _H60, (_H60 - 0.8) / 2, (_H60 - 0.8) / 2)

#: ASME B1.8 stub Acme (29°): basic depth 0.3P, so crest and root flats 0.4224P.
STUB_ACME_29 = ThreadForm("stubacme29", "Stub Acme 29°", 29.0, _sharp_height(29.0),
                          (_sharp_height(29.0) - 0.3) / 2, (_sharp_height(29.0) - 0.3) / 2)
#: Square thread (no standard): straight flanks, depth 0.5P, pitch line at half depth.
#: There is no sharp-V apex, so ``height`` is the depth itself and both truncations are 0.
SQUARE_0 = ThreadForm("square0", "Square", 0.0, 0.5, 0.0, 0.0)  # common practice, no source

#: Every flanked form by key. SQUARE_0 is left out: it has no flank angle, so nothing that works
#: from one (three wires, compound infeed) applies to it.
FORMS: dict[str, ThreadForm] = {f.key: f for f in
                                (ISO_60, UNIFIED_60, WHITWORTH_55, BA_47_5, TRAPEZOIDAL_30, ACME_29,
                                 STUB_ACME_29, NPT_60)}


def form_for_angle(angle_deg: float) -> ThreadForm:
    """Return the basic form with this included angle (60 → ISO, 55, 47.5, 30, 29)."""
    for f in (ISO_60, WHITWORTH_55, BA_47_5, TRAPEZOIDAL_30, ACME_29):
        if abs(f.angle_deg - angle_deg) < 1e-9:
            return f
    from shopterm.errors import InvalidEntry
    raise InvalidEntry(f"No thread form with a {angle_deg:g}° included angle: use 60, 55, 47.5, "
                       "30 or 29.")
