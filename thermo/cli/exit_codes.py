"""The exit codes of `brakeheat` (README, Commands)."""
EXIT_OK, EXIT_INPUT, EXIT_USAGE, EXIT_EXCEEDED = 0, 1, 2, 3
