"""The command line: thin click commands that map errors to exit codes."""

from ignite.cli.main import main

__all__ = ["main"]
