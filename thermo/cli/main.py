"""`brakeheat` entry point."""
import sys


def main(argv=None) -> int:
    print("brakeheat: not yet wired", file=sys.stderr)
    return 2
