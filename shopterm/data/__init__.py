"""Published tables as CSV, each named after its source; read with ``importlib.resources``."""
