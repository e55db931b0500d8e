"""The physics package `impact` stays pure: it imports none of the application or plot layers."""

import json
import subprocess
import sys
from pathlib import Path

FORBIDDEN = ("rallyarc", "flight", "bounce", "viz", "click", "matplotlib", "pyvista")
ROOT = Path(__file__).resolve().parents[2]


def test_impact_imports_no_application_or_plot_packages():
    code = (
        "import json, sys, impact, impact.racket, impact.contact, impact.geometry; "
        "print(json.dumps(sorted({name.split('.')[0] for name in sys.modules})))"
    )
    out = subprocess.run(
        [sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True
    )
    loaded = set(json.loads(out.stdout))
    assert "impact" in loaded and "numpy" in loaded
    assert loaded.isdisjoint(FORBIDDEN), sorted(loaded.intersection(FORBIDDEN))
