"""Aiming: the swing or the ball-machine setting that puts the ball on a target.

Both solvers are batch-native: N targets (or N incoming balls) are solved together by a damped
Gauss-Newton iteration whose Jacobian comes from finite differences, all perturbed shots of all
targets flown in one call of the chain. Free parameters stay inside their bounds (the swing's
plausible range, or the machine's limits); a target that cannot be reached within them is
reported with the nearest landing found and the reason, never silently clipped.

Targets are in the court frame of the shot: for strokes the hitter is at the near end and hits
toward +x; a ball machine may stand at either end (a machine at x > 0 feeds toward -x and its
results are reported in the court frame).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from rallyarc import court, kinematics, units
from rallyarc.shot import BallState, Swing, launch, simulate
from rallyarc.units import KMH, RPM

#: Landing accuracy the solvers aim for [m] (the round-trip tests require 5 cm).
LAND_TOL_M = 0.02
#: Accuracy of a requested net clearance or height at the player [m].
HEIGHT_TOL_M = 0.02


@dataclass
class AimResult:
    """Solved settings for N targets.

    ``settings`` maps a parameter name to ``(N,)`` SI values; ``reachable`` ``(N,)`` bool;
    ``reason`` ``(N,)`` str ("" when reachable); ``result`` the chain run at the solution (the
    nearest reachable shot when unreachable), with metrics in the court frame of the shot.
    """

    settings: dict
    reachable: np.ndarray
    reason: np.ndarray
    result: object
    target_x: np.ndarray
    target_y: np.ndarray
    iterations: int
    mirrored: bool = False

    def landing(self):
        """Landing points (N, 2) in the court frame."""
        m = self.result.metrics
        pts = np.stack([m["land_x_m"], m["land_y_m"]], axis=1)
        return -pts if self.mirrored else pts

    def trajectory_frame(self, dt=0.005):
        """Trajectories of the solved shots in the court frame (see ShotResult)."""
        frame = self.result.trajectory_frame(dt)
        if self.mirrored:
            for col in ("x_m", "y_m", "vx_mps", "vy_mps", "spin_x_rpm", "spin_y_rpm"):
                frame[col] = -frame[col]
        return frame

    def miss_distance(self):
        land = self.landing()
        return np.hypot(land[:, 0] - self.target_x, land[:, 1] - self.target_y)


def _solve(evaluate, p0, lo, hi, scale, iterations=30):
    """Damped Gauss-Newton (Levenberg-Marquardt) on N independent square systems
    ``evaluate(P) = 0``, with the parameters kept inside ``[lo, hi]``.

    ``evaluate(P, idx)`` takes parameters ``P`` of the points ``idx`` (indices into the N
    systems), possibly stacked several times (``P`` has ``r * len(idx)`` rows, block after
    block), and returns residuals of the same shape already divided by their tolerances, so a
    point is solved when the sum of squares is at most 1. Each iteration evaluates the trial
    points of the systems still open and their k forward perturbations in one stacked call, so
    they all fly together; a solved system, or one whose damping has grown past any useful step,
    is left alone. Returns ``(p, solved, iterations)``.
    """
    p = np.clip(np.array(p0, float), lo, hi)
    n, k = p.shape
    h = 1e-4 * scale

    def residual_and_jacobian(q, idx):
        # perturb downward at the upper bound so that every perturbed point stays in range
        m = len(idx)
        dirs = np.where(q + h >= hi, -1.0, 1.0)
        stack = [q] + [q + np.eye(k)[j] * (h * dirs) for j in range(k)]
        res = evaluate(np.concatenate(stack), idx).reshape(k + 1, m, k)
        jac = (res[1:] - res[0][None]) / (h * dirs).T[:, :, None]  # (k params, m, k eqs)
        jac = np.transpose(jac, (1, 2, 0))  # (m, k eqs, k params)
        return res[0], np.where(np.isfinite(jac), jac, 0.0)

    r, jac = residual_and_jacobian(p, np.arange(n))
    cost = np.sum(r**2, axis=1)
    lam = np.full(n, 1e-2)
    done = 0
    while done < iterations:
        open_ = np.flatnonzero((cost > 1.0) & (lam < 1e8))
        if open_.size == 0:
            break
        done += 1
        jo, ro = jac[open_], r[open_]
        jt = np.transpose(jo, (0, 2, 1))
        jtj = jt @ jo
        damp = lam[open_, None] * (np.einsum("nii->ni", jtj) + 1e-9)
        step = np.linalg.solve(jtj + damp[:, :, None] * np.eye(k), -(jt @ ro[:, :, None]))
        trial = np.clip(p[open_] + np.clip(step[:, :, 0], -5 * scale, 5 * scale), lo, hi)
        r_t, jac_t = residual_and_jacobian(trial, open_)
        cost_t = np.sum(r_t**2, axis=1)
        better = cost_t < cost[open_]
        won = open_[better]
        p[won], r[won], jac[won], cost[won] = (
            trial[better],
            r_t[better],
            jac_t[better],
            cost_t[better],
        )
        lam[open_] = np.where(better, lam[open_] * 0.3, lam[open_] * 10.0)
    return p, cost <= 1.0, done


# ---------------------------------------------------------------------------- strokes

_SWING_BOUNDS = {
    "face_tilt": (math.radians(-40.0), math.radians(50.0), math.radians(1.0)),
    "swing_direction": (math.radians(-45.0), math.radians(45.0), math.radians(1.0)),
    "head_speed": (3.0, 60.0, 1.0),
    "swing_path": (math.radians(-50.0), math.radians(70.0), math.radians(1.0)),
}
STYLES = {"tilt": ("face_tilt", "swing_direction"), "speed": ("head_speed", "swing_direction")}


def aim_stroke(
    incoming,
    stroke,
    conditions,
    target_x,
    target_y,
    free="tilt",
    clearance=None,
    receiver_height=None,
    which=None,
):
    """Solve a stroke's free swing parameters so that the ball lands on target.

    Parameters
    ----------
    incoming : BallState
        The ball at contact, one or N (a serve uses its toss when ``None``).
    stroke : rallyarc.domain.Stroke, or a sequence of them
        The stroke style (one for every target, or one per target, or K styles chosen per
        target by ``which``); its other swing values are kept. Targets of different styles
        solve together in one batch.
    target_x, target_y : float or array (N,)
        Landing targets [m], court frame (the hitter at the near end).
    free : {"tilt", "speed"}
        Solve face tilt and swing direction, or head speed and swing direction. The face
        azimuth turns with the swing direction (the stroke's offset between them is kept).
    clearance, receiver_height : float or array (N,), optional
        Also meet a net clearance [m] or a ball height at the receiver's plane [m]; the third
        free parameter is then head speed (style "tilt") or face tilt (style "speed").
    which : int array (N,), optional
        For a sequence of K strokes: the index of each target's stroke.

    Returns
    -------
    AimResult
    """
    if free not in STYLES:
        raise ValueError(f"free must be one of {', '.join(STYLES)}")
    if clearance is not None and receiver_height is not None:
        raise ValueError("give a net clearance or a receiver height, not both")
    tx, ty = np.broadcast_arrays(
        np.atleast_1d(np.asarray(target_x, float)), np.atleast_1d(np.asarray(target_y, float))
    )
    names = list(STYLES[free])
    extra = clearance if clearance is not None else receiver_height
    extra_key = "net_clearance_m" if clearance is not None else "receiver_height_m"
    if extra is not None:
        names.append("head_speed" if free == "tilt" else "face_tilt")
        extra = np.broadcast_to(np.asarray(extra, float), tx.shape)
    n = tx.size
    several = isinstance(stroke, list | tuple)
    styles = list(stroke) if several else [stroke]
    if which is None:
        if several and len(styles) != n:
            raise ValueError(f"give one stroke or one per target ({n}), not {len(styles)}")
        which = np.arange(n) if several else np.zeros(n, int)
    which = np.broadcast_to(np.asarray(which, int), (n,))
    if incoming is None:
        from rallyarc.shot import serve_states

        toss = serve_states(styles)
        incoming = BallState(toss.position[which], toss.velocity[which], toss.spin[which])
    state = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    per_style = Swing.from_strokes(styles)
    base = Swing(**{f: getattr(per_style, f)[which] for f in Swing.FIELDS})
    offset = base.face_azimuth - base.swing_direction
    serve = np.array([s.kind == "serve" for s in styles])[which]
    lo = np.array([_SWING_BOUNDS[k][0] for k in names])
    hi = np.array([_SWING_BOUNDS[k][1] for k in names])
    scale = np.array([_SWING_BOUNDS[k][2] for k in names])

    def swings(p, idx):
        reps = p.shape[0] // len(idx)
        fields = {f: np.tile(getattr(base, f)[idx], reps) for f in Swing.FIELDS}
        for j, name in enumerate(names):
            fields[name] = p[:, j]
        fields["face_azimuth"] = fields["swing_direction"] + np.tile(offset[idx], reps)
        return Swing(**fields)

    def run(p, idx, record=False):
        reps = p.shape[0] // len(idx)
        st = BallState(
            *(np.tile(a[idx], (reps, 1)) for a in (state.position, state.velocity, state.spin))
        )
        return simulate(
            st, swings(p, idx), conditions, serve=np.tile(serve[idx], reps), record=record
        )

    def evaluate(p, idx):
        reps = p.shape[0] // len(idx)
        m = run(p, idx).metrics
        out = [
            (_finite(m["flight_ground_x_m"], -30.0) - np.tile(tx[idx], reps)) / LAND_TOL_M,
            (_finite(m["flight_ground_y_m"], 0.0) - np.tile(ty[idx], reps)) / LAND_TOL_M,
        ]
        if extra is not None:
            out.append((_height_value(m, extra_key) - np.tile(extra[idx], reps)) / HEIGHT_TOL_M)
        return np.stack(out, axis=1)

    p0 = np.stack([getattr(base, k) for k in names], axis=1).astype(float)
    x0, y0 = state.position[:, 0], state.position[:, 1]
    p0[:, names.index("swing_direction")] = np.arctan2(ty - y0, tx - x0)
    p0 = np.clip(p0, lo, hi)
    p, ok, iters = _solve(evaluate, p0, lo, hi, scale)
    result = run(p, np.arange(n), record=True)
    ok = ok & ~np.isin(result.metrics["outcome"], ("net", "miss"))
    reason = _reasons(
        result.metrics, ok, tx, p, lo, hi, names, extra_key if extra is not None else None, extra
    )
    settings = {name: p[:, j] for j, name in enumerate(names)}
    return AimResult(settings, ok, reason, result, tx, ty, iters)


def _finite(values, fallback):
    return np.where(np.isfinite(values), values, fallback)


def _height_value(m, key):
    """Clearance or receiver height, extended continuously where it is undefined."""
    value = m[key]
    if key == "receiver_height_m":
        # bounced twice before the plane: how far short, as a negative height
        short = m["bounce_second_x_m"] - (court.HALF_LENGTH + 1.0)
        value = np.where(np.isfinite(value), value, _finite(short, -5.0))
    return _finite(value, -2.0)


def _reasons(m, ok, tx, p, lo, hi, names, extra_key, extra):
    reason = np.full(ok.shape, "", dtype=object)
    at_bound = np.any((p <= lo + 1e-9) | (p >= hi - 1e-9), axis=1)
    for i in np.flatnonzero(~ok):
        land = m["land_x_m"][i]
        if m["outcome"][i] == "net":
            why = "net: within the style's range every nearby swing puts the ball into the net"
        elif np.isfinite(land) and land > tx[i] + LAND_TOL_M:
            why = "too long: the style cannot bring the ball down short enough"
        elif extra_key is not None and m["impact_spin_limit_reached"][i]:
            why = (
                "friction-only spin limit: the strings already grip the ball, so no swing of "
                "this style gives the spin the height target needs"
            )
        elif at_bound[i]:
            bounded = [names[j] for j in np.flatnonzero((p[i] <= lo + 1e-9) | (p[i] >= hi - 1e-9))]
            why = "outside the style's range of " + ", ".join(bounded)
        else:
            why = "no swing of this style found that meets every target"
        reason[i] = why
    return reason.astype(str)


# ---------------------------------------------------------------------------- ball machines


@dataclass(frozen=True)
class Machine:
    """A ball machine's limits, SI: speeds [m/s], spin [rad/s], angles [rad], height [m]."""

    name: str
    speed_min: float
    speed_max: float
    spin_max: float
    elevation_min: float
    elevation_max: float
    azimuth_max: float
    release_height: float
    source: str = ""


def load_machine(name):
    from rallyarc import config

    d = config.load("machines", name)
    return Machine(
        str(name),
        d["speed_min_kmh"] * KMH,
        d["speed_max_kmh"] * KMH,
        d["spin_max_rpm"] * RPM,
        math.radians(d["elevation_min_deg"]),
        math.radians(d["elevation_max_deg"]),
        math.radians(d["azimuth_max_deg"]),
        d["release_height_m"],
        d["source"],
    )


def _feed_state(origin, speed, elevation, azimuth, topspin):
    """Launch states toward +x (chain frame) from speed, elevation, azimuth and topspin."""
    velocity = kinematics.velocity(speed, elevation, azimuth)
    spin = kinematics.spin(topspin, 0.0, azimuth)
    pos = np.broadcast_to(origin, velocity.shape)
    return BallState(np.array(pos), velocity, spin)


def aim_feed(
    machine, position, conditions, target_x, target_y, topspin_rpm, speed=None, player_height=None
):
    """Solve a ball machine's speed, elevation and azimuth for target balls.

    Parameters
    ----------
    machine : Machine
    position : (x, y) of the machine on the court [m]; it releases at its ``release_height``
        and feeds toward the other end (a machine at x > 0 feeds toward -x).
    target_x, target_y : float or array (N,)
        Landing points [m], court frame.
    topspin_rpm : float or array (N,)
        The spin setting (negative: backspin) [rpm]; must lie within the machine's range.
    speed : float or array (N,), optional
        Launch speed [m/s]; then elevation and azimuth are solved.
    player_height : float or array (N,), optional
        Ball height at the player's contact plane [m] instead of a speed; then speed,
        elevation and azimuth are solved.

    Returns
    -------
    AimResult
        ``settings``: speed [m/s], elevation [rad], azimuth [rad] (court frame, from +x toward
        +y), topspin [rad/s].
    """
    if (speed is None) == (player_height is None):
        raise ValueError("give exactly one of speed and player_height")
    tx, ty = np.broadcast_arrays(
        np.atleast_1d(np.asarray(target_x, float)), np.atleast_1d(np.asarray(target_y, float))
    )
    n = tx.size
    mirrored = float(position[0]) > 0
    sign = -1.0 if mirrored else 1.0
    ctx, cty = sign * tx, sign * ty  # chain frame: feed toward +x
    origin = np.array([sign * position[0], sign * position[1], machine.release_height])
    spin = np.broadcast_to(np.asarray(topspin_rpm, float) * RPM, (n,)).copy()
    reason_pre = np.full(n, "", dtype=object)
    over_spin = np.abs(spin) > machine.spin_max + 1e-9
    reason_pre[over_spin] = (
        f"spin outside the machine's range (up to {machine.spin_max / RPM:.0f} rpm either way)"
    )
    spin = np.clip(spin, -machine.spin_max, machine.spin_max)
    names = ["elevation", "azimuth"]
    lo = [machine.elevation_min, -machine.azimuth_max]
    hi = [machine.elevation_max, machine.azimuth_max]
    scale = [math.radians(1.0), math.radians(1.0)]
    fixed_speed = None
    if speed is not None:
        fixed_speed = np.broadcast_to(np.asarray(speed, float), (n,)).copy()
        bad = (fixed_speed < machine.speed_min - 1e-9) | (fixed_speed > machine.speed_max + 1e-9)
        reason_pre[bad & (reason_pre == "")] = (
            f"speed outside the machine's range ({machine.speed_min * units.KMH_PER_MPS:.0f}-"
            f"{machine.speed_max * units.KMH_PER_MPS:.0f} km/h)"
        )
        fixed_speed = np.clip(fixed_speed, machine.speed_min, machine.speed_max)
    else:
        names.append("speed")
        lo.append(machine.speed_min)
        hi.append(machine.speed_max)
        scale.append(0.5)
        heights = np.broadcast_to(np.asarray(player_height, float), (n,))
    lo, hi, scale = np.array(lo), np.array(hi), np.array(scale)
    far = replace(conditions)

    def run(p, idx, record=False):
        reps = p.shape[0] // len(idx)
        sp = np.tile(fixed_speed[idx], reps) if fixed_speed is not None else p[:, 2]
        st = _feed_state(origin, sp, p[:, 0], p[:, 1], np.tile(spin[idx], reps))
        return launch(st, far, record=record)

    def evaluate(p, idx):
        reps = p.shape[0] // len(idx)
        m = run(p, idx).metrics
        out = [
            (_finite(m["flight_ground_x_m"], -30.0) - np.tile(ctx[idx], reps)) / LAND_TOL_M,
            (_finite(m["flight_ground_y_m"], 0.0) - np.tile(cty[idx], reps)) / LAND_TOL_M,
        ]
        if fixed_speed is None:
            target = np.tile(heights[idx], reps)
            out.append((_height_value(m, "receiver_height_m") - target) / HEIGHT_TOL_M)
        return np.stack(out, axis=1)

    dist = np.hypot(ctx - origin[0], cty - origin[1])
    p0 = np.stack(
        [np.full(n, math.radians(8.0)), np.arctan2(cty - origin[1], ctx - origin[0])]
        + ([] if fixed_speed is not None else [np.clip(2.0 * dist, lo[2], hi[2])]),
        axis=1,
    )
    p0 = np.clip(p0, lo, hi)
    p, ok, iters = _solve(evaluate, p0, lo, hi, scale)
    result = run(p, np.arange(n), record=True)
    ok = ok & (reason_pre == "") & (result.metrics["outcome"] != "net")
    reason = reason_pre.copy()
    at_lo, at_hi = p <= lo + 1e-9, p >= hi - 1e-9
    labels = {"elevation": "elevation", "azimuth": "sweep (azimuth)", "speed": "speed"}
    for i in np.flatnonzero(~ok & (reason == "")):
        bounded = [labels[names[j]] for j in np.flatnonzero(at_lo[i] | at_hi[i])]
        m = result.metrics
        if bounded:
            reason[i] = "outside the machine's " + ", ".join(bounded) + " range"
        elif m["outcome"][i] == "net":
            reason[i] = (
                "net: the setting that meets the targets sends the ball into the net; "
                "no setting in range both clears it and lands there"
            )
        else:
            reason[i] = "no machine setting found that meets every target"
    settings = {
        "speed": fixed_speed if fixed_speed is not None else p[:, 2],
        "elevation": p[:, 0],
        "azimuth": p[:, 1] + (math.pi if mirrored else 0.0),
        "topspin": spin,
    }
    settings["azimuth"] = (settings["azimuth"] + math.pi) % (2 * math.pi) - math.pi
    return AimResult(settings, ok, reason.astype(str), result, tx, ty, iters, mirrored)
