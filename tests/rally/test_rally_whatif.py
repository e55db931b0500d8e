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
