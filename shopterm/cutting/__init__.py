"""The cut: tool tip, infeed and pass plans, three-wire measurement, remaining feed on the dials.

``wires`` — measurement over three wires (both ways, lead-angle corrected and exact), wire sizes,
readings. ``remaining`` — from a reading to what to feed on this lathe's dials.
"""
