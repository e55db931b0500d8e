"""Rally patterns: two players' serves and shots played out over many rallies at once.

A pattern file names the two players of a match: where each stands and how far they reach,
the contact heights they like and when they take the ball, their serves and their repertoire
of shots with the probability of each, and how much their execution scatters.
:func:`play_rallies` plays N rallies shot by shot, all live rallies in one batch; each shot is
the project's chain (:func:`rallyarc.shot.simulate`) with a swing solved by
:func:`rallyarc.aim.aim_stroke`, and the receiver meets the ball on its path after the bounce.
:func:`summarize` counts what happened.

Modules, in the order a rally uses them:

- :mod:`.patterns`: pattern files, players and their repertoires (:func:`load_patterns`).
- :mod:`.frames`: the two ends' chain frames and the forehand and backhand sides.
- :mod:`.choice`: which shot a hitter plays, where they aim, how much they scatter.
- :mod:`.meet`: where the receiver meets the ball (:func:`meet`; :mod:`.meet_compiled`, its
  search compiled).
- :mod:`.endings`: the result of a shot and how a rally ends (:data:`ENDINGS`).
- :mod:`.state`: what a block carries between and within rounds.
- :mod:`.warm`: the aim solves' starting points, learned from the block's earlier shots.
- :mod:`.rounds`: the round loop, named steps over a block of rallies.
- :mod:`.table`: the per-shot and per-rally tables, and replaying a row through the chain.
- :mod:`.runner`: blocks with their own random streams, in one process or several
  (:func:`play_rallies`).
- :mod:`.summary`: the summary and its text (:func:`summarize`, :func:`summary_lines`).

Nothing here is new physics: each shot is one call of the project's chain, and the tests in
``tests/rally/`` compare every shot of a rally with that chain run alone.
"""

from rallyarc.rally.choice import scatter_factor, shot_weights
from rallyarc.rally.endings import ENDINGS, ONGOING
from rallyarc.rally.frames import ENDS, contact_side, to_other_end
from rallyarc.rally.meet import APEX_WINDOW_S, PATH_SAMPLES, Contact, meet
from rallyarc.rally.patterns import (
    LOWEST_CONTACT_M,
    REACTION_S,
    SHOULDER_FRACTION,
    Patterns,
    PatternShot,
    Player,
    load_patterns,
    with_modes,
    with_scatter,
)
from rallyarc.rally.runner import BLOCK, RallyRun, play_rallies
from rallyarc.rally.summary import (
    DEPTH_ZONES,
    ERROR_RESULTS,
    HEIGHT_EDGES_M,
    QUANTILES,
    WIDTH_ZONES,
    WINNING_RESULTS,
    summarize,
    summary_lines,
)
from rallyarc.rally.table import incoming_of, swing_of

__all__ = [
    "APEX_WINDOW_S",
    "BLOCK",
    "DEPTH_ZONES",
    "ENDINGS",
    "ENDS",
    "ERROR_RESULTS",
    "HEIGHT_EDGES_M",
    "LOWEST_CONTACT_M",
    "ONGOING",
    "PATH_SAMPLES",
    "QUANTILES",
    "REACTION_S",
    "SHOULDER_FRACTION",
    "WIDTH_ZONES",
    "WINNING_RESULTS",
    "Contact",
    "PatternShot",
    "Patterns",
    "Player",
    "RallyRun",
    "contact_side",
    "incoming_of",
    "load_patterns",
    "meet",
    "play_rallies",
    "scatter_factor",
    "shot_weights",
    "summarize",
    "summary_lines",
    "swing_of",
    "to_other_end",
    "with_modes",
    "with_scatter",
]
