"""Shared fixtures of the core tests."""

import pytest

from shopterm import standards


@pytest.fixture
def registry():
    """The thread-standards registry, every family in it (a family that fails to load fails)."""
    return standards
