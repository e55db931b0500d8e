"""The round loop: every live rally of a block plays one shot per round, all in one batch.

One round, in named steps (each over every live rally at once, per hitter):

1. Draw this round's random numbers for the live rallies, in order (:class:`Draws`).
2. Choose each hitter's shot (:func:`rallyarc.rally.choice.choose_shots`); a serve starts from
   its toss, mirrored across the centre mark on the ad side (:func:`_toss`).
3. Aim: the intended point in the shot's target zone, displaced by the aim scatter
   (:mod:`rallyarc.rally.choice`).
4. Solve the swings: :func:`rallyarc.aim.aim_stroke` for every live rally at once, one call per
   aim style and racket over both hitters, every stroke style and every clearance
   (:func:`_solve_swings`), each starting from the block's guess of the solution, learned from
   the swings it has solved so far (:mod:`rallyarc.rally.warm`).
5. Swing with scatter: the solved swing perturbed by the head-speed, face-tilt and swing-path
   scatter (normal), and played through the chain with :func:`rallyarc.shot.simulate`.
6. Meet: where the receiver meets each ball that landed in, running from where they stand
   when the hitter strikes (:func:`rallyarc.rally.meet.meet`).
7. Judge the result (:func:`rallyarc.rally.endings.judge`; a rally ball's miss is a forced
   error when the hitter met the incoming ball under pressure), record the rows
   (:func:`rallyarc.rally.table.shot_rows`) and advance every rally: the ball where the receiver
   met it, turned to the receiver's frame, or a second serve, or the end of the rally.
8. Recover: the hitter runs from where they struck the ball back toward home at their running
   speed for the time until the receiver's contact (:func:`rallyarc.rally.meet.recover`);
   that is where they stand, and start their run, for the next ball.

Every player's position is kept in their own chain frame: ``spot`` is where each end's player
stands when the opponent strikes, ``body`` where the next hitter stands at their contact.

The random numbers of a round are drawn for every rally of the block before any shot is played,
in the same order every round, so a block's tables depend only on its seed, and a rally's
numbers in its k-th round are the same whichever pattern variant is played (common random
numbers for :mod:`rallyarc.rally.whatif`).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from rallyarc.aim import aim_stroke
from rallyarc.aim.stroke import free_parameters
from rallyarc.rally.choice import choose_shots, draw_targets, scatter_aim
from rallyarc.rally.endings import ONGOING, forced, judge, point_winner
from rallyarc.rally.frames import to_other_end
from rallyarc.rally.meet import meet, recover
from rallyarc.rally.state import Draws, Played, RallyState, Turn
from rallyarc.rally.table import rally_table, shot_rows, shot_table
from rallyarc.rally.warm import WarmStart
from rallyarc.shot import BallState, Swing, simulate
from rallyarc.units import RPM


def _toss(state, a, entries, entry_of):
    """Each serve's ball at contact: its toss, mirrored across the centre mark on the ad side."""
    j = np.flatnonzero(state.kind[a] != "")
    if not j.size:
        return
    # the tosses of the entries (K), then of each serve by its entry
    tosses = [e.stroke.toss for e in entries]
    used = np.unique(entry_of[j])
    contact = np.zeros((len(entries), 3))
    velocity = np.zeros((len(entries), 3))
    spin = np.zeros(len(entries))
    for e in used:
        contact[e], velocity[e] = tosses[e].contact, tosses[e].velocity()
        spin[e] = tosses[e].spin_rpm * RPM
    k, rows = entry_of[j], a[j]
    c = contact[k]
    c[:, 1] = np.where(state.side[rows] == "ad", np.abs(c[:, 1]), -np.abs(c[:, 1]))
    state.position[rows] = c
    state.velocity[rows] = velocity[k]
    state.spin[rows] = np.column_stack([np.zeros(j.size), spin[k], np.zeros(j.size)])
    state.body[rows] = c[:, :2]
    state.stretch[rows] = 0.0


def to_other_end_xy(points):
    """Positions (x, y) (N, 2) turned to the other end's frame (180 degrees about z)."""
    return -np.asarray(points, float)


def _ball(state, a):
    return BallState(state.position[a].copy(), state.velocity[a].copy(), state.spin[a].copy())


def _plan_turn(state, players, e, act, hitters, draws):
    """Steps 2 and 3 for the live rallies that end ``e`` hits this round; None if there are none."""
    pl, opp = players[e], players[1 - e]
    mine = np.flatnonzero(hitters == e)
    if mine.size == 0:
        return None
    a = act[mine]
    kind = state.kind[a]
    entries, entry_of = choose_shots(pl, kind, draws.choice[mine], _ball(state, a))
    _toss(state, a, entries, entry_of)
    ball = _ball(state, a)
    intended = draw_targets(
        entries, entry_of, draws.target[mine], state.side[a], ball.position[:, 1], opp
    )
    aimed, grow = scatter_aim(pl, intended, ball.position[:, 2], kind != "", draws.aim[mine])
    pressed = (kind == "") & forced(state.stretch[a], ball.position[:, 2], pl.contact_band)
    return Turn(
        end=e,
        player=pl,
        receiver=opp,
        live=mine,
        rallies=a,
        kind=kind,
        side=state.side[a],
        shot=state.shot_no[a],
        phase=state.phase[a],
        ball=ball,
        entries=entries,
        entry_of=entry_of,
        intended=intended,
        aimed=aimed,
        grow=grow,
        solved=Swing(**{f: np.zeros(a.size) for f in Swing.FIELDS}),
        reachable=np.zeros(a.size, bool),
        body=state.body[a].copy(),
        receiver_at=to_other_end_xy(state.spot[a, 1 - e]),
        stretch=state.stretch[a].copy(),
        pressed=pressed,
    )


def _stacked_balls(members):
    """The incoming balls of a solve group's members ``(turn, k, entry)``, in order."""
    return BallState(
        *(
            np.concatenate([getattr(t.ball, f)[k] for t, k, _ in members])
            for f in ("position", "velocity", "spin")
        )
    )


#: Shots of a stroke style solved first, on their own, when the block's warm start has no fit
#: of that style yet and the round has at least twice as many (the first serves, the first
#: returns): their solutions give the rest of the round a start.
PILOT_SHOTS = 96


def _solve_swings(turns, warm):
    """Step 4: one batched solve per aim style and racket, over both hitters (when they play
    with the same racket), every stroke style and every live rally, targets with a net
    clearance to meet beside targets without one, each solve starting where ``warm`` (the
    block's :class:`rallyarc.rally.warm.WarmStart`) guesses (a style it has not learnt yet
    first solves :data:`PILOT_SHOTS` of its shots to learn from); fills each turn's ``solved``
    swing and ``reachable``, and teaches ``warm`` the solutions."""
    groups = {}
    for t in turns:
        for j, s in enumerate(t.entries):
            k = np.flatnonzero(t.entry_of == j)
            if k.size:
                groups.setdefault((s.aim, t.player.racket_name), []).append((t, k, s))
    for members in groups.values():
        pilot = [
            (t, k[:PILOT_SHOTS], s)
            for t, k, s in members
            if k.size >= 2 * PILOT_SHOTS and not warm.ready(_style(t, s))
        ]
        if pilot:
            _solve_group(pilot, warm, keep=False)
        _solve_group(members, warm)


def _solve_group(members, warm, keep=True):
    """One batched solve of a group's members ``(turn, k, entry)`` (the Broyden rule of
    :func:`rallyarc.aim.solver.solve`: about a fifth faster than Newton's here, with the same
    verdict rule and tolerance); the solutions teach ``warm`` and, when ``keep``, fill the
    turns' ``solved`` and ``reachable``."""
    t0, _, s0 = members[0]
    sizes = [k.size for _, k, _ in members]
    clearance = None
    if any(s.clearance is not None for _, _, s in members):
        # NaN: that target has no clearance to meet (it solves as it would alone)
        goals = [np.nan if s.clearance is None else s.clearance for _, _, s in members]
        clearance = np.repeat(np.asarray(goals, float), sizes)
    names = free_parameters(s0.aim, third=clearance is not None)
    start = np.concatenate(
        [warm.guess(_style(t, s), _ball_of(t, k), *t.aimed[k].T, names) for t, k, s in members]
    )
    res = aim_stroke(
        _stacked_balls(members),
        [s.stroke for _, _, s in members],
        t0.player.conditions,
        np.concatenate([t.aimed[k, 0] for t, k, _ in members]),
        np.concatenate([t.aimed[k, 1] for t, k, _ in members]),
        free=s0.aim,
        clearance=clearance,
        which=np.repeat(np.arange(len(members)), sizes),
        play=False,
        engine="compiled",
        method="broyden",
        start=start,
    )
    at = 0
    for t, k, s in members:
        part = slice(at, at + k.size)
        at += k.size
        if keep:
            for f in Swing.FIELDS:
                getattr(t.solved, f)[k] = getattr(res.swing, f)[part]
            t.reachable[k] = res.reachable[part]
        swing = Swing(**{f: getattr(res.swing, f)[part] for f in Swing.FIELDS})
        warm.learn(_style(t, s), _ball_of(t, k), *t.aimed[k].T, swing, res.reachable[part])


def _style(turn, entry):
    """The key of a hitter's stroke style in the block's warm start."""
    return (turn.end, entry.aim, entry.stroke_name)


def _ball_of(turn, k):
    """The incoming balls of some of a turn's rallies (indices ``k``)."""
    b = turn.ball
    return BallState(b.position[k], b.velocity[k], b.spin[k])


def _scattered_swing(turn, z):
    """Step 5: the solved swing with the execution scatter, normal numbers ``z`` (n, 3)."""
    zs = z * turn.grow[:, None]
    sd, s = turn.player.scatter, turn.solved
    return replace(
        s,
        head_speed=np.maximum(s.head_speed + sd["head_speed"] * zs[:, 0], 1.0),
        face_tilt=s.face_tilt + sd["face_tilt"] * zs[:, 1],
        swing_path=s.swing_path + sd["swing_path"] * zs[:, 2],
    )


def _play_turn(turn, draws, limit):
    """Steps 5 to 7: swing, play the chain, meet the balls that landed in, judge the results."""
    swing = _scattered_swing(turn, draws.swing[turn.live])
    labels = np.array([s.label for s in turn.entries])[turn.entry_of]
    # rallies play many batches: the compiled flights (numpy for aero models without a
    # compiled form)
    result = simulate(
        turn.ball,
        swing,
        turn.player.conditions,
        labels=labels,
        serve=turn.serve,
        engine="compiled",
    )
    landed_in = result.metrics["outcome"] == "in"
    li = np.flatnonzero(landed_in)
    # and the compiled contact search (the same contacts as numpy's, at less cost per batch)
    contact = meet(result, li, turn.receiver, turn.receiver_at[li], engine="compiled")
    reached = np.zeros(turn.rallies.size, bool)
    reached[li] = contact.found
    reason = np.full(turn.rallies.size, "", dtype=object)
    reason[li] = contact.reason
    outcome = judge(turn.kind, landed_in, reached, turn.shot, limit, turn.pressed)
    return Played(swing, result, landed_in, contact, outcome, reason)


def _advance(state, turn, played, report):
    """Step 7: the next state of every rally of this hitter."""
    e, a, res_kind, contact = turn.end, turn.rallies, played.outcome, played.contact
    li = np.flatnonzero(played.landed_in)
    cont = np.zeros(a.size, bool)
    cont[li] = contact.found
    cont &= res_kind == "continues"
    nxt = a[li[contact.found]]
    state.position[nxt] = to_other_end(contact.position[contact.found])
    state.velocity[nxt] = to_other_end(contact.velocity[contact.found])
    state.spin[nxt] = to_other_end(contact.spin[contact.found])
    state.phase[nxt] = contact.phase[contact.found]
    state.body[nxt] = to_other_end_xy(contact.body[contact.found])
    state.stretch[nxt] = contact.stretch[contact.found]
    _recover(state, turn, li[contact.found], contact.t[contact.found])
    goes_on = a[cont]
    state.hitter[goes_on] = 1 - e
    state.kind[goes_on] = ""
    faulted = a[res_kind == "fault"]
    state.kind[faulted] = "second"
    state.phase[faulted] = "toss"
    done = ~np.isin(res_kind, ONGOING)
    ends = a[done]
    state.ending[ends] = res_kind[done]
    state.winner[ends] = point_winner(res_kind[done], e)
    state.live[ends] = False
    if done.any():
        report(int(done.sum()))


def _recover(state, turn, k, time):
    """Step 8: the hitter's recovery toward home for ``time`` [s], rallies ``k`` of the turn."""
    pl = turn.player
    spot = recover(turn.body[k], pl.home, pl.run_speed, time)
    state.spot[turn.rallies[k], turn.end] = spot


def play_round(state, players, rng, limit, report, warm=None):
    """One shot of every live rally; advances ``state`` and returns this round's rows.
    ``warm`` is the block's :class:`rallyarc.rally.warm.WarmStart` (a new one when not given)."""
    warm = WarmStart() if warm is None else warm
    act = np.flatnonzero(state.live)
    state.shot_no[act] += 1
    draws = Draws.of(rng, state.rally.size, act)
    hitters = state.hitter[act].copy()  # each live rally plays one shot per round
    turns = [_plan_turn(state, players, e, act, hitters, draws) for e in (0, 1)]
    turns = [t for t in turns if t is not None]
    _solve_swings(turns, warm)
    rows = []
    for turn in turns:
        played = _play_turn(turn, draws, limit)
        rows.append(shot_rows(turn, played))
        _advance(state, turn, played, report)
    return rows


def play_block(patterns, start, n, stream, limit, report):
    """Rallies ``start`` to ``start + n - 1``, one batch; returns (shots, rallies) frames.

    ``stream`` seeds the block's random numbers; ``report(k)`` is called with the number of
    rallies finished in each step.
    """
    rng = np.random.default_rng(stream)
    state = RallyState.start(patterns, start, n)
    rows = []
    warm = WarmStart()
    while state.live.any():
        rows.extend(play_round(state, patterns.players, rng, limit, report, warm))
    shots = shot_table(rows, start)
    return shots, rally_table(state, patterns.players, shots)
