"""Pattern files: the demo pair loads with its shoulder heights stated, and a bad file gives
one line naming the file and the key."""

import pytest

from rallyarc.errors import InputError
from rallyarc.rally import (
    load_patterns,
)


def test_demo_patterns_load_with_shoulder_heights_stated():
    pat = load_patterns("demo_match")
    for p in pat.players:
        assert 0.7 * p.height < p.shoulder_height < 0.9 * p.height
        assert "common practice" in p.shoulder_source or "given" in p.shoulder_source


@pytest.mark.parametrize(
    ("old", "new", "words"),
    [
        ('timing = "drop"', 'timing = "late"', ["near.timing", "rise, apex, drop"]),
        ("target_x_m = [9.0, 9.0]", "target_x_m = [9.0, 8.0]", ["target_x_m", "low end first"]),
        ("reach_m = 1.6", "reach_m = 9.0", ["reach_m", "0.3 to 3"]),
        ("reach_m = 1.6", "reach_mm = 1.6", ["unknown key", "near.reach_mm"]),
        ('stroke = "topspin_drive"', 'stroke = "kick_serve"', ["shots[1].stroke", "groundstroke"]),
        ('stroke = "topspin_drive"', 'stroke = "no_such"', ["shots[1].stroke", "unknown stroke"]),
    ],
)
def test_bad_pattern_files_give_one_line_naming_file_and_key(
    write_patterns, old, new, words, pattern_text
):
    text = pattern_text().replace(old, new, 1)
    path = write_patterns(text)
    with pytest.raises(InputError) as exc:
        load_patterns(path)
    msg = str(exc.value)
    assert "\n" not in msg and path in msg
    for w in words:
        assert w in msg


def test_a_repertoire_needs_a_shot_without_conditions(write_patterns, pattern_text):
    text = pattern_text().replace(
        'direction = "crosscourt"\n', 'direction = "crosscourt"\nwhen_height_above_m = 1.0\n'
    )
    with pytest.raises(InputError, match="without a 'when_' condition"):
        load_patterns(write_patterns(text))
