"""The command-line package: every command group is registered, ``python -m rallyarc.cli``
runs, and starting the program imports no heavy library a command does not use."""

import json
import subprocess
import sys

from click.testing import CliRunner

from rallyarc.cli import main

COMMANDS = {"aim", "bounce", "compare", "drill", "feed", "plot", "presets", "rally", "report",
            "scene", "scout", "shot", "study", "surface", "template"}  # fmt: skip


def test_every_command_is_registered_and_has_help():
    assert set(main.commands) == COMMANDS
    for name in sorted(COMMANDS):
        result = CliRunner().invoke(main, [name, "--help"])
        assert result.exit_code == 0, result.output
        assert result.output.startswith(f"Usage: main {name}")
    assert set(main.commands["plot"].commands) == {"side", "top", "sweep", "window"}
    assert set(main.commands["aim"].commands) == {"stroke", "feed"}


def test_python_m_runs_the_command():
    proc = subprocess.run(
        [sys.executable, "-P", "-m", "rallyarc.cli", "--help"], capture_output=True, text=True
    )
    assert proc.returncode == 0, proc.stderr
    assert "Commands:" in proc.stdout and "rally" in proc.stdout


def test_help_imports_no_heavy_library():
    probe = (
        "import sys; from rallyarc.cli import main\n"
        "try:\n    main(['--help'])\nexcept SystemExit:\n    pass\n"
        "print(__import__('json').dumps(sorted(m for m in sys.modules if m.split('.')[0] in "
        "('pandas', 'pyarrow', 'matplotlib', 'pyvista'))))"
    )
    proc = subprocess.run([sys.executable, "-P", "-c", probe], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stderr
    assert json.loads(proc.stdout.splitlines()[-1]) == []
