"""``python -m groundkit run study.toml [--resume]``."""

import sys

from .cli import main

sys.exit(main())
