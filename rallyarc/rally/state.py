"""What a block of rallies carries between and within rounds: the state of every rally
(:class:`RallyState`), one round's random numbers (:class:`Draws`), one hitter's shots of a round
as planned (:class:`Turn`) and as played (:class:`Played`). The round loop that fills them is
:mod:`rallyarc.rally.rounds`."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc.rally.frames import ENDS
from rallyarc.rally.meet import Contact
from rallyarc.shot import BallState, ShotResult, Swing


@dataclass
class RallyState:
    """Every rally of a block between two rounds, arrays over the block's rallies: the next
    hitter's end index, the point's server and side, the serve to play (``"first"``,
    ``"second"``, or ``""`` for a ball in play), the shot count, the ball where the next hitter
    meets it (in that hitter's frame) and how it was met, the players' positions (x, y) [m]
    in their own frames (``spot`` (n, 2, 2): each end's player when the opponent strikes;
    ``body`` (n, 2): the next hitter at their contact; ``stretch``: the share of their run the
    next hitter needed), and the end of each rally."""

    rally: np.ndarray
    hitter: np.ndarray
    server: np.ndarray
    side: np.ndarray
    kind: np.ndarray
    shot_no: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray
    phase: np.ndarray
    live: np.ndarray
    ending: np.ndarray
    winner: np.ndarray
    spot: np.ndarray
    body: np.ndarray
    stretch: np.ndarray

    @classmethod
    def start(cls, patterns, start, n):
        """Rallies ``start`` to ``start + n - 1`` before their first serve."""
        rally = start + np.arange(n)
        if patterns.server == "alternate":
            hitter = rally % 2
        else:
            hitter = np.full(n, ENDS.index(patterns.server))
        return cls(
            rally=rally,
            hitter=hitter,
            server=hitter.copy(),
            side=np.where((rally // 2) % 2 == 0, "deuce", "ad"),
            kind=np.full(n, "first", dtype=object),
            shot_no=np.zeros(n, int),
            position=np.zeros((n, 3)),
            velocity=np.zeros((n, 3)),
            spin=np.zeros((n, 3)),
            phase=np.full(n, "toss", dtype=object),
            live=np.ones(n, bool),
            ending=np.full(n, "", dtype=object),
            winner=np.full(n, -1),
            spot=np.tile(np.array([p.home for p in patterns.players], float), (n, 1, 1)),
            body=np.zeros((n, 2)),
            stretch=np.zeros(n),
        )


@dataclass(frozen=True)
class Draws:
    """One round's random numbers for the m live rallies: shot choice (m,), target in the zone
    (m, 2) (uniform), aim scatter (m, 2) and swing scatter (m, 3) (standard normal)."""

    choice: np.ndarray
    target: np.ndarray
    aim: np.ndarray
    swing: np.ndarray

    @classmethod
    def of(cls, rng, n, live):
        """Draws for every rally of the block (``n``), kept for the ``live`` ones: a rally's
        numbers in a round do not depend on which other rallies are still going, so pattern
        variants played with one seed meet common random numbers rally by rally."""
        # the order of these draws fixes the tables for a seed: keep it
        choice = rng.random(n)[live]
        target = rng.random((n, 2))[live]
        aim = rng.standard_normal((n, 2))[live]
        swing = rng.standard_normal((n, 3))[live]
        return cls(choice, target, aim, swing)


@dataclass
class Turn:
    """One hitter's shots of a round: ``end`` (0 near, 1 far), the players, ``live`` (their
    places among the round's live rallies, for the draws), ``rallies`` (indices in the block),
    the rallies' serve kind, side, shot number and how the ball was met, the incoming ball in
    the hitter's frame, the chosen entries, the intended and scattered aim points [m], the
    scatter factor, the solved swing with whether its target was reachable, where the hitter
    stands at contact and the receiver when the hitter strikes (x, y) [m] in the hitter's frame,
    the share of their run the hitter needed, and whether they met the ball under pressure."""

    end: int
    player: object
    receiver: object
    live: np.ndarray
    rallies: np.ndarray
    kind: np.ndarray
    side: np.ndarray
    shot: np.ndarray
    phase: np.ndarray
    ball: BallState
    entries: list
    entry_of: np.ndarray
    intended: np.ndarray
    aimed: np.ndarray
    grow: np.ndarray
    solved: Swing
    reachable: np.ndarray
    body: np.ndarray
    receiver_at: np.ndarray
    stretch: np.ndarray
    pressed: np.ndarray

    @property
    def serve(self):
        return self.kind != ""


@dataclass(frozen=True)
class Played:
    """A turn's shots as played: the swing after scatter, the chain result, which balls landed
    in, where the receiver meets them, each shot's result and why a ball was not reached."""

    swing: Swing
    result: ShotResult
    landed_in: np.ndarray
    contact: Contact
    outcome: np.ndarray
    unreached_reason: np.ndarray
