"""The result of a shot and how a rally ends.

A ball that does not land in ends the rally: an error, or a double fault for a second serve;
a first serve's fault gives a second serve. A ball that lands in flies on after its bounce and
the receiver meets it (:mod:`rallyarc.rally.meet`); when no point of its path is within the
receiver's reach the rally ends with a winner (an ace for a serve). A rally still going after
its longest allowed shot is ``unfinished``.
"""

from __future__ import annotations

import numpy as np

#: Rally endings and who wins the point: the hitter of the ending shot, or the receiver.
ENDINGS = {
    "winner": "hitter",
    "ace": "hitter",
    "error": "receiver",
    "double_fault": "receiver",
    "unfinished": None,
}
_HITTER_WINS = tuple(k for k, v in ENDINGS.items() if v == "hitter")
_RECEIVER_WINS = tuple(k for k, v in ENDINGS.items() if v == "receiver")
#: Row results that are not the end of a rally.
ONGOING = ("continues", "fault")


def judge(kind, landed_in, reached, shot_no, limit):
    """The result of N shots: ``"continues"``, ``"fault"`` or one of :data:`ENDINGS`.

    ``kind`` (N,) is ``"first"``, ``"second"`` or ``""`` (a ball in play); ``landed_in`` and
    ``reached`` (N,) say whether the ball landed in and whether the receiver meets it;
    ``shot_no`` (N,) is the shot's number in its rally and ``limit`` the longest rally.
    """
    serve = kind != ""
    result = np.full(kind.size, "continues", dtype=object)
    result[~landed_in & (kind == "first")] = "fault"
    result[~landed_in & (kind == "second")] = "double_fault"
    result[~landed_in & ~serve] = "error"
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
