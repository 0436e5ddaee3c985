"""``python -m workbench``: the workbench command line."""

import sys

from .cli import main

if __name__ == "__main__":  # importing the module (pkgutil walks, doc tools) runs nothing
    sys.exit(main())
