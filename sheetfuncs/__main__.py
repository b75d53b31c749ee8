"""``python -m sheetfuncs``: the command line (see :mod:`sheetfuncs.cli`)."""

from .cli.commands import main

raise SystemExit(main())
