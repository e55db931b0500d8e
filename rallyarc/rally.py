"""Rally patterns: two players' serves and shots played out over many rallies at once.

A pattern file (TOML, ``configs/patterns/`` or a path; schema ``"patterns"`` in
:mod:`rallyarc.config`) describes the two players of a match: where each stands and how far
they reach, the contact heights they like and when they take the ball (on the rise, at the
apex, on the drop), their serves and their repertoire of shots with the probability of each
(optionally only against some incoming balls), and how much their execution scatters.
:func:`play_rallies` plays N rallies shot by shot, all live rallies in one batch.

Frames. Every shot is computed in its hitter's chain frame: the hitter at the near end (x < 0)
hitting toward +x, as in :func:`rallyarc.shot.simulate`. The near player's chain frame is the
court frame; the far player's is the court rotated 180 degrees about z,
``(x, y, z) -> (-x, -y, z)``, applied alike to positions, velocities and spins (a proper
rotation, so spin, an axial vector, turns like any vector). The tables report positions in the
court frame.

One shot.
1. The hitter chooses a shot (seeded random numbers). A shot with conditions on the incoming
   ball (contact height, forehand or backhand side, incoming topspin) is played with its
   probability when the ball meets them; the rest is shared by the shots without conditions in
   proportion to their probabilities (:func:`shot_weights`).
2. The aim point is drawn uniformly in the shot's target zone, then displaced by the aim scatter
   (normal, SD ``aim_m`` along and across the court). Every scatter SD grows by the factor
   :func:`scatter_factor` when the ball is met outside the preferred contact heights.
3. :func:`rallyarc.aim.aim_stroke` solves the swing for every live rally at once (one call per
   player and shot type); the solved swing is then perturbed by the head-speed, face-tilt and
   swing-path scatter (normal) and played with :func:`rallyarc.shot.simulate`.
4. A ball that does not land in ends the rally (an error; a first serve's fault gives a second
   serve). A ball that lands in flies on after its bounce; the receiver meets it (below).

Where the receiver meets the ball. On the ball's path after its bounce and before a second
bounce, a point is within reach when its height lies between the player's lowest and highest
contact, it is no deeper than the player's deepest position behind the baseline, and its
horizontal distance from the player's home position is at most ``reach_m`` plus the run
``run_speed_mps * (t - reaction_s)`` from the opponent's contact. The player aims to meet the
ball at the point their timing names: on the rise or on the drop where the ball passes the
middle of their preferred contact-height range (at the apex when the bounce does not rise that
high), or at the apex. When that point is out of reach, they meet the ball at the point within
reach nearest to it in time (a heavy high ball the player cannot back away from is met above
the preferred range). No point within reach ends the rally: a winner (an ace for a serve).
The player is back at home for every shot (no recovery model).

Nothing here is new physics: each shot is one call of the project's chain, and the checks in
``tests/rallyarc/test_rally.py`` compare every shot of a rally with that chain run alone.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from rallyarc import config, court, domain
from rallyarc.aim import aim_stroke
from rallyarc.errors import InputError
from rallyarc.shot import BallState, Swing, simulate, topspin_sidespin
from rallyarc.units import KMH, RPM

ENDS = ("near", "far")
#: Shoulder height as a fraction of body height when a player file gives none (common
#: practice: standing shoulder height is about 0.82 of stature for adults).
SHOULDER_FRACTION = 0.82
#: Lowest contact height [m] of the ball's centre when a player file gives none (common practice:
#: below about 0.2 m a groundstroke becomes a half-volley).
LOWEST_CONTACT_M = 0.2
#: Reaction time [s] before a player starts to move, when a player file gives none (common
#: practice: about a quarter of a second from the opponent's contact).
REACTION_S = 0.25
#: A contact this close in time to the bounce's apex is "at the apex" [s].
APEX_WINDOW_S = 0.02
#: Samples of each ball's path after its bounce when looking for the contact point.
PATH_SAMPLES = 160
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
_FLIP = np.array([-1.0, -1.0, 1.0])


def to_other_end(vectors):
    """Vectors ``(N, 3)`` from one end's chain frame to the other's: rotation by 180 degrees
    about z, ``(x, y, z) -> (-x, -y, z)``. The same for positions, velocities and spins, and
    its own inverse."""
    return np.asarray(vectors, float) * _FLIP


@dataclass(frozen=True)
class PatternShot:
    """One entry of a repertoire (or a serve): stroke style, target zone [m] in the hitter's
    frame, probability, and conditions on the incoming ball (None: any)."""

    label: str
    stroke: domain.Stroke
    stroke_name: str
    probability: float
    target_x: tuple
    target_y: tuple
    direction: str = "fixed"
    aim: str = "tilt"
    clearance: float | None = None
    serve: str = ""
    when_height_above: float | None = None
    when_height_below: float | None = None
    when_side: str | None = None
    when_topspin_above: float | None = None

    @property
    def conditional(self):
        return any(
            v is not None
            for v in (
                self.when_height_above,
                self.when_height_below,
                self.when_side,
                self.when_topspin_above,
            )
        )


@dataclass(frozen=True)
class Player:
    """One player of a pattern pair, SI units; positions in the player's own chain frame."""

    name: str
    end: str
    handedness: str
    conditions: domain.Conditions
    racket_name: str
    height: float
    shoulder_height: float
    shoulder_source: str
    home_behind: float
    home_y: float
    deepest_behind: float
    reach: float
    run_speed: float
    reaction: float
    contact_band: tuple
    lowest: float
    highest: float
    timing: str
    scatter: dict
    first_serves: tuple
    second_serves: tuple
    shots: tuple
    source: str = ""

    @property
    def home(self):
        """Home position (x, y) in the player's chain frame [m]."""
        return (-(court.HALF_LENGTH + self.home_behind), self.home_y)


@dataclass(frozen=True)
class Patterns:
    name: str
    description: str
    club: str
    source: str
    server: str
    max_shots: int
    players: tuple
    where: str = ""


def _range(values, label, where):
    lo, hi = values
    if lo > hi:
        raise InputError(f"{where}: key {label!r} must list the low end first, got {values}")
    return (float(lo), float(hi))


def _entry(data, where, prefix, serve):
    label = f"{prefix}.stroke"
    try:
        stroke = domain.load_stroke(data["stroke"])
    except InputError as exc:
        raise InputError(f"{where}: key {label!r}: {exc}") from None
    want = "serve" if serve else "groundstroke"
    if stroke.kind != want:
        raise InputError(
            f"{where}: key {label!r} must name a {want} stroke, got {data['stroke']!r}"
        )
    return PatternShot(
        label=data["label"],
        stroke=stroke,
        stroke_name=str(data["stroke"]),
        probability=data["probability"],
        target_x=_range(data["target_x_m"], f"{prefix}.target_x_m", where),
        target_y=_range(data["target_y_m"], f"{prefix}.target_y_m", where),
        direction=data.get("direction", "fixed"),
        aim=data.get("aim", "tilt"),
        clearance=data.get("clearance_m"),
        serve=data.get("serve", ""),
        when_height_above=data.get("when_height_above_m"),
        when_height_below=data.get("when_height_below_m"),
        when_side=data.get("when_side"),
        when_topspin_above=(
            data["when_incoming_topspin_above_rpm"] * RPM
            if "when_incoming_topspin_above_rpm" in data
            else None
        ),
    )


def _player(data, end, base, where):
    p = end

    def sub(loader, key):
        return config.referenced(data, key, loader, where, f"{p}.{key}")

    band = _range(data["contact_height_m"], f"{p}.contact_height_m", where)
    lowest = data.get("lowest_contact_m", LOWEST_CONTACT_M)
    highest = data["highest_contact_m"]
    if not lowest < highest:
        raise InputError(f"{where}: key '{p}.highest_contact_m' must exceed the lowest contact")
    if not (lowest <= band[0] and band[1] <= highest):
        raise InputError(
            f"{where}: key '{p}.contact_height_m' must lie from the lowest contact "
            f"{lowest:g} m to highest_contact_m {highest:g} m, got {list(band)}"
        )
    if data["deepest_behind_baseline_m"] < data["home_behind_baseline_m"]:
        raise InputError(
            f"{where}: key '{p}.deepest_behind_baseline_m' must not be less than "
            "home_behind_baseline_m"
        )
    serves = [_entry(s, where, f"{p}.serves[{i + 1}]", True) for i, s in enumerate(data["serves"])]
    shots = [_entry(s, where, f"{p}.shots[{i + 1}]", False) for i, s in enumerate(data["shots"])]
    first = tuple(s for s in serves if s.serve == "first")
    second = tuple(s for s in serves if s.serve == "second") or first
    if not first or sum(s.probability for s in first) <= 0:
        raise InputError(f"{where}: key '{p}.serves' needs a first serve with probability > 0")
    if sum(s.probability for s in second) <= 0:
        raise InputError(f"{where}: key '{p}.serves' needs a second serve with probability > 0")
    if not any(not s.conditional and s.probability > 0 for s in shots):
        raise InputError(
            f"{where}: key '{p}.shots' needs at least one shot without a 'when_' condition and "
            "with probability > 0, so that every ball has a reply"
        )
    if "shoulder_height_m" in data:
        shoulder, shoulder_source = data["shoulder_height_m"], "given in the pattern file"
    else:
        shoulder = SHOULDER_FRACTION * data["height_m"]
        shoulder_source = (
            f"{SHOULDER_FRACTION:g} x body height {data['height_m']:g} m (common practice)"
        )
    sd = data["scatter"]
    return Player(
        name=data["name"],
        end=end,
        handedness=data["handedness"],
        conditions=replace(base, racket=sub(domain.load_racket, "racket")),
        racket_name=data["racket"],
        height=data["height_m"],
        shoulder_height=shoulder,
        shoulder_source=shoulder_source,
        home_behind=data["home_behind_baseline_m"],
        home_y=data.get("home_y_m", 0.0),
        deepest_behind=data["deepest_behind_baseline_m"],
        reach=data["reach_m"],
        run_speed=data["run_speed_mps"],
        reaction=data.get("reaction_s", REACTION_S),
        contact_band=band,
        lowest=lowest,
        highest=highest,
        timing=data["timing"],
        scatter={
            "head_speed": sd["head_speed_kmh"] * KMH,
            "face_tilt": math.radians(sd["face_tilt_deg"]),
            "swing_path": math.radians(sd["swing_path_deg"]),
            "aim": sd["aim_m"],
            "outside_range_per_m": sd.get("outside_range_per_m", 0.0),
        },
        first_serves=first,
        second_serves=second,
        shots=tuple(shots),
        source=data["source"],
    )


def load_patterns(name_or_path):
    """A pattern pair by preset name (``configs/patterns/``) or TOML path."""
    data = config.load("patterns", name_or_path)
    where = data["where"]

    def sub(loader, key):
        return config.referenced(data, key, loader)

    base = domain.Conditions(
        ball=sub(domain.load_ball, "ball"),
        racket=domain.load_racket("standard"),
        air=sub(domain.load_air, "air"),
        surface=sub(domain.load_surface, "surface"),
        surface_name=data["surface"],
    )
    players = tuple(_player(data[end], end, base, where) for end in ENDS)
    if players[0].name == players[1].name:
        raise InputError(f"{where}: keys 'near.name' and 'far.name' must differ")
    return Patterns(
        name=data["name"],
        description=data["description"],
        club=data["club"],
        source=data["source"],
        server=data.get("server", "alternate"),
        max_shots=data.get("max_shots", 40),
        players=players,
        where=where,
    )


def with_scatter(patterns, factor):
    """The same patterns with every execution scatter SD multiplied by ``factor``."""
    sds = ("head_speed", "face_tilt", "swing_path", "aim")
    players = tuple(
        replace(p, scatter={k: v * factor if k in sds else v for k, v in p.scatter.items()})
        for p in patterns.players
    )
    return replace(patterns, players=players)


# ------------------------------------------------------------------------- ball quantities


def contact_side(y, player):
    """``"forehand"`` or ``"backhand"`` for contacts at lateral position ``y`` in the player's
    own frame: a right-hander facing +x has the forehand on the right (y below the home
    position's y)."""
    right = np.asarray(y) < player.home_y
    forehand = right if player.handedness == "right" else ~right
    return np.where(forehand, "forehand", "backhand")


# ------------------------------------------------------------------------- contact points


@dataclass
class Contact:
    """Where receivers meet N balls that landed in, in the hitter's chain frame: ``found``
    (N,) bool, ``t`` [s] after the hitter's contact, the ball's position [m], velocity [m/s]
    and spin [rad/s] there ``(N, 3)``, the timing's target time ``target_t`` [s], ``reason``
    (why no point was within reach) and ``phase`` (rise, apex or drop)."""

    found: np.ndarray
    t: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray
    target_t: np.ndarray
    reason: np.ndarray
    phase: np.ndarray


def _bisect(f, a, b, iterations=30):
    """Vectorized bisection for a sign change of ``f`` between times ``a`` and ``b``
    (``f(a)`` false, ``f(b)`` true, or the reverse); returns the time next to the true side."""
    fa = f(a)
    for _ in range(iterations):
        mid = 0.5 * (a + b)
        fm = f(mid)
        same = fm == fa
        a = np.where(same, mid, a)
        b = np.where(same, b, mid)
    return np.where(fa, a, b)


def meet(result, balls, receiver):
    """Find where ``receiver`` meets the balls ``balls`` (indices of shots that landed in) of
    one chain result ``result`` (recorded), all in the hitter's chain frame.

    Returns a :class:`Contact` for those balls.
    """
    balls = np.asarray(balls, int)
    n = balls.size
    empty = Contact(
        np.zeros(0, bool),
        *(np.zeros((0,) + s) for s in ((), (3,), (3,), (3,), ())),
        np.array([], str),
        np.array([], str),
    )
    if n == 0:
        return empty
    if result.after_bounce is None:
        raise ValueError("every ball must have bounced")
    after = result.after_bounce.flight
    try:
        col = result.after_bounce.columns(balls)
    except ValueError:
        raise ValueError("every ball must have bounced") from None
    traj = after.trajectory
    m = result.metrics
    t_b = m["bounce_t_s"][balls]
    t_e = after.t[col]
    k_all = traj.t.shape[1]

    def sample(times):
        """Positions, velocities and spins of the n balls at times (M, n)."""
        full = np.zeros((times.shape[0], k_all))
        full[:, col] = times
        pos, vel, spin = traj.sample(full)
        return pos[:, col], vel[:, col], spin[:, col]

    # the receiver in the hitter's frame: home at (L/2 + behind, -y) (180 degree rotation)
    home = np.array([court.HALF_LENGTH + receiver.home_behind, -receiver.home_y])
    deepest = court.HALF_LENGTH + receiver.deepest_behind
    mid = 0.5 * (receiver.contact_band[0] + receiver.contact_band[1])

    def feasible_parts(times, pos):
        z = pos[..., 2]
        height = (z >= receiver.lowest) & (z <= receiver.highest)
        depth = pos[..., 0] <= deepest
        dist = np.hypot(pos[..., 0] - home[0], pos[..., 1] - home[1])
        move = dist <= receiver.reach + receiver.run_speed * np.maximum(
            0.0, times - receiver.reaction
        )
        after_bounce = times > t_b[None, :] if times.ndim == 2 else times > t_b
        return height & after_bounce, depth, move

    def feasible(times, pos):
        h, d, mv = feasible_parts(times, pos)
        return h & d & mv

    # the timing's target point
    apex_ev = after.events["apex"]
    t_apex = np.where(apex_ev.occurred[col], apex_ev.t[col], t_b)
    radius = result.conditions.ball.radius
    z_apex = np.where(apex_ev.occurred[col], apex_ev.position[col, 2], radius)
    if receiver.timing == "apex":
        target = t_apex
    else:
        high = z_apex > mid

        def above(t):
            return sample(t[None, :])[0][0, :, 2] >= mid

        if receiver.timing == "rise":
            cross = _bisect(above, t_b.copy(), t_apex.copy())
        else:
            cross = _bisect(above, t_e.copy(), t_apex.copy())
        target = np.where(high, cross, t_apex)

    frac = np.linspace(0.0, 1.0, PATH_SAMPLES)[:, None]
    grid = t_b[None, :] + frac * (t_e - t_b)[None, :]
    times = np.concatenate([grid, target[None, :]])
    pos, _, _ = sample(times)
    grid_pos = pos[:-1]
    ok = feasible(times, pos)
    at_target = ok[-1]
    gap = np.where(ok[:-1], np.abs(grid - target[None, :]), np.inf)
    j = np.argmin(gap, axis=0)
    found = at_target | np.isfinite(gap[j, np.arange(n)])
    t_c = np.where(at_target, target, grid[j, np.arange(n)])

    # refine toward the target: bisect between the feasible sample and its neighbour
    step = np.where(grid[j, np.arange(n)] < target, 1, -1)
    nb = np.clip(j + step, 0, PATH_SAMPLES - 1)
    t_nb = grid[nb, np.arange(n)]
    refine = found & ~at_target & ~ok[nb, np.arange(n)] & (nb != j)
    if refine.any():
        r = np.flatnonzero(refine)

        def ok_at(t):
            full = t_c.copy()
            full[r] = t
            p, _, _ = sample(full[None, :])
            return feasible(full[None, :], p)[0, r]

        t_c[r] = _bisect(ok_at, t_c[r].copy(), t_nb[r].copy(), iterations=20)

    pos, vel, spin = (a[0] for a in sample(t_c[None, :]))
    h, d, mv = feasible_parts(grid, grid_pos)
    reason = np.full(n, "", dtype=object)
    none = ~found
    reason[none & (d & mv).any(axis=0)] = "out of height range"
    reason[none & (reason == "") & (h & d).any(axis=0)] = "too far to run"
    reason[none & (reason == "")] = "past the deepest position"
    phase = np.where(
        np.abs(t_c - t_apex) <= APEX_WINDOW_S, "apex", np.where(t_c < t_apex, "rise", "drop")
    )
    return Contact(found, t_c, pos, vel, spin, target, reason.astype(str), phase)


# ------------------------------------------------------------------------- rallies


@dataclass
class RallyRun:
    """N rallies: ``shots`` (one row per shot) and ``rallies`` (one row per rally), pandas
    DataFrames with units in their column names, positions in the court frame."""

    patterns: Patterns
    shots: object
    rallies: object
    seed: int
    n: int
    max_shots: int


def _choose(u, weights):
    """Index of the entry chosen by uniform numbers ``u`` (N,) with weights ``(N, k)``."""
    total = weights.sum(axis=1, keepdims=True)
    cum = np.cumsum(weights, axis=1) / np.where(total > 0, total, 1.0)
    return np.minimum((u[:, None] > cum).sum(axis=1), weights.shape[1] - 1)


def _eligible(entry, height, side, topspin):
    ok = np.ones(height.shape, bool)
    if entry.when_height_above is not None:
        ok &= height > entry.when_height_above
    if entry.when_height_below is not None:
        ok &= height < entry.when_height_below
    if entry.when_side is not None:
        ok &= side == entry.when_side
    if entry.when_topspin_above is not None:
        ok &= topspin > entry.when_topspin_above
    return ok


def scatter_factor(player, height, serve):
    """The factor on a player's scatter SDs for contacts at ``height`` [m]: 1 inside the
    preferred range (and for serves), growing by ``outside_range_per_m`` per metre outside it.

    A modelling assumption of the pattern file (common practice: a ball met away from the
    preferred height is controlled less well), not a result of the physics.
    """
    lo, hi = player.contact_band
    outside = np.maximum(0.0, np.maximum(lo - height, height - hi))
    return np.where(serve, 1.0, 1.0 + player.scatter["outside_range_per_m"] * outside)


def shot_weights(shots, height, side, topspin):
    """Probabilities ``(N, k)`` of a repertoire's shots against N incoming balls.

    A shot with conditions is played with its probability when the ball meets them (if the
    eligible conditional shots add up to more than 1 they share 1 in proportion); the rest of
    the probability goes to the shots without conditions, in proportion to theirs.
    """
    cond = np.array([s.conditional for s in shots])
    p = np.array([s.probability for s in shots], float)
    ok = np.stack([_eligible(s, height, side, topspin) for s in shots], axis=1)
    wc = np.where(cond[None, :] & ok, p[None, :], 0.0)
    total_c = wc.sum(axis=1, keepdims=True)
    wc = np.where(total_c > 1.0, wc / np.where(total_c > 0, total_c, 1.0), wc)
    rest = 1.0 - wc.sum(axis=1, keepdims=True)
    pu = np.where(cond, 0.0, p)
    return wc + rest * pu[None, :] / pu.sum()


def _direction_sign(entry, contact_y, receiver):
    if entry.direction == "crosscourt":
        return np.where(contact_y >= 0, -1.0, 1.0)
    if entry.direction == "line":
        return np.where(contact_y >= 0, 1.0, -1.0)
    if entry.direction in ("backhand", "forehand"):
        # the receiver faces -x in the hitter's frame: a right-hander's backhand is at -y
        left = -1.0 if entry.direction == "backhand" else 1.0
        sign = left if receiver.handedness == "right" else -left
        return np.full(contact_y.shape, sign)
    return np.ones(contact_y.shape)


#: Rallies simulated together in one batch; a run of more rallies is split into blocks of
#: this size, each with its own random stream from the seed, so that the tables do not depend
#: on how many processes play the blocks.
BLOCK = 5000


def play_rallies(
    patterns, n=10_000, seed=0, max_shots=None, progress=False, workers=1, block=BLOCK
):
    """Play ``n`` rallies of a pattern pair, all live rallies advancing shot by shot together.

    Parameters
    ----------
    patterns : Patterns
    n : int
        Rallies.
    seed : int
        Seed of the random numbers (shot choice, aim points, scatter); the same seed gives the
        same tables, whatever ``workers`` is.
    max_shots : int, optional
        Longest rally in shots (a faulted first serve counts as a shot); the pattern file's
        ``max_shots`` by default. A rally still going then is ``unfinished``.
    progress : bool
        Show a tqdm progress bar of finished rallies.
    workers : int
        Processes playing the blocks at once (at most one per block).
    block : int
        Rallies per block (:data:`BLOCK`); each block has its own random stream, spawned from
        the seed, so the tables depend on the seed and the block size only.

    Returns
    -------
    RallyRun
    """
    import pandas as pd
    from tqdm import tqdm

    limit = int(patterns.max_shots if max_shots is None else max_shots)
    starts = list(range(0, n, int(block)))
    streams = np.random.SeedSequence(seed).spawn(len(starts))
    jobs = [(s, min(int(block), n - s), q) for s, q in zip(starts, streams, strict=True)]
    bar = tqdm(total=n, desc="rallies", unit="rally", disable=not progress, leave=False)
    workers = max(1, min(int(workers), len(jobs)))
    if workers == 1:
        parts = [_play_block(patterns, s, m, q, limit, bar.update) for s, m, q in jobs]
    else:
        parts = _play_parallel(patterns, jobs, limit, workers, bar)
    bar.close()
    shots = pd.concat([p[0] for p in parts], ignore_index=True)
    rallies = pd.concat([p[1] for p in parts], ignore_index=True)
    return RallyRun(patterns, shots, rallies, int(seed), int(n), limit)


def _play_parallel(patterns, jobs, limit, workers, bar):
    """Blocks in worker processes; finished rallies are reported through a queue."""
    import multiprocessing
    import queue as queue_mod
    from concurrent.futures import ProcessPoolExecutor

    ctx = multiprocessing.get_context("fork")
    with ctx.Manager() as manager:
        done = manager.Queue()
        with ProcessPoolExecutor(max_workers=workers, mp_context=ctx) as pool:
            futures = [
                pool.submit(_play_block_reporting, patterns, s, m, q, limit, done)
                for s, m, q in jobs
            ]
            while not all(f.done() for f in futures):
                try:
                    bar.update(done.get(timeout=0.2))
                except queue_mod.Empty:
                    pass
            while not done.empty():
                bar.update(done.get())
            return [f.result() for f in futures]


def _play_block_reporting(patterns, start, n, stream, limit, done):
    return _play_block(patterns, start, n, stream, limit, done.put)


def _play_block(patterns, start, n, stream, limit, report):
    """Rallies ``start`` to ``start + n - 1``, one batch; returns (shots, rallies) frames."""
    import pandas as pd

    rng = np.random.default_rng(stream)
    players = patterns.players
    rally = start + np.arange(n)
    if patterns.server == "alternate":
        hitter = rally % 2
    else:
        hitter = np.full(n, ENDS.index(patterns.server))
    server = hitter.copy()
    side = np.where((rally // 2) % 2 == 0, "deuce", "ad")
    kind = np.full(n, "first", dtype=object)  # first, second, or "" (ball in play)
    shot_no = np.zeros(n, int)
    pos = np.zeros((n, 3))
    vel = np.zeros((n, 3))
    spin = np.zeros((n, 3))
    info = {"phase": np.full(n, "toss", dtype=object)}  # how the ball was met
    live = np.ones(n, bool)
    ending = np.full(n, "", dtype=object)
    winner = np.full(n, -1)
    rows = []
    while live.any():
        act = np.flatnonzero(live)
        m_act = act.size
        shot_no[act] += 1
        # random numbers for this shot, drawn for the live rallies in order
        u_choice = rng.random(m_act)
        u_target = rng.random((m_act, 2))
        z_aim = rng.standard_normal((m_act, 2))
        z_swing = rng.standard_normal((m_act, 3))
        round_rows = []
        plans = {}
        hitter_now = hitter[act].copy()  # each live rally plays one shot per round
        for e in (0, 1):
            pl, opp = players[e], players[1 - e]
            mine = np.flatnonzero(hitter_now == e)
            if mine.size == 0:
                continue
            a = act[mine]
            is_serve = kind[a] != ""
            entry_of = np.full(a.size, -1)
            entries = []
            # serves
            for which, pool in (("first", pl.first_serves), ("second", pl.second_serves)):
                k = np.flatnonzero(kind[a] == which)
                if k.size == 0:
                    continue
                w = np.tile([s.probability for s in pool], (k.size, 1))
                pick = _choose(u_choice[mine[k]], w)
                for j, s in enumerate(pool):
                    entries.append(s)
                    entry_of[k[pick == j]] = len(entries) - 1
            # groundstrokes
            k = np.flatnonzero(~is_serve)
            if k.size:
                height = pos[a[k], 2]
                top_in, _ = topspin_sidespin(vel[a[k]], spin[a[k]])
                sides = contact_side(pos[a[k], 1], pl)
                pick = _choose(u_choice[mine[k]], shot_weights(pl.shots, height, sides, top_in))
                for j, s in enumerate(pl.shots):
                    entries.append(s)
                    entry_of[k[pick == j]] = len(entries) - 1
            # the toss of each serve (mirrored across the centre mark on the ad side)
            for j in np.flatnonzero(is_serve):
                s = entries[entry_of[j]]
                toss = s.stroke.toss
                ad = side[a[j]] == "ad"
                c = np.array(toss.contact, float)
                c[1] = abs(c[1]) if ad else -abs(c[1])
                pos[a[j]] = c
                vel[a[j]] = toss.velocity()
                spin[a[j]] = [0.0, toss.spin_rpm * RPM, 0.0]
            # targets in the hitter's frame
            tx = np.zeros(a.size)
            ty = np.zeros(a.size)
            for j, s in enumerate(entries):
                k = np.flatnonzero(entry_of == j)
                if k.size == 0:
                    continue
                ut = u_target[mine[k]]
                x = s.target_x[0] + ut[:, 0] * (s.target_x[1] - s.target_x[0])
                y = s.target_y[0] + ut[:, 1] * (s.target_y[1] - s.target_y[0])
                if s.serve:
                    sign = np.where(side[a[k]] == "ad", -1.0, 1.0)
                else:
                    sign = _direction_sign(s, pos[a[k], 1], opp)
                tx[k], ty[k] = x, sign * y
            intended = np.stack([tx, ty], axis=1)
            grow = scatter_factor(pl, pos[a, 2], is_serve)
            tx = tx + grow * pl.scatter["aim"] * z_aim[mine, 0]
            ty = ty + grow * pl.scatter["aim"] * z_aim[mine, 1]
            plans[e] = {
                "mine": mine,
                "a": a,
                "is_serve": is_serve,
                "entries": entries,
                "entry_of": entry_of,
                "intended": intended,
                "tx": tx,
                "ty": ty,
                "grow": grow,
                "fields": {f: np.zeros(a.size) for f in Swing.FIELDS},
                "reachable": np.zeros(a.size, bool),
            }
        # aim: one batched solve per aim style, clearance and racket, over both players (when
        # they play with the same racket), every stroke style and every live rally
        groups = {}
        for e, plan in plans.items():
            for j, s in enumerate(plan["entries"]):
                k = np.flatnonzero(plan["entry_of"] == j)
                if k.size:
                    key = (s.aim, s.clearance, players[e].racket_name)
                    groups.setdefault(key, []).append((e, k, s))
        for members in groups.values():
            e0, _, s0 = members[0]
            rid = np.concatenate([plans[e]["a"][k] for e, k, _ in members])
            res = aim_stroke(
                BallState(pos[rid], vel[rid], spin[rid]),
                [s.stroke for _, _, s in members],
                players[e0].conditions,
                np.concatenate([plans[e]["tx"][k] for e, k, _ in members]),
                np.concatenate([plans[e]["ty"][k] for e, k, _ in members]),
                free=s0.aim,
                clearance=s0.clearance,
                which=np.repeat(np.arange(len(members)), [k.size for _, k, _ in members]),
            )
            at = 0
            for e, k, _ in members:
                part = slice(at, at + k.size)
                at += k.size
                for f in Swing.FIELDS:
                    plans[e]["fields"][f][k] = getattr(res.result.swing, f)[part]
                plans[e]["reachable"][k] = res.reachable[part]
        for e, plan in plans.items():
            pl, opp = players[e], players[1 - e]
            mine, a, is_serve = plan["mine"], plan["a"], plan["is_serve"]
            entries, entry_of = plan["entries"], plan["entry_of"]
            intended, tx, ty = plan["intended"], plan["tx"], plan["ty"]
            fields, reachable = plan["fields"], plan["reachable"]
            # execution scatter on the solved swing
            zs = z_swing[mine] * plan["grow"][:, None]
            fields["head_speed"] = np.maximum(
                fields["head_speed"] + pl.scatter["head_speed"] * zs[:, 0], 1.0
            )
            fields["face_tilt"] = fields["face_tilt"] + pl.scatter["face_tilt"] * zs[:, 1]
            fields["swing_path"] = fields["swing_path"] + pl.scatter["swing_path"] * zs[:, 2]
            swing = Swing(**fields)
            labels = np.array([s.label for s in entries])[entry_of]
            incoming = BallState(pos[a].copy(), vel[a].copy(), spin[a].copy())
            result = simulate(incoming, swing, pl.conditions, labels=labels, serve=is_serve)
            mt = result.metrics
            landed_in = mt["outcome"] == "in"
            contact = meet(result, np.flatnonzero(landed_in), opp)
            reached = np.zeros(a.size, bool)
            reached[np.flatnonzero(landed_in)] = contact.found
            out_reason = np.full(a.size, "", dtype=object)
            out_reason[np.flatnonzero(landed_in)] = contact.reason
            # results of this shot
            res_kind = np.full(a.size, "continues", dtype=object)
            first = kind[a] == "first"
            second = kind[a] == "second"
            res_kind[~landed_in & first] = "fault"
            res_kind[~landed_in & second] = "double_fault"
            res_kind[~landed_in & ~is_serve] = "error"
            unreached = landed_in & ~reached
            res_kind[unreached & is_serve] = "ace"
            res_kind[unreached & ~is_serve] = "winner"
            full = (shot_no[a] >= limit) & np.isin(res_kind, ONGOING)
            res_kind[full] = "unfinished"
            round_rows.append(
                _rows(
                    a,
                    shot_no[a],
                    e,
                    players,
                    kind[a],
                    side[a],
                    entries,
                    entry_of,
                    incoming,
                    info,
                    intended,
                    np.stack([tx, ty], axis=1),
                    swing,
                    result,
                    reachable,
                    res_kind,
                    out_reason,
                    landed_in,
                    contact,
                )
            )
            # the next state of every rally of this hitter
            cont = np.zeros(a.size, bool)
            cont[np.flatnonzero(landed_in)] = contact.found
            cont &= res_kind == "continues"
            li = np.flatnonzero(landed_in)
            fi = li[contact.found]
            nxt = a[fi]
            pos[nxt] = to_other_end(contact.position[contact.found])
            vel[nxt] = to_other_end(contact.velocity[contact.found])
            spin[nxt] = to_other_end(contact.spin[contact.found])
            info["phase"][nxt] = contact.phase[contact.found]
            goes_on = a[cont]
            hitter[goes_on] = 1 - e
            kind[goes_on] = ""
            faulted = a[res_kind == "fault"]
            kind[faulted] = "second"
            info["phase"][faulted] = "toss"
            done = ~np.isin(res_kind, ONGOING)
            ends = a[done]
            ending[ends] = res_kind[done]
            won = np.isin(res_kind[done], _HITTER_WINS)
            lost = np.isin(res_kind[done], _RECEIVER_WINS)
            winner[ends] = np.where(won, e, np.where(lost, 1 - e, -1))
            live[ends] = False
            if done.any():
                report(int(done.sum()))
        rows.extend(round_rows)
    shots = pd.concat([pd.DataFrame(r) for r in rows], ignore_index=True)
    shots["rally"] += start
    shots = shots.sort_values(["rally", "shot"], kind="stable").reset_index(drop=True)
    previous = shots.groupby("rally")["shot_type"].shift(1)
    shots.insert(7, "replying_to", np.where(shots["serve"] == "", previous.fillna(""), ""))
    names = np.array([p.name for p in players], dtype=object)
    length = shots.groupby("rally")["shot"].max().reindex(rally).to_numpy()
    rallies = pd.DataFrame(
        {
            "rally": rally,
            "server": names[server],
            "side": side,
            "shots": length,
            "ending": ending.astype(str),
            "winner": np.where(winner >= 0, names[np.maximum(winner, 0)], ""),
        }
    )
    return shots, rallies


def _rows(
    a,
    shot,
    e,
    players,
    kind,
    side,
    entries,
    entry_of,
    incoming,
    info,
    intended,
    aimed,
    swing,
    result,
    reachable,
    res_kind,
    out_reason,
    landed_in,
    contact,
):
    """One round's rows for one hitter; positions turned to the court frame."""
    pl = players[e]
    flip = _FLIP if e == 1 else np.ones(3)
    m = result.metrics
    p_c = incoming.position * flip
    top_in, side_in = topspin_sidespin(incoming.velocity, incoming.spin)
    serve = kind != ""
    hand = np.where(serve, "", contact_side(incoming.position[:, 1], pl))
    # the table gives a landing only to a ball that passes the net: none for one stopped by
    # it, or one that touches down on the hitter's own side (the chain keeps that touch)
    stopped = np.isin(m["outcome"], ("net", "miss"))
    land = np.stack([m["land_x_m"], m["land_y_m"]], axis=1) * flip[:2]
    land[stopped] = np.nan
    depth = np.where(stopped, np.nan, m["land_depth_m"])
    side_margin = np.where(stopped, np.nan, m["land_side_margin_m"])
    n = a.size
    next_h = np.full(n, np.nan)
    next_t = np.full(n, np.nan)
    li = np.flatnonzero(landed_in)
    next_h[li] = np.where(contact.found, contact.position[:, 2], np.nan)
    next_t[li] = np.where(contact.found, contact.t, np.nan)
    stroke_names = np.array([s.stroke_name for s in entries], dtype=object)[entry_of]
    row = {
        "rally": a,
        "shot": shot,
        "player": np.full(n, pl.name, dtype=object),
        "end": np.full(n, pl.end, dtype=object),
        "serve": kind.astype(str),
        "serve_side": np.where(serve, side, ""),
        "shot_type": result.labels.astype(object),
        "stroke": stroke_names,
        "contact_x_m": p_c[:, 0],
        "contact_y_m": p_c[:, 1],
        "contact_height_m": incoming.position[:, 2],
        "contact_behind_baseline_m": -incoming.position[:, 0] - court.HALF_LENGTH,
        "contact_phase": info["phase"][a].astype(str),
        "contact_side": hand,
        "above_shoulder": ~serve & (incoming.position[:, 2] > pl.shoulder_height),
        "in_preferred_band": ~serve
        & (incoming.position[:, 2] >= pl.contact_band[0])
        & (incoming.position[:, 2] <= pl.contact_band[1]),
        "incoming_speed_kmh": np.linalg.norm(incoming.velocity, axis=1) / KMH,
        "incoming_topspin_rpm": top_in / RPM,
        "incoming_sidespin_rpm": side_in / RPM,
        "incoming_spin_rpm": np.linalg.norm(incoming.spin, axis=1) / RPM,
        "outgoing_speed_kmh": m["impact_speed_mps"] / KMH,
        "outgoing_topspin_rpm": m["impact_topspin_rpm"],
        "outgoing_sidespin_rpm": m["impact_sidespin_rpm"],
        "outgoing_spin_rpm": m["impact_spin_rpm"],
        "launch_deg": m["impact_launch_deg"],
        "intended_x_m": (intended * flip[:2])[:, 0],
        "intended_y_m": (intended * flip[:2])[:, 1],
        "aim_x_m": (aimed * flip[:2])[:, 0],
        "aim_y_m": (aimed * flip[:2])[:, 1],
        "aim_solved": reachable,
        "net_clearance_m": m["net_clearance_m"],
        "land_x_m": land[:, 0],
        "land_y_m": land[:, 1],
        "land_depth_m": depth,
        "land_side_margin_m": side_margin,
        "bounce_apex_m": m["bounce_apex_m"],
        "outcome": m["outcome"].astype(str),
        "result": res_kind.astype(str),
        "unreached_reason": out_reason.astype(str),
        "reply_height_m": next_h,
        "reply_t_s": next_t,
        "head_speed_kmh": swing.head_speed / KMH,
        "swing_path_deg": np.degrees(swing.swing_path),
        "swing_direction_deg": np.degrees(swing.swing_direction),
        "face_tilt_deg": np.degrees(swing.face_tilt),
        "face_azimuth_deg": np.degrees(swing.face_azimuth),
        "racket_roll_deg": np.degrees(swing.racket_roll),
        "impact_from_butt_m": swing.impact_from_butt,
        "impact_offaxis_m": swing.impact_offaxis,
    }
    # the exact chain inputs in the hitter's own frame (SI), for replaying a shot
    for name, arr in (
        ("pos", incoming.position),
        ("vel", incoming.velocity),
        ("spin", incoming.spin),
    ):
        for c, axis in enumerate("xyz"):
            row[f"chain_{name}_{axis}"] = arr[:, c]
    return row


def swing_of(frame):
    """The swings of rows of a shot table (SI), to replay shots through the chain."""
    return Swing(
        head_speed=frame["head_speed_kmh"].to_numpy() * KMH,
        swing_path=np.radians(frame["swing_path_deg"].to_numpy()),
        swing_direction=np.radians(frame["swing_direction_deg"].to_numpy()),
        face_tilt=np.radians(frame["face_tilt_deg"].to_numpy()),
        face_azimuth=np.radians(frame["face_azimuth_deg"].to_numpy()),
        racket_roll=np.radians(frame["racket_roll_deg"].to_numpy()),
        impact_from_butt=frame["impact_from_butt_m"].to_numpy(),
        impact_offaxis=frame["impact_offaxis_m"].to_numpy(),
    )


def incoming_of(frame):
    """The incoming balls of rows of a shot table in their hitters' chain frames (SI)."""
    cols = {n: frame[[f"chain_{n}_{a}" for a in "xyz"]].to_numpy() for n in ("pos", "vel", "spin")}
    return BallState(cols["pos"], cols["vel"], cols["spin"])


# ------------------------------------------------------------------------- summary

#: Quantiles reported for distributions.
QUANTILES = (0.1, 0.25, 0.5, 0.75, 0.9)
#: Edges of the contact-height histogram [m].
HEIGHT_EDGES_M = tuple(float(v) for v in np.round(np.arange(0.0, 3.001, 0.1), 2))
#: Depth zones of a rally ball's landing, by distance inside the baseline [m] (common practice:
#: "deep" is the last 2.5 m before the baseline; "short" is inside the service line).
DEPTH_ZONES = (("long", -np.inf, 0.0), ("deep", 0.0, 2.5), ("middle", 2.5, 5.485))
#: Width zones by distance inside the nearest singles sideline [m].
WIDTH_ZONES = (("wide", -np.inf, 0.0), ("near the line", 0.0, 1.0), ("off centre", 1.0, 2.0))
ERROR_RESULTS = ("error", "fault", "double_fault")
WINNING_RESULTS = ("winner", "ace")


def _quantiles(values):
    values = np.asarray(values, float)
    values = values[np.isfinite(values)]
    if values.size == 0:
        return {f"p{int(q * 100)}": None for q in QUANTILES}
    return {f"p{int(q * 100)}": float(np.quantile(values, q)) for q in QUANTILES}


def _zones(values, zones, last):
    values = np.asarray(values, float)
    values = values[np.isfinite(values)]
    out = {}
    for name, lo, hi in zones:
        out[name] = (
            int(((values >= lo) & (values < hi)).sum())
            if lo > -np.inf
            else int((values < hi).sum())
        )
    out[last] = int((values >= zones[-1][2]).sum())
    return out


def summarize(run):
    """The summary of a :class:`RallyRun` as a JSON-ready dict: points, endings, errors and
    winners by shot type, landing depth and width, contact heights (above the shoulder, in the
    preferred range), and the spin exchange. Every count adds up to the shot table."""
    shots, rallies = run.shots, run.rallies
    players = run.patterns.players
    names = [p.name for p in players]
    won = rallies["winner"].value_counts()
    summary = {
        "patterns": run.patterns.name,
        "club": run.patterns.club,
        "rallies": run.n,
        "seed": run.seed,
        "max_shots": run.max_shots,
        "shots": int(len(shots)),
        "players": {
            p.name: {
                "end": p.end,
                "handedness": p.handedness,
                "height_m": p.height,
                "shoulder_height_m": p.shoulder_height,
                "shoulder_height_source": p.shoulder_source,
                "preferred_contact_height_m": list(p.contact_band),
                "timing": p.timing,
                "home_behind_baseline_m": p.home_behind,
                "deepest_behind_baseline_m": p.deepest_behind,
            }
            for p in players
        },
        "points": {name: int(won.get(name, 0)) for name in names},
        "unfinished": int((rallies["ending"] == "unfinished").sum()),
        "endings": {k: int((rallies["ending"] == k).sum()) for k in ENDINGS},
        "rally_length_shots": {
            "mean": float(rallies["shots"].mean()),
            **_quantiles(rallies["shots"]),
            "max": int(rallies["shots"].max()),
        },
    }
    summary["points_share"] = {
        name: summary["points"][name] / max(1, run.n - summary["unfinished"]) for name in names
    }
    by_type = []
    for (player, label), g in shots.groupby(["player", "shot_type"], sort=False):
        outcome = g["outcome"]
        errors = int(g["result"].isin(ERROR_RESULTS).sum())
        by_type.append(
            {
                "player": player,
                "shot_type": label,
                "serve": str(g["serve"].iloc[0]),
                "shots": int(len(g)),
                **{
                    o: int((outcome == o).sum())
                    for o in ("in", "net", "long", "wide", "out", "miss")
                },
                "errors": errors,
                "error_rate": errors / len(g),
                "winners": int(g["result"].isin(WINNING_RESULTS).sum()),
            }
        )
    by_type.sort(key=lambda r: (names.index(r["player"]), r["serve"] == "", r["shot_type"]))
    summary["by_shot_type"] = by_type
    rally_balls = shots[shots["serve"] == ""]
    depth, width, height, spin = {}, {}, {}, {}
    for p in players:
        mine = rally_balls[rally_balls["player"] == p.name]
        landed = mine[np.isfinite(mine["land_depth_m"])]
        depth[p.name] = {
            "landed": int(len(landed)),
            "quantiles_m": _quantiles(landed["land_depth_m"]),
            "zones": _zones(landed["land_depth_m"], DEPTH_ZONES, "short"),
        }
        width[p.name] = {
            "landed": int(len(landed)),
            "side_margin_quantiles_m": _quantiles(landed["land_side_margin_m"]),
            "zones": _zones(landed["land_side_margin_m"], WIDTH_ZONES, "centre"),
        }
        h = mine["contact_height_m"].to_numpy()
        counts, _ = np.histogram(h, bins=HEIGHT_EDGES_M)
        height[p.name] = {
            "contacts": int(len(mine)),
            "shoulder_height_m": p.shoulder_height,
            "above_shoulder": int(mine["above_shoulder"].sum()),
            "above_shoulder_share": float(mine["above_shoulder"].mean()) if len(mine) else None,
            "in_preferred_range_share": (
                float(mine["in_preferred_band"].mean()) if len(mine) else None
            ),
            "quantiles_m": _quantiles(h),
            "phase": {
                ph: int((mine["contact_phase"] == ph).sum()) for ph in ("rise", "apex", "drop")
            },
            "histogram": {
                "edges_m": list(HEIGHT_EDGES_M),
                "counts": [int(c) for c in counts],
                "below": int((h < HEIGHT_EDGES_M[0]).sum()),
                "above": int((h >= HEIGHT_EDGES_M[-1]).sum()),
            },
        }
        t_in = mine["incoming_topspin_rpm"].to_numpy()
        t_out = mine["outgoing_topspin_rpm"].to_numpy()
        opp = rally_balls[rally_balls["player"] != p.name]
        spin[p.name] = {
            "shots": int(len(mine)),
            "incoming_topspin_rpm": _quantiles(t_in) | {"mean": _mean(t_in)},
            "outgoing_topspin_rpm": _quantiles(t_out) | {"mean": _mean(t_out)},
            "reversed_share": float(np.mean(np.sign(t_out) != np.sign(t_in)))
            if t_in.size
            else None,
            "topspin_at_opponent_contact_rpm": _mean(opp["incoming_topspin_rpm"]),
        }
    summary["against"] = [
        {
            "player": player,
            "replying_to": label,
            "shots": int(len(g)),
            "contact_height_median_m": float(g["contact_height_m"].median()),
            "above_shoulder_share": float(g["above_shoulder"].mean()),
            "error_rate": float(g["result"].isin(ERROR_RESULTS).mean()),
        }
        for (player, label), g in rally_balls.groupby(["player", "replying_to"], sort=True)
    ]
    summary["depth"] = depth
    summary["width"] = width
    summary["contact_height"] = height
    carried = {n: spin[n]["topspin_at_opponent_contact_rpm"] for n in names}
    finite = {n: v for n, v in carried.items() if v is not None}
    summary["spin_exchange"] = {
        "players": spin,
        "dominant": max(finite, key=finite.get) if finite else None,
        "rule": (
            "the player whose rally balls carry more topspin (mean, rpm) at the opponent's "
            "contact; reversed_share: shots whose outgoing spin sense (topspin or backspin, "
            "relative to the ball's travel) is opposite to the incoming ball's"
        ),
    }
    return _json_ready(summary)


def _json_ready(value):
    """Numbers that JSON can hold: NaN and infinities become None, numpy scalars plain."""
    if isinstance(value, dict):
        return {k: _json_ready(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_json_ready(v) for v in value]
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def _mean(values):
    values = np.asarray(values, float)
    values = values[np.isfinite(values)]
    return float(values.mean()) if values.size else None


def summary_lines(summary):
    """The summary as text lines for the terminal."""
    names = list(summary["players"])
    length = summary["rally_length_shots"]
    lines = [
        f"{summary['patterns']} ({summary['club']}): {summary['rallies']} rallies, seed "
        f"{summary['seed']}, at most {summary['max_shots']} shots",
        "points: "
        + ", ".join(
            f"{n} {summary['points'][n]} ({summary['points_share'][n] * 100:.1f} %)" for n in names
        )
        + f"; unfinished {summary['unfinished']}",
        "endings: "
        + ", ".join(f"{k.replace('_', ' ')} {v}" for k, v in summary["endings"].items()),
        f"rally length: mean {length['mean']:.1f} shots, median {length['p50']:.0f}, "
        f"longest {length['max']}",
        "",
        f"{'player':<18} {'shot type':<24} {'shots':>6} {'net':>5} {'long':>5} {'wide':>5} "
        f"{'out':>4} {'error %':>7} {'winners':>7}",
    ]
    for r in summary["by_shot_type"]:
        lines.append(
            f"{r['player']:<18} {r['shot_type']:<24} {r['shots']:>6} {r['net']:>5} {r['long']:>5} "
            f"{r['wide']:>5} {r['out']:>4} {r['error_rate'] * 100:>7.1f} {r['winners']:>7}"
        )
    lines.append("")
    for n in names:
        h = summary["contact_height"][n]
        q = h["quantiles_m"]
        share = h["above_shoulder_share"]
        band = summary["players"][n]["preferred_contact_height_m"]
        if share is None:
            continue
        lines.append(
            f"{n}: contact height median {q['p50']:.2f} m "
            f"(10-90 %: {q['p10']:.2f}-{q['p90']:.2f}); "
            f"above the shoulder ({h['shoulder_height_m']:.2f} m) {share * 100:.1f} %; in the "
            f"preferred {band[0]:.2f}-{band[1]:.2f} m {h['in_preferred_range_share'] * 100:.1f} %"
        )
    for n in names:
        d = summary["depth"][n]
        if not d["landed"]:
            continue
        z = d["zones"]
        side = summary["width"][n]["side_margin_quantiles_m"]["p50"]
        lines.append(
            f"{n}: rally balls landing deep (last 2.5 m) {z['deep'] / d['landed'] * 100:.1f} %, "
            f"short of the service line {z['short'] / d['landed'] * 100:.1f} %, long "
            f"{z['long'] / d['landed'] * 100:.1f} %; median depth {d['quantiles_m']['p50']:.2f} m "
            f"inside the baseline, median {side:.2f} m inside the sideline"
        )
    lines.append("")
    lines.append(
        f"{'player':<18} {'replying to':<26} {'shots':>6} {'contact':>8} {'above':>9} "
        f"{'error %':>7}"
    )
    lines.append(f"{'':<18} {'':<26} {'':>6} {'median m':>8} {'shoulder':>9} {'':>7}")
    for r in summary["against"]:
        lines.append(
            f"{r['player']:<18} {r['replying_to']:<26} {r['shots']:>6} "
            f"{r['contact_height_median_m']:>8.2f} {r['above_shoulder_share'] * 100:>8.1f}% "
            f"{r['error_rate'] * 100:>7.1f}"
        )
    lines.append("")
    sx = summary["spin_exchange"]
    for n in names:
        s = sx["players"][n]
        if not s["shots"]:
            continue
        lines.append(
            f"{n}: topspin in {s['incoming_topspin_rpm']['mean']:+.0f} rpm, out "
            f"{s['outgoing_topspin_rpm']['mean']:+.0f} rpm (mean; - is backspin), spin sense "
            f"reversed on {s['reversed_share'] * 100:.1f} % of shots"
        )
    if sx["dominant"]:
        lines.append(
            f"spin exchange: {sx['dominant']} dominates (their balls reach the opponent with more "
            "topspin)"
        )
    return lines
