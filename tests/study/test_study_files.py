"""Bad study files and options: one line naming the file or option, key and range, exit 2."""

from __future__ import annotations

import pytest
from click.testing import CliRunner

from rallyarc.cli import main
from rallyarc.errors import InputError
from rallyarc.study import load_study


@pytest.mark.parametrize(
    ("change", "words"),
    [
        (('name = "head_speed"', 'name = "wingspan"'), ["parameters[1].name", "head_speed"]),
        (("high = 140.0", "high = 400.0"), ["parameters[1].high", "from 20 to 220"]),
        (("steps = 4", "steps = 0"), ["parameters[1].steps", "from 1 to 10000"]),
        (('design = "grid"', 'design = "sobol"'), ["'design'", "grid, random, latin"]),
        (("seed = 5", "seed = -1"), ["'seed'", "whole number"]),
        (('stroke = "topspin_drive"', 'stroke = "tweener"'), ["'stroke'", "tweener"]),
        (("chunk = 3", "chunk = 3\nrallies = 10"), ["'rallies'", "rallies study"]),
        (("chunk = 3", "chunk = 3\nbogus = 1"), ["unknown key 'bogus'"]),
        (("low = 0.0", "low = 4000.0"), ["parameters[2].low", "must not exceed"]),
    ],
)
def test_bad_study_files_are_one_line_errors(study_file, shots_text, change, words):
    path = study_file(shots_text().replace(*change))
    with pytest.raises(InputError) as info:
        load_study(path)
    message = str(info.value)
    assert "\n" not in message and str(path) in message
    for word in words:
        assert word in message


def test_sampled_designs_need_samples_and_latin_has_a_limit(study_file, shots_text):
    with pytest.raises(InputError, match="missing key 'samples'"):
        load_study(study_file(shots_text("random")))
    with pytest.raises(InputError, match="from 1 to 1000000 for the latin design"):
        load_study(study_file(shots_text("latin", 3, "samples = 2000000")))
    with pytest.raises(InputError, match="'samples' is for the random and latin"):
        load_study(study_file(shots_text("grid", 3, "samples = 5")))


def test_a_serve_study_cannot_vary_the_incoming_ball(study_file, shots_text):
    text = shots_text().replace('"topspin_drive"', '"flat_serve"')
    with pytest.raises(InputError, match="a serve meets its own toss"):
        load_study(study_file(text))


def _cli(args):
    return CliRunner().invoke(main, args)


def test_the_command_line_refuses_bad_input_in_one_line(study_file, shots_text, tmp_path):
    path = study_file(shots_text().replace("steps = 3", "steps = -2"))
    res = _cli(["study", "run", str(path), "--out", str(tmp_path / "o")])
    assert res.exit_code == 2 and "parameters[2].steps" in res.output
    good = study_file(shots_text(), "good.toml")
    res = _cli(["study", "run", str(good), "--out", str(tmp_path / "o"), "--scheduler", "nowhere"])
    assert res.exit_code == 2 and "--scheduler" in res.output
    res = _cli(["study", "run", str(good), "--out", str(tmp_path / "o"), "--workers", "0"])
    assert res.exit_code == 2 and "--workers" in res.output
    res = _cli(["study", "summary", str(tmp_path)])
    assert res.exit_code == 2 and "not a study dataset" in res.output


def test_run_resume_refusal_and_summary_from_the_command_line(study_file, shots_text, tmp_path):
    good = study_file(shots_text(), "good.toml")
    out = tmp_path / "o"
    res = _cli(["study", "run", str(good), "--out", str(out), "--workers", "1", "--quiet"])
    assert res.exit_code == 0, res.output
    assert "4 chunks played, 0 already done" in res.output
    res = _cli(["study", "run", str(good), "--out", str(out), "--workers", "1"])
    assert "0 chunks played, 4 already done" in res.output
    other = study_file(shots_text().replace("seed = 5", "seed = 6"), "other.toml")
    res = _cli(["study", "run", str(other), "--out", str(out), "--workers", "1"])
    assert res.exit_code == 2 and "--force" in res.output and "another study" in res.output
    (tmp_path / "mine.txt").write_text("a user's file")
    res = _cli(["study", "run", str(good), "--out", str(tmp_path), "--workers", "1"])
    assert res.exit_code == 2 and "other files" in res.output
    res = _cli(["study", "summary", str(out), "--json", "--figure", str(tmp_path / "fx.png")])
    assert res.exit_code == 0, res.output
    assert "NaN" not in res.output and (tmp_path / "fx.png").stat().st_size > 0
    res = _cli(["study", "summary", str(out), "--figure", str(tmp_path / "fx.png")])
    assert res.exit_code == 2 and "--force" in res.output


def test_a_study_plays_every_point_in_the_modes_its_file_names(
    study_file, shots_text, rallies_text
):
    plain = load_study(study_file(shots_text(), "plain.toml"))
    rigid = load_study(
        study_file(shots_text().replace("seed = 5", "seed = 5\ndeforming_ball = false"), "r.toml")
    )
    assert plain.modes == () and plain.base[1].deforming_ball
    assert rigid.modes == ("rigid ball at the bounce",) and not rigid.base[1].deforming_ball
    assert rigid.fingerprint != plain.fingerprint  # a stored dataset is never resumed across modes
    rallies = load_study(
        study_file(rallies_text.replace("seed = 3", "seed = 3\nfriction_only = true"), "f.toml")
    )
    assert rallies.modes == ("friction alone at the racket",)
    assert all(p.conditions.friction_only for p in rallies.base[0].players)
    bad = study_file(shots_text().replace("seed = 5", "seed = 5\nfriction_only = 1"), "b.toml")
    with pytest.raises(InputError, match="friction_only"):
        load_study(bad)
