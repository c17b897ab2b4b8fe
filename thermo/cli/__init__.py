"""The command line: the only layer that turns errors into messages and exit codes."""
