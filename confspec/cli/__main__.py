"""``python -m confspec.cli``: the same as the ``confspec`` command."""

from __future__ import annotations

import sys

from . import main

__all__: list[str] = []

sys.exit(main())
