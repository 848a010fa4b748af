"""ignite: fire and static-ignition worksheets for operating theatres."""

__version__ = "0.1.0"
