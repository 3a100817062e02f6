"""Make ``robust_helpers`` importable from the robustness tests."""

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
