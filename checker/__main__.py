"""``python -m checker``: the same command line as ``claimcheck``."""

from .cli import main

if __name__ == "__main__":
    main()
