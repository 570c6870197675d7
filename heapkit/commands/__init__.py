"""The command line's subcommands, one module each (wired up in ``heapkit.__main__``)."""
