"""The demo match against published club-level match statistics.

One seeded run of 1,500 rallies (the size the demo was calibrated on); each statistic's
estimate must lie inside its range, and a fixed seed keeps it repeatable.

Ranges and their sources:

- first serves in 50-60 %, second serves in 80-90 %, double faults 5-8 % of service points,
  points ending in winners (aces included) 10-20 %: common practice, from memory, for club
  singles. Double faults agree with about 5.6 per 100 points among 3.5/4.0 recreational women
  (https://www.nextlevelstats.coach/post/pt-2-what-happens-at-different-levels-of-the-
  competitive-ladder-and-how-a-player-s-skills-sha).
- aces at most 18 % of service points: unreturned serves (aces, service winners and return
  errors) are about 1.1 per service game at recreational 3.5/4.0 (same series, parts 2 and 4),
  and a game has about 6 points (common practice); aces are a part of them.
- errors (forced, unforced, double faults) 80-90 % of points: the complement of the winners'
  range; unforced errors not fewer than forced at club level (common practice).
- rally length: about half of recreational 3.5/4.0 points end within three strokes (double
  fault 0; same series, part 3; tolerance +/-10 points, common practice), and 0-4 strokes is
  the most common band at every level, at least half of all points
  (https://www.tennisanalytics.net/stat-of-the-week-march-16-2022/stat-of-the-week/
  tennisanalytic/2022/03/16/08/01/05/5457/).
- the flat hitter's drives carry modest topspin, above 0 and below 1,500 rpm (common practice,
  from memory: flat drives about 500-1,500 rpm against 2,500-3,500 for heavy topspin).
"""

import pytest

from rallyarc.rally import load_patterns, play_rallies, summarize
from rallyarc.rally.stats import share


@pytest.fixture(scope="module")
def demo():
    run = play_rallies(load_patterns("demo_match"), n=1500, seed=1)
    return run, summarize(run)


def inside(s, lo, hi):
    return lo <= s["share"] <= hi


def test_serve_statistics_are_club_level(demo):
    _, s = demo
    for name, p in s["statistics"]["players"].items():
        assert inside(p["first_serve_in"], 0.50, 0.60), name
        assert inside(p["second_serve_in"], 0.80, 0.90), name
        assert inside(p["double_faults_per_service_point"], 0.05, 0.08), name
        assert p["aces_per_service_point"]["share"] > 0
        assert inside(p["aces_per_service_point"], 0.0, 0.18), name


def test_point_endings_are_club_level(demo):
    run, s = demo
    ends = s["statistics"]["points_ending_in"]
    assert inside(ends["winners"], 0.10, 0.20)
    errors = sum(ends[k]["count"] for k in ("forced_errors", "unforced_errors", "double_faults"))
    assert inside(share(errors, ends["winners"]["of"]), 0.80, 0.90)
    # unforced errors not fewer than forced, within the unforced share's interval
    assert ends["unforced_errors"]["high"] >= ends["forced_errors"]["share"]
    assert s["endings"]["winner"] > 0  # rally winners, not only aces


def test_rally_length_is_club_level(demo):
    _, s = demo
    length = s["statistics"]["rally_length_strokes"]
    assert inside(length["0-3"], 0.40, 0.60)
    assert length["0-4"]["share"] >= 0.5


def test_the_flat_hitter_carries_modest_topspin_and_is_pushed_up(demo):
    run, s = demo
    far, near = (p.name for p in reversed(run.patterns.players))
    out = s["spin_exchange"]["players"][far]["outgoing_topspin_rpm"]["mean"]
    assert 0.0 < out < 1500.0
    band = s["players"][far]["preferred_contact_height_m"]
    high_ball = [
        r
        for r in s["against"]
        if r["player"] == far and r["replying_to"] == "high ball to the backhand"
    ]
    assert high_ball and high_ball[0]["contact_height_median_m"] > sum(band) / 2
    h = s["contact_height"]
    assert h[far]["above_shoulder_share"] > h[near]["above_shoulder_share"]
