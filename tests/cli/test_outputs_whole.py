"""Outputs as a whole: a folder is replaced at once (never a mix of old and new files), the
user's other files in it are kept, SIGTERM stops a run like Ctrl-C with nothing left behind,
JSON is strict, and directions are normalised by one guarded helper."""

import json
import os
import signal
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from rallyarc import kinematics
from rallyarc.output import export
from rallyarc.output.jsonsafe import dumps


def test_a_folder_is_replaced_as_a_whole_and_keeps_the_users_other_files(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / "a.txt").write_text("old a")
    (out / "b.txt").write_text("old b")
    (out / "notes.txt").write_text("mine")

    def write(folder):
        return [export.write_text(folder / n, f"new {n[0]}") for n in ("a.txt", "b.txt")]

    written = export.write_folder(out, write)
    assert written == [out / "a.txt", out / "b.txt"]
    assert (out / "a.txt").read_text() == "new a" and (out / "b.txt").read_text() == "new b"
    assert (out / "notes.txt").read_text() == "mine"
    assert sorted(os.listdir(tmp_path)) == ["out"]  # no staging or old folder left


def test_a_run_interrupted_half_way_leaves_the_old_folder_untouched(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    for n in ("a.txt", "b.txt"):
        (out / n).write_text(f"old {n[0]}")

    def write(folder):
        export.write_text(folder / "a.txt", "new a")
        raise KeyboardInterrupt  # Ctrl-C (or SIGTERM) between the two files

    with pytest.raises(KeyboardInterrupt):
        export.write_folder(out, write)
    assert (out / "a.txt").read_text() == "old a" and (out / "b.txt").read_text() == "old b"
    assert sorted(os.listdir(tmp_path)) == ["out"]


def test_a_new_folder_appears_only_when_complete(tmp_path):
    out = tmp_path / "deep" / "out"

    def write(folder):
        assert not out.exists()
        return [export.write_text(folder / "a.txt", "a")]

    export.write_folder(out, write)
    assert (out / "a.txt").read_text() == "a"


def test_sigterm_stops_a_command_like_ctrl_c_and_leaves_no_part_file(tmp_path):
    code = (
        "import sys, time\n"
        "from rallyarc.output import export\n"
        "from rallyarc.cli import main\n"
        "import click\n"
        "@main.command('slow-write')\n"
        "def slow_write():\n"
        "    def write(tmp):\n"
        "        open(tmp, 'w').write('half')\n"
        "        print('writing', flush=True)\n"
        "        time.sleep(30)\n"
        f"    export.atomic_write({str(tmp_path / 'x.txt')!r}, write)\n"
        "main(['slow-write'])\n"
    )
    # -P: the installed package, not the repository's source folder on the working directory
    proc = subprocess.Popen(
        [sys.executable, "-P", "-c", code],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    try:
        assert proc.stdout.readline().strip() == "writing", proc.stderr.read()
        proc.send_signal(signal.SIGTERM)
        _, err = proc.communicate(timeout=30)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.communicate()
    assert proc.returncode == 143
    assert err.strip() == "rallyarc: terminated"
    assert os.listdir(tmp_path) == []


def test_the_sigterm_handler_is_put_back_after_a_command():
    from click.testing import CliRunner

    from rallyarc.cli import main

    before = signal.getsignal(signal.SIGTERM)
    CliRunner().invoke(main, ["presets", "air"])
    assert signal.getsignal(signal.SIGTERM) is before


def test_strict_json_has_no_nan_or_infinity():
    text = dumps({"a": float("nan"), "b": [float("inf"), np.float64(1.5)], "c": (1, 2)})
    assert json.loads(text) == {"a": None, "b": [None, 1.5], "c": [1, 2]}


def test_aim_stroke_json_is_strict_when_the_target_is_out_of_reach():
    from click.testing import CliRunner

    from rallyarc.cli import main

    result = CliRunner().invoke(
        main, ["aim", "stroke", "--target", "0.3,0", "--solve", "speed", "--json"]
    )
    assert result.exit_code in (0, 1)

    def refuse(name):
        raise ValueError(name)

    data = json.loads(result.stdout, parse_constant=refuse)
    if not data["reachable"]:
        assert data["reason"]  # a missing value comes with its reason
    text = CliRunner().invoke(main, ["aim", "stroke", "--target", "0.3,0", "--solve", "speed"])
    assert "nan" not in text.stdout.lower().replace("n/a", "")


@pytest.mark.parametrize(
    "vector, expected",
    [
        ((0.0, 1e-200, 0.0), (0.0, 1.0, 0.0)),
        ((0.0, 0.0, 1e300), (0.0, 0.0, 1.0)),
        ((3.0, 4.0, 0.0), (0.6, 0.8, 0.0)),
        ((-2.0, 0.0, 0.0), (-1.0, 0.0, 0.0)),
    ],
)
def test_the_guarded_normaliser_keeps_a_direction_whatever_its_length(vector, expected):
    unit = kinematics.unit(vector)
    assert unit.shape == (1, 3)
    np.testing.assert_allclose(unit[0], expected, atol=1e-15)


@pytest.mark.parametrize("vector", [(0.0, 0.0, 0.0), (np.nan, 1.0, 0.0), (np.inf, 0.0, 0.0)])
def test_the_guarded_normaliser_refuses_a_vector_without_a_direction(vector):
    with pytest.raises(ValueError, match="spin axis"):
        kinematics.unit(vector, "spin axis")


def test_output_checks_come_before_the_work(tmp_path, monkeypatch):
    from click.testing import CliRunner

    import rallyarc.shot
    from rallyarc.cli import main

    def no_play(*args, **kwargs):
        raise AssertionError("the shots were played before the output path was checked")

    monkeypatch.setattr(rallyarc.shot, "play", no_play)
    (tmp_path / "file").write_text("x")
    result = CliRunner().invoke(main, ["compare", "--out", str(tmp_path / "file" / "sub")])
    assert result.exit_code == 2 and "is a file" in result.stderr, result.output


def test_the_working_folder_is_written_in_place_not_moved(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "notes.txt").write_text("mine")
    written = export.write_folder(".", lambda f: [export.write_text(f / "a.txt", "a")])
    assert [p.name for p in written] == ["a.txt"]
    assert Path.cwd() == tmp_path and (tmp_path / "a.txt").read_text() == "a"
    assert sorted(os.listdir(tmp_path)) == ["a.txt", "notes.txt"]


def test_a_folder_behind_a_link_is_replaced_where_the_link_points(tmp_path):
    real = tmp_path / "real"
    real.mkdir()
    (real / "a.txt").write_text("old")
    (tmp_path / "link").symlink_to(real)
    export.write_folder(tmp_path / "link", lambda f: [export.write_text(f / "a.txt", "new")])
    assert (tmp_path / "link").is_symlink() and (real / "a.txt").read_text() == "new"
    assert sorted(os.listdir(tmp_path)) == ["link", "real"]
