"""One module per subcommand, each with ``add_parser(subparsers)`` and
``run(args, stdout, stderr) -> int``.  Keep imports here light: heavy
libraries load inside ``run``."""
