"""Importing any module of the installed package changes no process-wide state: not the
matplotlib backend or its settings, not the umask, the working directory, ``sys.path``, the
environment, numpy's error handling, signal handlers or logging, and writes no file."""

import json
import os
import subprocess
import sys
import tomllib
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]

# Run in a fresh interpreter with `-P`, so that neither the repository root nor the working
# directory shadows the installed package; the backend is set to a non-default one first.
PROBE = r"""
import importlib, json, logging, os, pkgutil, signal, sys

os.umask(0o027)
import matplotlib
import numpy as np


def state():
    umask = os.umask(0o027)
    os.umask(umask)
    return {
        "backend": matplotlib.get_backend(),
        "rc": {k: repr(v) for k, v in matplotlib.rcParams.items()},
        "umask": umask,
        "cwd": os.getcwd(),
        "sys.path": list(sys.path),
        "environ": dict(os.environ),
        "numpy errors": np.geterr(),
        "numpy print": repr(sorted(np.get_printoptions().items())),
        "signals": {s: repr(signal.getsignal(getattr(signal, s))) for s in ("SIGINT", "SIGTERM")},
        "hooks": [repr(sys.excepthook), repr(sys.displayhook)],
        "logging": [repr(logging.root.handlers), logging.root.level],
        "pyplot imported": "matplotlib.pyplot" in sys.modules,
    }


before = state()
names = set()
for package in json.loads(sys.argv[1]):
    names.add(package)
    found = pkgutil.walk_packages(importlib.import_module(package).__path__, package + ".")
    names.update(m.name for m in found)
names = sorted(n for n in names if n.rsplit(".", 1)[-1] != "__main__")
for name in names:
    importlib.import_module(name)
print(json.dumps({"modules": names, "before": before, "after": state()}))
"""


def packages():
    """Every package the distribution installs (pyproject's explicit list); each is walked for
    its modules, so that an editable install's mapped stage folders are found too."""
    data = tomllib.loads((ROOT / "pyproject.toml").read_text())
    return data["tool"]["setuptools"]["packages"]


def test_importing_every_module_changes_no_process_wide_state(tmp_path):
    env = {**os.environ, "MPLBACKEND": "svg"}
    out = subprocess.run(
        [sys.executable, "-P", "-c", PROBE, json.dumps(packages())],
        capture_output=True,
        text=True,
        env=env,
        cwd=tmp_path,
        timeout=300,
    )
    assert out.returncode == 0, out.stderr
    report = json.loads(out.stdout)
    modules = set(report["modules"])
    # the walk reached every layer: application, output, viz and the physics stages
    for name in (
        "rallyarc.batch",
        "rallyarc.output.export",
        "rallyarc.viz.drill_sheet",
        "rallyarc.viz.plots",
        "rallyarc.viz.scene",
        "rallyarc.impact.contact",
        "rallyarc.flight.integrate",
        "rallyarc.bounce.contact",
    ):
        assert name in modules, name
    assert any(n == "rallyarc.cli" or n.startswith("rallyarc.cli.") for n in modules)
    before, after = report["before"], report["after"]
    assert before["backend"] == "svg"
    changed_rc = sorted(k for k in before["rc"] if before["rc"][k] != after["rc"].get(k))
    assert not changed_rc, changed_rc
    for key in before:
        if key != "rc":
            assert after[key] == before[key], key
    assert not list(tmp_path.iterdir())  # nothing written to the working directory
