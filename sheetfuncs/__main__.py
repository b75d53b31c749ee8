"""``python -m sheetfuncs``: the command line (see :mod:`sheetfuncs.cli`)."""

from .cli import main

raise SystemExit(main())
