"""The result of a shot and how a rally ends.

A ball that does not land in ends the rally: an error, or a double fault for a second serve;
a first serve's fault gives a second serve. A ball that lands in flies on after its bounce and
the receiver meets it (:mod:`rallyarc.rally.meet`); when no point of its path is within the
receiver's reach the rally ends with a winner (an ace for a serve). A rally still going after
its longest allowed shot is ``unfinished``.

A rally ball that does not land in is a **forced error** when the hitter met the incoming ball
under pressure, and an **unforced error** otherwise. The rule (:func:`forced`): the hitter
needed at least :data:`FORCED_STRETCH` of the run the ball's time allowed them (the ball was
at the edge of their reach), or met it more than :data:`FORCED_HEIGHT_MARGIN_M` outside their
preferred contact heights. A serve's miss is a fault or a double fault, never either kind.
"""

from __future__ import annotations

import numpy as np

#: Rally endings and who wins the point: the hitter of the ending shot, or the receiver.
ENDINGS = {
    "winner": "hitter",
    "ace": "hitter",
    "forced_error": "receiver",
    "unforced_error": "receiver",
    "double_fault": "receiver",
    "unfinished": None,
}
_HITTER_WINS = tuple(k for k, v in ENDINGS.items() if v == "hitter")
_RECEIVER_WINS = tuple(k for k, v in ENDINGS.items() if v == "receiver")
#: Row results that are not the end of a rally.
ONGOING = ("continues", "fault")
#: Rally errors, by kind.
RALLY_ERRORS = ("forced_error", "unforced_error")
#: Share of the run the time allowed from which a contact is at the edge of reach (common
#: practice: a player at full stretch, here four fifths of the way, is under pressure).
FORCED_STRETCH = 0.8
#: Distance outside the preferred contact heights [m] from which a contact is forced (common
#: practice: a ball met a hand's width or more away from the liked height is uncomfortable).
FORCED_HEIGHT_MARGIN_M = 0.15


def forced(stretch, height, band):
    """Whether contacts with run share ``stretch`` (N,) at ``height`` (N,) [m] are under
    pressure for a player whose preferred contact heights are ``band`` (low, high) [m]."""
    outside = np.maximum(band[0] - height, height - band[1])
    return (np.asarray(stretch) >= FORCED_STRETCH) | (outside > FORCED_HEIGHT_MARGIN_M)


def judge(kind, landed_in, reached, shot_no, limit, pressed=None):
    """The result of N shots: ``"continues"``, ``"fault"`` or one of :data:`ENDINGS`.

    ``kind`` (N,) is ``"first"``, ``"second"`` or ``""`` (a ball in play); ``landed_in`` and
    ``reached`` (N,) say whether the ball landed in and whether the receiver meets it;
    ``shot_no`` (N,) is the shot's number in its rally and ``limit`` the longest rally;
    ``pressed`` (N,) says whether the hitter met the ball under pressure (:func:`forced`; none
    when not given), which makes a rally ball's miss a forced error.
    """
    serve = kind != ""
    result = np.full(kind.size, "continues", dtype=object)
    result[~landed_in & (kind == "first")] = "fault"
    result[~landed_in & (kind == "second")] = "double_fault"
    pressed = np.zeros(kind.size, bool) if pressed is None else np.asarray(pressed, bool)
    result[~landed_in & ~serve & pressed] = "forced_error"
    result[~landed_in & ~serve & ~pressed] = "unforced_error"
    unreached = landed_in & ~reached
    result[unreached & serve] = "ace"
    result[unreached & ~serve] = "winner"
    result[(shot_no >= limit) & np.isin(result, ONGOING)] = "unfinished"
    return result


def point_winner(endings, hitter):
    """The end index (0, 1) winning each point that ends with ``endings``, hit by end
    ``hitter``; -1 for an unfinished rally."""
    won = np.isin(endings, _HITTER_WINS)
    lost = np.isin(endings, _RECEIVER_WINS)
    return np.where(won, hitter, np.where(lost, 1 - hitter, -1))
