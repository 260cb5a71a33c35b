"""Let the hardening tests import their helpers (limited.py): pytest runs with
--import-mode=importlib, which does not put test folders on sys.path."""

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
