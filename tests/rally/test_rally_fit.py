"""Calibration from observations: statistics simulated from a known scatter, fed back as an
observed-statistics file, give back that scatter within the fit's 95 % interval; the fitted
pattern file loads and carries the fit report; bad observed files are one line, exit 2."""

import tomllib
from pathlib import Path

import pytest
from click.testing import CliRunner

from rallyarc import config
from rallyarc.cli import main
from rallyarc.rally import load_patterns, play_rallies
from rallyarc.rally.fit import fit_scatter, fitted_sds, simulated_statistics
from rallyarc.rally.fitfile import fitted_text
from rallyarc.rally.patterns import with_scatter

KNOWN = 1.5
WANT = {"statistics": {"first_serve_in": {}, "rally_ball_errors": {}, "deep_landing": {}}}


def observed_file(path, stats, player="far", extra=""):
    lines = ['name = "charted match"', 'source = "simulated"', f'player = "{player}"']
    lines.append("[statistics]")
    lines += [f"{k} = {{ count = {s['count']}, of = {s['of']} }}" for k, s in stats.items()]
    path.write_text("\n".join(lines) + "\n" + extra, encoding="utf-8")
    return str(path)


@pytest.fixture()
def pair(pattern_text, write_patterns):
    return write_patterns(pattern_text(scatter=(3.0, 1.0, 2.0, 0.5), zone=True))


def test_the_fit_recovers_a_known_scatter(pair, tmp_path):
    """Observed counts from 300 rallies of the pair with the far player's scatter x1.5, fitted
    on 300 other rallies from the pair as written; then the same file through the CLI."""
    truth = play_rallies(with_scatter(load_patterns(pair), KNOWN, ends=("far",)), n=300, seed=1)
    known = observed_file(tmp_path / "observed.toml", simulated_statistics(truth, "far", WANT))
    base = load_patterns(pair)
    obs = config.load_observed(known)
    fit = fit_scatter(base, obs, n=300, seed=2, xatol=0.1, bounds=(0.75, 3.0))
    assert fit["standard_error"] is not None and fit["standard_error"] < 0.3
    assert fit["low"] <= KNOWN <= fit["high"], fit
    assert all(s["overlap"] for s in fit["statistics"].values()), fit["statistics"]
    sds = fitted_sds(base, "far", fit["scatter_factor"])
    text = fitted_text(Path(pair).read_text(), fit, sds, known, pair)
    data = tomllib.loads(text)
    assert data["far"]["scatter"]["aim_m"] == pytest.approx(0.5 * fit["scatter_factor"], 1e-3)
    assert data["near"]["scatter"]["aim_m"] == 0.5
    assert text.startswith("# Fitted by `rallyarc scout fit`")
    assert "first serve in" in text
    cli_writes_a_loadable_file(pair, known, tmp_path)


def test_scatter_of_one_end_only(pair):
    base = load_patterns(pair)
    f = with_scatter(base, 2.0, ends=("far",))
    assert f.players[0].scatter == base.players[0].scatter
    assert f.players[1].scatter["aim"] == pytest.approx(2 * base.players[1].scatter["aim"])


def cli_writes_a_loadable_file(pair, known, tmp_path):
    out = tmp_path / "fitted.toml"
    args = ["scout", "fit", pair, known, "-o", str(out), "--rallies", "40", "--seed", "3"]
    args += ["--tolerance", "0.5"]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    assert "fitted scatter of Bo Test (far)" in result.output
    assert load_patterns(str(out)).players[1].name == "Bo Test"
    again = CliRunner().invoke(main, args)
    assert again.exit_code == 2 and "--out" in again.output


@pytest.mark.parametrize(
    "extra, words",
    [
        ("[statistics.rally_ball_errors]\ncount = 5\nof = 3\n", "must not exceed"),
        ("[statistics.serve_speed]\ncount = 1\nof = 3\n", "unknown key 'statistics.serve_speed'"),
        ('[[shot_types]]\nshot_type = "lob"\ncount = 1\nof = 3\n', "shot type 'lob'"),
    ],
)
def test_bad_observed_files_are_one_line(pair, tmp_path, extra, words):
    path = tmp_path / "bad.toml"
    path.write_text('name = "x"\nsource = "y"\nplayer = "far"\n' + extra, encoding="utf-8")
    out = tmp_path / "fitted.toml"
    result = CliRunner().invoke(main, ["scout", "fit", pair, str(path), "-o", str(out)])
    assert result.exit_code == 2, result.output
    assert words in result.output and len(result.output.strip().splitlines()) == 1
    assert not out.exists()
