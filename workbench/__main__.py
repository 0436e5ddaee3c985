"""``python -m workbench``: the workbench command line."""

import sys

from .cli import main

sys.exit(main())
