"""Test-wide settings.

- The tests run against the installed package. ``python -m pytest`` puts the working directory
  (the repository root) first on ``sys.path``, where the source folder ``rallyarc/`` would
  shadow the installed ``rallyarc`` and lack the stage packages that the install maps into it
  (``rallyarc.impact``, ``rallyarc.flight``, ...). The root is dropped here, before any test
  imports the package; an editable install still resolves to the working tree through its own
  import hook.
- hypothesis runs derandomized so that every run checks the same cases.
"""

import os
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path[:] = [p for p in sys.path if Path(p or os.getcwd()).resolve() != ROOT]

from hypothesis import settings  # noqa: E402

settings.register_profile("rallyarc", derandomize=True, deadline=None)
settings.load_profile("rallyarc")
