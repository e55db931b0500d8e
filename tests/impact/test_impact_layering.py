"""The physics package `impact` stays pure: it imports none of the application or plot layers."""

import json
import subprocess
import sys

FORBIDDEN = ("click", "matplotlib", "pyvista")


def test_impact_imports_no_application_or_plot_packages():
    code = (
        "import json, sys, rallyarc.impact.racket, rallyarc.impact.contact, "
        "rallyarc.impact.geometry; "
        "print(json.dumps(sorted(sys.modules)))"
    )
    out = subprocess.run(
        [sys.executable, "-P", "-c", code], capture_output=True, text=True, check=True
    )
    loaded = set(json.loads(out.stdout))
    assert "rallyarc.impact.contact" in loaded and "numpy" in loaded
    tops = {name.split(".")[0] for name in loaded}
    assert tops.isdisjoint(FORBIDDEN), sorted(tops.intersection(FORBIDDEN))
    # the namespace's own light __init__ is loaded; no application module, no other stage
    ours = {n for n in loaded if n.startswith("rallyarc")}
    assert {n for n in ours if n != "rallyarc" and not n.startswith("rallyarc.impact")} == set()
