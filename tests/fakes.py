"""Stand-ins shared by the tests."""

import sqlite3


class FailingConnection:
    """Stands in for the store's sqlite3 connection; writes fail while ``error`` is set."""

    def __init__(self, real):
        self.real, self.error = real, None

    def execute(self, sql, *args):
        if self.error and sql.lstrip().upper().startswith(("INSERT", "UPDATE")):
            raise sqlite3.OperationalError(self.error)
        return self.real.execute(sql, *args)

    def __getattr__(self, name):
        return getattr(self.real, name)
