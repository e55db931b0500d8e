"""bounce is pure physics: it imports numpy (scipy if ever), the standard library and itself."""

import ast
import json
import subprocess
import sys
from pathlib import Path

#: Packages bounce must not load. ``rallyarc`` itself is loaded (the namespace's light
#: ``__init__``), but none of its application modules or other stages.
FORBIDDEN = ("click", "matplotlib", "pyvista")
ALLOWED_RALLYARC = ("rallyarc", "rallyarc.bounce")
ROOT = Path(__file__).resolve().parents[2]
PACKAGE_DIR = ROOT / "bounce"
import rallyarc.bounce  # noqa: E402  (the installed package)

INSTALLED_DIR = Path(rallyarc.bounce.__file__).resolve().parent


def test_importing_bounce_loads_none_of_the_forbidden_packages():
    code = (
        "import json, sys\n"
        "import rallyarc.bounce.ball, rallyarc.bounce.contact, rallyarc.bounce.pace\n"
        "print(json.dumps([sys.modules['rallyarc.bounce'].__file__, sorted(sys.modules)]))\n"
    )
    completed = subprocess.run(
        [sys.executable, "-P", "-c", code],
        capture_output=True,
        text=True,
        check=True,
        timeout=60,
    )
    package_file, loaded = json.loads(completed.stdout)
    assert Path(package_file).resolve() == INSTALLED_DIR / "__init__.py"
    assert "numpy" in loaded and "rallyarc.bounce.contact" in loaded
    offending = sorted(name for name in loaded if name.split(".")[0] in FORBIDDEN)
    offending += [
        name
        for name in loaded
        if name.startswith("rallyarc")
        and name not in ALLOWED_RALLYARC
        and not name.startswith("rallyarc.bounce.")
    ]
    assert offending == []


def test_bounce_sources_import_only_numpy_scipy_stdlib_and_themselves():
    allowed = {"numpy", "scipy"} | set(sys.stdlib_module_names)
    sources = sorted(PACKAGE_DIR.glob("*.py"))
    assert {p.name for p in sources} >= {"__init__.py", "ball.py", "contact.py", "pace.py"}
    offending = []
    for path in sources:
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.Import):
                names = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom):
                if node.level:  # relative: within bounce
                    continue
                names = [node.module or ""]
            else:
                continue
            offending += [f"{path.name}: {n}" for n in names if n.split(".")[0] not in allowed]
    assert offending == []
