"""The README runs as written: every command of its example blocks exits 0 in a temporary folder,
and its Python block runs.

Substitutions, so that the test stays fast: ``--rallies N`` runs 20 rallies; a command that
needs a cluster at a network address (``--scheduler tcp://...``) is left out.
"""

import re
import shlex
from pathlib import Path

import pytest
from click.testing import CliRunner

from rallyarc.cli import main

README = Path(__file__).resolve().parents[1] / "README.md"
BLOCK = re.compile(r"```(sh|python)\n(.*?)```", re.S)


def _blocks(kind):
    return [body for k, body in BLOCK.findall(README.read_text()) if k == kind]


def _commands():
    commands = []
    for body in _blocks("sh"):
        for line in body.splitlines():
            line = line.split("  #")[0].strip()
            if line.startswith("rallyarc ") and "--scheduler tcp://" not in line:
                commands.append(re.sub(r"--rallies \d+", "--rallies 20", line))
    return commands


def test_the_readme_has_examples():
    commands = _commands()
    assert len(commands) > 20
    assert any(c.startswith("rallyarc template my_match.toml") for c in commands)


def test_every_readme_command_exits_0(tmp_path, monkeypatch):
    # in order, in one folder: the rally example plays the pattern file the template wrote
    monkeypatch.chdir(tmp_path)
    failures = []
    for line in _commands():
        result = CliRunner().invoke(main, shlex.split(line)[1:])
        if result.exit_code != 0:
            failures.append(f"{line}: exit {result.exit_code}: {result.output[-300:]}")
    assert not failures, "\n".join(failures)


@pytest.mark.parametrize("block", range(len(_blocks("python"))))
def test_the_readme_python_block_runs(block, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    exec(compile(_blocks("python")[block], "README.md", "exec"), {})
