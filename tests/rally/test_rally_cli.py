"""The ``rallyarc rally`` command: it writes its outputs, refuses to overwrite them, and its
errors are one line."""

import json

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner

from rallyarc.cli import main


def run_cli(*args):
    return CliRunner().invoke(main, list(args))


def test_cli_writes_outputs_and_refuses_to_overwrite(write_patterns, tmp_path, pattern_text):
    path = write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True, max_shots=3))
    out = tmp_path / "out"
    res = run_cli("rally", path, "--rallies", "6", "--seed", "3", "--out", str(out), "--quiet")
    assert res.exit_code == 0, res.output
    for name in ("shots.csv", "shots.parquet", "rallies.csv", "summary.json"):
        assert (out / name).is_file()
    for name in ("landing_heatmaps.png", "contact_heights.png", "spin_exchange.png"):
        assert (out / name).stat().st_size > 10_000
    table = pd.read_parquet(out / "shots.parquet")
    csv = pd.read_csv(out / "shots.csv", dtype=str, keep_default_na=False)
    assert list(csv.columns) == list(table.columns) and len(csv) == len(table)
    for col in table.columns:
        kind = table[col].dtype
        if pd.api.types.is_bool_dtype(kind) or not pd.api.types.is_numeric_dtype(kind):
            assert (csv[col] == table[col].astype(str)).all(), col
        else:
            np.testing.assert_allclose(
                csv[col].replace("", "nan").astype(float),
                table[col].astype(float),
                rtol=1e-12,
                equal_nan=True,
            )
    summary = json.loads((out / "summary.json").read_text())
    assert summary["shots"] == len(table) and summary["rallies"] == 6
    before = (out / "summary.json").read_bytes()
    res = run_cli("rally", path, "--rallies", "6", "--seed", "4", "--out", str(out), "--quiet")
    assert res.exit_code == 2
    assert "exists; add --force" in res.output and "Traceback" not in res.output
    assert (out / "summary.json").read_bytes() == before
    res = run_cli(
        "rally", path, "--rallies", "6", "--seed", "4", "--out", str(out), "--force", "--json"
    )
    assert res.exit_code == 0, res.output
    assert json.loads(res.output)["seed"] == 4


@pytest.mark.parametrize(
    ("args", "words"),
    [
        (["--rallies", "0"], ["--rallies", "1 to 200000"]),
        (["--rallies", "many"], ["--rallies", "whole number"]),
        (["--seed", "-1"], ["--seed", "0 to"]),
        (["--max-shots", "500"], ["--max-shots", "1 to 200"]),
        (["--workers", "0"], ["--workers", "1 to 64"]),
    ],
)
def test_cli_option_errors_are_one_line(args, words):
    res = run_cli("rally", "demo_match", *args)
    assert res.exit_code == 2
    lines = res.output.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("rallyarc: error: ")
    for w in words:
        assert w in lines[0]


def test_cli_bad_pattern_names(tmp_path):
    res = run_cli("rally", "no_such_pattern")
    assert res.exit_code == 2 and "demo_match" in res.output
    res = run_cli("rally", str(tmp_path / "missing.toml"))
    assert res.exit_code == 2 and "no such file" in res.output
    target = tmp_path / "a_file"
    target.write_text("x")
    res = run_cli("rally", "demo_match", "--rallies", "2", "--out", str(target))
    assert res.exit_code == 2 and "is a file" in res.output


def test_cli_plays_the_rallies_in_the_modes_it_is_given():
    # the bounce model and the strings' spring-back reach every shot of the rallies: the same
    # seed gives other shots with --rigid-ball and with --friction-only, and the summary says
    # which modes were played (the default run names none)
    args = ["rally", "demo_match", "--rallies", "40", "--seed", "2", "--quiet", "--json"]
    runs = {}
    for flags in ((), ("--rigid-ball",), ("--friction-only",)):
        res = run_cli(*args, *flags)
        assert res.exit_code == 0, res.output
        runs[flags] = json.loads(res.output)
    default, rigid, friction = runs.values()
    assert default["modes"] == [] and default["bounce_model"] == "deforming ball"
    assert rigid["modes"] == ["rigid ball at the bounce"] and rigid["bounce_model"] == "rigid ball"
    assert friction["modes"] == ["friction alone at the racket"] and friction["friction_only"]
    for other in (rigid, friction):
        assert other["spin_exchange"] != default["spin_exchange"]
    text = run_cli(*args[:-1], "--rigid-ball").output
    assert "; rigid ball at the bounce" in text.splitlines()[0]


def test_with_modes_sets_both_players_conditions():
    from rallyarc.rally import load_patterns, with_modes

    pats = with_modes(load_patterns("demo_match"), friction_only=True, deforming_ball=False)
    for p in pats.players:
        assert p.conditions.friction_only and not p.conditions.deforming_ball
        assert p.conditions.string_tangential_restitution == 0.0
