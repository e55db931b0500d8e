"""The summary of a rally run: every count adds up to the shot table (conservation-type
checks; no published reference)."""

import json

from rallyarc.rally import (
    ENDINGS,
    load_patterns,
    play_rallies,
    summarize,
)


def test_summary_totals_add_up_to_the_shot_table(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    run = play_rallies(pat, n=40, seed=2, max_shots=5)
    s = summarize(run)
    shots = run.shots
    assert sum(s["points"].values()) + s["unfinished"] == run.n
    assert sum(s["endings"].values()) == run.n
    assert set(s["endings"]) == set(ENDINGS)
    assert sum(r["shots"] for r in s["by_shot_type"]) == len(shots) == s["shots"]
    errors = shots["result"].isin(["forced_error", "unforced_error", "fault", "double_fault"]).sum()
    assert sum(r["errors"] for r in s["by_shot_type"]) == errors
    for r in s["by_shot_type"]:
        assert sum(r[o] for o in ("in", "net", "long", "wide", "out", "miss")) == r["shots"]
    assert run.rallies["shots"].sum() == len(shots)
    assert (shots.groupby("rally")["shot"].max() <= 5).all()
    assert (run.rallies["ending"] != "").all()
    # each rally ends exactly once, on its last row
    last = shots.groupby("rally").tail(1)
    assert not last["result"].isin(["continues", "fault"]).any()
    assert (
        shots.groupby("rally")["result"]
        .apply(lambda r: (~r.isin(["continues", "fault"])).sum())
        .eq(1)
        .all()
    )
    for name in s["players"]:
        h = s["contact_height"][name]
        hist = h["histogram"]
        assert sum(hist["counts"]) + hist["below"] + hist["above"] == h["contacts"]
        rally_balls = shots[(shots["player"] == name) & (shots["serve"] == "")]
        assert h["contacts"] == len(rally_balls)
        assert h["above_shoulder"] == int(
            (rally_balls["contact_height_m"] > s["players"][name]["shoulder_height_m"]).sum()
        )
        d = s["depth"][name]
        assert sum(d["zones"].values()) == d["landed"]
        assert sum(s["width"][name]["zones"].values()) == d["landed"]
    json.dumps(s)  # JSON-ready
