"""Exceptions raised by the core. Every message tells the user what to do next."""

from __future__ import annotations


class ShoptermError(Exception):
    """Base of every error the core raises on purpose; its message is shown to the user as is."""


class InvalidEntry(ShoptermError, ValueError):
    """Something typed cannot be read as what the field expects."""


class UnknownThread(ShoptermError, LookupError):
    """A designation that names no thread in the catalogue.

    ``suggestions`` holds the nearest valid designations (may be empty).
    """

    def __init__(self, message: str, suggestions: tuple[str, ...] = ()):
        if suggestions:
            message = f"{message} Did you mean: {', '.join(suggestions)}?"
        super().__init__(message)
        self.suggestions = tuple(suggestions)


class UnsupportedClass(UnknownThread):
    """A tolerance class that the standard's tables do not give for this thread."""


class ConfigError(ShoptermError):
    """A config or theme file that cannot be used; names the file, key and line."""

    def __init__(self, message: str, *, path: str | None = None, key: str | None = None,
                 line: int | None = None):
        where = []
        if path:
            where.append(str(path))
        if line is not None:
            where.append(f"line {line}")
        if key:
            where.append(f"key '{key}'")
        prefix = (", ".join(where) + ": ") if where else ""
        super().__init__(prefix + message)
        self.path, self.key, self.line = path, key, line
