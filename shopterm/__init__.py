"""shopterm: a terminal workstation for cutting a screw thread on a manual lathe."""

__version__ = "0.1.0"
