"""Shared fixtures of the core tests."""

import pytest

from shopterm import standards


@pytest.fixture
def registry():
    """The thread-standards registry, every family in it (a family that fails to load fails)."""
    return standards



@pytest.fixture
def round_trip(registry):
    """A check: parse a designation, compare hand, kind and starts, and see it written back."""
    def check(text, hand, kind, starts):
        spec = registry.parse(text)
        assert (spec.hand, spec.kind, spec.starts) == (hand, kind, starts)
        assert spec.designation == text
        assert registry.parse(spec.designation) == spec
    return check
