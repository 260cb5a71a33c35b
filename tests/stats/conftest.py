"""Let the statistics tests import their shared helpers module (pytest runs with
--import-mode=importlib, which does not put test folders on sys.path)."""

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
