"""What-if comparison on common random numbers: a variant against itself differs by exactly
nothing, and the interval of a difference shrinks as the rallies grow (no published reference:
the paired-difference interval's definition is the check)."""

import json

from rallyarc.rally import load_patterns
from rallyarc.rally.whatif import INDICATORS, compare, comparison_lines


def test_the_base_against_itself_differs_by_nothing(write_patterns, pattern_text):
    base = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    out = compare([base, base], n=30, seed=3, labels=["base", "same"])
    for k in INDICATORS:
        d = out["variants"][1]["difference_from_base"][k]
        assert d["difference"] == 0.0 and d["low"] == 0.0 and d["high"] == 0.0
    json.dumps(out)


def test_difference_intervals_shrink_as_rallies_grow(write_patterns, pattern_text):
    base = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.4), zone=True), "a.toml"))
    wild = load_patterns(write_patterns(pattern_text((6.0, 2.5, 5.0, 1.2), zone=True), "b.toml"))
    widths = []
    for n in (40, 160):
        out = compare([base, wild], n=n, seed=7, max_shots=6, labels=["base", "wild"])
        d = out["variants"][1]["difference_from_base"]["near_wins"]
        assert d["low"] <= d["difference"] <= d["high"]
        widths.append(d["high"] - d["low"])
        lines = comparison_lines(out)
        assert any("near wins" in line for line in lines)
    assert widths[1] < widths[0]


def test_scout_compare_cli_writes_json_and_figure(write_patterns, pattern_text, tmp_path):
    from click.testing import CliRunner

    from rallyarc.cli import main

    a = write_patterns(pattern_text((3.0, 1.0, 2.0, 0.4), zone=True, max_shots=4), "a.toml")
    b = write_patterns(pattern_text((6.0, 2.5, 5.0, 1.2), zone=True, max_shots=4), "b.toml")
    out = tmp_path / "cmp"
    args = ["scout", "compare", a, b, "--rallies", "12", "--workers", "1", "--out", str(out)]
    res = CliRunner().invoke(main, args)
    assert res.exit_code == 0, res.output
    assert "near wins" in res.output
    assert (out / "comparison.png").stat().st_size > 10_000
    data = json.loads((out / "comparison.json").read_text())
    assert data["rallies"] == 12 and len(data["variants"]) == 2
    res = CliRunner().invoke(main, ["scout", "compare", a, b, "--rallies", "0"])
    assert res.exit_code == 2 and len(res.output.strip().splitlines()) == 1


def test_scout_compare_plays_every_variant_in_the_modes_given(write_patterns, pattern_text):
    from click.testing import CliRunner

    from rallyarc.cli import main

    a = write_patterns(pattern_text((3.0, 1.0, 2.0, 0.4), zone=True, max_shots=4), "a.toml")
    args = ["scout", "compare", a, a, "--rallies", "12", "--workers", "1", "--json"]
    default = json.loads(CliRunner().invoke(main, args).output)
    res = CliRunner().invoke(main, [*args, "--rigid-ball"])
    assert res.exit_code == 0, res.output
    rigid = json.loads(res.output)
    assert default["modes"] == [] and rigid["modes"] == ["rigid ball at the bounce"]
    # the base against itself still differs by nothing in the other mode
    for d in rigid["variants"][1]["difference_from_base"].values():
        assert d["difference"] in (0.0, None)
