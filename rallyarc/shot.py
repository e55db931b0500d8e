"""The whole shot: impact -> flight -> bounce -> flight, for N shots in one vectorized call.

The hitter stands at the near end and hits toward +x. The ball meets the racket at the contact
point (the incoming ball's position), flies over or into the net, bounces once on the far side,
and flies on until it reaches the receiver's contact plane (a vertical plane
``receiver_plane_m`` behind the far baseline) or bounces a second time.

Ball-on-line rule: the ball's first touch of the court is modelled as a point directly below its
centre at the moment the centre is one radius above the court (no footprint, no skid mark). A
ball whose touch point lies on a line or inside it is in; the outer edge of each line is the
court's boundary (ITF Rules of Tennis, Rule 1). Margins are reported so that a shot within a
few centimetres of a line can be judged with that in mind.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc import court
from rallyarc.bounce.contact import bounce
from rallyarc.flight.integrate import PlaneEvent, apex, fly, ground_contact, net_plane
from rallyarc.impact.contact import hit
from rallyarc.impact.geometry import face_orientation, swing_velocity
from rallyarc.kinematics import topspin_sidespin
from rallyarc.units import RPM

OUTCOMES = ("in", "net", "long", "wide", "out", "miss")
#: Longest flight of one phase [s].
T_MAX = 12.0


@dataclass(frozen=True)
class BallState:
    """N balls: centre position [m], velocity [m/s] and spin [rad/s], each ``(N, 3)``."""

    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray

    @classmethod
    def of(cls, position, velocity, spin, n=None):
        arrays = [np.atleast_2d(np.asarray(a, float)) for a in (position, velocity, spin)]
        n = n or max(a.shape[0] for a in arrays)
        return cls(*(np.array(np.broadcast_to(a, (n, 3))) for a in arrays))

    def __len__(self):
        return self.position.shape[0]


@dataclass(frozen=True)
class Swing:
    """N swings in SI (see :class:`rallyarc.domain.Stroke`), each field ``(N,)``."""

    head_speed: np.ndarray
    swing_path: np.ndarray
    swing_direction: np.ndarray
    face_tilt: np.ndarray
    face_azimuth: np.ndarray
    racket_roll: np.ndarray
    impact_from_butt: np.ndarray
    impact_offaxis: np.ndarray

    FIELDS = (
        "head_speed",
        "swing_path",
        "swing_direction",
        "face_tilt",
        "face_azimuth",
        "racket_roll",
        "impact_from_butt",
        "impact_offaxis",
    )

    @classmethod
    def from_strokes(cls, strokes, n=None, **overrides):
        """Stack strokes (or repeat one) into a batch; ``overrides`` set fields to arrays."""
        strokes = list(strokes)
        values = {f: np.array([getattr(s, f) for s in strokes], float) for f in cls.FIELDS}
        n = n or max([len(strokes)] + [np.size(v) for v in overrides.values()])
        for key, value in overrides.items():
            if key not in cls.FIELDS:
                raise ValueError(f"unknown swing field {key!r}")
            values[key] = np.asarray(value, float)
        return cls(**{f: np.array(np.broadcast_to(values[f], (n,))) for f in cls.FIELDS})

    def __len__(self):
        return self.head_speed.shape[0]


def serve_states(strokes):
    """The toss of each serve as the incoming ball at contact."""
    pos = np.array([s.toss.contact for s in strokes], float)
    vel = np.array([s.toss.velocity() for s in strokes], float)
    spin = np.array([[0.0, s.toss.spin_rpm * RPM, 0.0] for s in strokes], float)
    return BallState(pos, vel, spin)


def _angle_below(velocity):
    return np.degrees(np.arctan2(-velocity[:, 2], np.linalg.norm(velocity[:, :2], axis=1)))


def _nan(n):
    return np.full(n, np.nan)


@dataclass(frozen=True)
class Phase:
    """One flight phase of some of the shots of a :class:`ShotResult`.

    ``shots`` ``(K,)`` are the indices (into the result) of the shots that have this phase, in
    increasing order; ``flight`` is their :class:`rallyarc.flight.integrate.FlightResult`, ball
    ``k`` of it being shot ``shots[k]``; ``end_t`` ``(K,)`` [s] is when each shot's drawn path
    leaves this phase (the net, the ground or the receiver's plane). The flight itself may go on
    past ``end_t`` (to the second bounce) so that the apex is found even beyond the receiver.
    """

    shots: np.ndarray
    flight: object
    end_t: np.ndarray

    def columns(self, shots):
        """Positions in this phase's flight of the result's shots ``shots`` ``(M,)``; a
        ``ValueError`` if any of them has no such phase."""
        shots = np.asarray(shots, int)
        col = np.searchsorted(self.shots, shots)
        if shots.size and (
            np.any(col >= self.shots.size) or not np.array_equal(self.shots[col], shots)
        ):
            raise ValueError("every shot must have this phase")
        return col


@dataclass
class ShotResult:
    """N whole shots: metrics per shot (``metrics``, a dict of ``(N,)`` arrays with units in
    their names) and the trajectories of each phase for dense output.

    ``labels`` name the shots (stroke variant names); ``serve`` marks serves. The flight to the
    first bounce is :attr:`before_bounce` (every shot), the flight after it
    :attr:`after_bounce` (only the shots that bounced past the net; ``None`` if none did).
    """

    labels: np.ndarray
    serve: np.ndarray
    metrics: dict
    before_bounce: Phase
    after_bounce: Phase | None
    conditions: object
    incoming: BallState
    swing: Swing

    def __len__(self):
        return len(self.labels)

    def end_t(self, i):
        """When shot ``i``'s drawn path ends [s]: at the receiver's plane or the second bounce
        if it bounced, else at the net or its landing."""
        after = self.after_bounce
        if after is not None:
            k = np.searchsorted(after.shots, i)
            if k < after.shots.size and after.shots[k] == i:
                return float(after.end_t[k])
        return float(self.before_bounce.end_t[i])

    def phase_ends(self):
        """Phase end times ``(N,)`` each: before the bounce, and after it (NaN: no bounce)."""
        end1 = _nan(len(self))
        if self.after_bounce is not None:
            end1[self.after_bounce.shots] = self.after_bounce.end_t
        return self.before_bounce.end_t, end1

    @property
    def outcome(self):
        return self.metrics["outcome"]

    def to_frame(self):
        """Metrics as a pandas DataFrame, one row per shot."""
        import pandas as pd

        frame = pd.DataFrame({"shot": np.arange(len(self)), "label": self.labels})
        for key, value in self.metrics.items():
            frame[key] = value
        return frame

    def sample(self, times):
        """Position, velocity and spin of every shot at ``times`` (M,) after contact [s],
        and the phase index (0 before the bounce, 1 after, -1 outside the shot), ``(M, N)``.
        """
        times = np.asarray(times, float)
        pos, vel, spin = self.before_bounce.flight.trajectory.sample(times)
        end0, end1 = self.phase_ends()
        phase = np.where(times[:, None] <= end0[None, :], 0, -1)
        if self.after_bounce is not None:
            idx = self.after_bounce.shots
            p2, v2, s2 = self.after_bounce.flight.trajectory.sample(times)
            after = (times[:, None] > end0[None, idx]) & (times[:, None] <= end1[None, idx])
            cols = idx[None, :].repeat(times.size, axis=0)
            rows = np.arange(times.size)[:, None].repeat(idx.size, axis=1)
            pos[rows[after], cols[after]] = p2[after]
            vel[rows[after], cols[after]] = v2[after]
            spin[rows[after], cols[after]] = s2[after]
            phase[rows[after], cols[after]] = 1
        return pos, vel, spin, phase

    def path(self, i, dt=0.002):
        """One shot's path: times (M,), positions (M, 3) and phases (M,), with the contact,
        bounce and end points included exactly."""
        end0, end1 = self.phase_ends()
        t_end = end1[i] if np.isfinite(end1[i]) else end0[i]
        times = np.union1d(np.arange(0.0, t_end, dt), [0.0, end0[i], t_end])
        pos, _, _, phase = self.sample(times)
        pos, phase = pos[:, i], phase[:, i]
        # the bounce point belongs to both phases
        if np.isfinite(end1[i]):
            k = int(np.searchsorted(times, end0[i]))
            bounce_pt = self.before_bounce.flight.position[i]
            times = np.insert(times, k + 1, end0[i])
            pos = np.insert(pos, k + 1, bounce_pt, axis=0)
            phase = np.insert(phase, k + 1, 1)
            pos[k] = bounce_pt
        return times, pos, phase

    def trajectory_frame(self, dt=0.005):
        """Trajectories sampled every ``dt`` seconds as a long DataFrame with units in the
        column names: shot, label, t_s, x_m, y_m, z_m, vx_mps, vy_mps, vz_mps, spin_x_rpm,
        spin_y_rpm, spin_z_rpm, spin_rpm, phase ("before_bounce" or "after_bounce")."""
        import pandas as pd

        if not dt > 0:
            raise ValueError("dt must be positive")
        end0, end1 = self.phase_ends()
        t_end = np.nanmax(np.where(np.isfinite(end1), end1, end0))
        times = np.arange(0.0, t_end + 0.5 * dt, dt)
        pos, vel, spin, phase = self.sample(times)
        rows, cols = np.nonzero(phase >= 0)
        order = np.lexsort((rows, cols))
        rows, cols = rows[order], cols[order]
        w = spin[rows, cols] / RPM
        return pd.DataFrame(
            {
                "shot": cols,
                "label": self.labels[cols],
                "t_s": times[rows],
                "x_m": pos[rows, cols, 0],
                "y_m": pos[rows, cols, 1],
                "z_m": pos[rows, cols, 2],
                "vx_mps": vel[rows, cols, 0],
                "vy_mps": vel[rows, cols, 1],
                "vz_mps": vel[rows, cols, 2],
                "spin_x_rpm": w[:, 0],
                "spin_y_rpm": w[:, 1],
                "spin_z_rpm": w[:, 2],
                "spin_rpm": np.linalg.norm(w, axis=1),
                "phase": np.where(phase[rows, cols] == 0, "before_bounce", "after_bounce"),
            }
        )

    def record(self, i):
        """One shot as a JSON-ready dict: inputs, impact, net_crossing, landing, bounce,
        receiver, outcome (the shape of ``rallyarc feed --json`` plus impact and bounce)."""
        m = {k: v[i] for k, v in self.metrics.items()}

        def f(key):
            value = m[key]
            if isinstance(value, np.bool_ | bool):
                return bool(value)
            if isinstance(value, str | np.str_):
                return str(value)
            value = float(value)
            return None if not np.isfinite(value) else value

        def block(keys, prefix):
            return {k[len(prefix) :]: f(k) for k in keys if k.startswith(prefix)}

        keys = list(self.metrics)
        sw = self.swing
        c = self.conditions
        inputs = {
            "label": str(self.labels[i]),
            "serve": bool(self.serve[i]),
            "contact_m": [float(v) for v in self.incoming.position[i]],
            "incoming_velocity_mps": [float(v) for v in self.incoming.velocity[i]],
            "incoming_spin_rads": [float(v) for v in self.incoming.spin[i]],
            "head_speed_mps": float(sw.head_speed[i]),
            "swing_path_deg": float(np.degrees(sw.swing_path[i])),
            "swing_direction_deg": float(np.degrees(sw.swing_direction[i])),
            "face_tilt_deg": float(np.degrees(sw.face_tilt[i])),
            "face_azimuth_deg": float(np.degrees(sw.face_azimuth[i])),
            "racket_roll_deg": float(np.degrees(sw.racket_roll[i])),
            "impact_from_butt_m": float(sw.impact_from_butt[i]),
            "impact_offaxis_m": float(sw.impact_offaxis[i]),
            "ball": c.ball.name,
            "racket": c.racket.name,
            "air": c.air.name,
            "air_density_kgm3": c.air.density,
            "surface": c.surface_name,
            "receiver_plane_m": c.receiver_plane_m,
            "singles": c.singles,
        }
        net = block(keys, "net_") if m["net_crossed_plane"] else None
        landing = block(keys, "land_") if np.isfinite(m["land_x_m"]) else None
        bounce_block = block(keys, "bounce_") if m["bounce_occurred"] else None
        return {
            "inputs": inputs,
            "impact": block(keys, "impact_"),
            "net_crossing": net,
            "landing": landing,
            "bounce": bounce_block,
            "flight": block(keys, "flight_"),
            "receiver": block(keys, "receiver_"),
            "outcome": f("outcome"),
        }


def judge_landing(land_x, land_y, contact_y, serve, singles=True):
    """Margins and the line call of landings of balls hit from the near end toward +x.

    A ball is in when its touch point (below its centre) lies on or inside the lines, whose
    outer edges bound the court (ITF Rules of Tennis, Rule 1). A serve must land in the
    service box diagonally opposite: the deuce box (y >= 0) from a contact at y < 0, the ad box
    otherwise. Returns ``land_depth_m``, ``land_side_margin_m``, ``land_service_box``,
    ``land_box_depth_m``, ``land_box_side_margin_m`` and ``land_call`` (in, long, wide or out
    for long and wide), each ``(N,)``.
    """
    land_x, land_y = np.asarray(land_x, float), np.asarray(land_y, float)
    serve = np.broadcast_to(np.asarray(serve, bool), land_x.shape)
    half_width = (court.SINGLES_WIDTH if singles else court.DOUBLES_WIDTH) / 2.0
    depth = court.HALF_LENGTH - land_x
    side = half_width - np.abs(land_y)
    box_y = np.where(np.asarray(contact_y) < 0, 1.0, -1.0)  # the target box's side of y
    box_depth = court.SERVICE_LINE - land_x
    box_side = np.minimum(court.SINGLES_WIDTH / 2.0 - box_y * land_y, box_y * land_y)
    depth_ok = np.where(serve, box_depth >= 0, depth >= 0)
    side_ok = np.where(serve, box_side >= 0, side >= 0)
    call = np.select(
        [depth_ok & side_ok, ~depth_ok & side_ok, depth_ok & ~side_ok],
        ["in", "long", "wide"],
        "out",
    )
    return {
        "land_depth_m": depth,
        "land_side_margin_m": side,
        "land_service_box": np.where(serve, np.where(box_y > 0, "deuce", "ad"), ""),
        "land_box_depth_m": np.where(serve, box_depth, np.nan),
        "land_box_side_margin_m": np.where(serve, box_side, np.nan),
        "land_call": call,
    }


def simulate(incoming, swing, conditions, labels=None, serve=None, record=True, rtol=1e-6):
    """Play N shots through the whole chain in one vectorized call.

    Parameters
    ----------
    incoming : BallState
        The ball arriving at the contact point, N balls (a feed, an opponent's shot, a toss).
    swing : Swing
        N swings.
    conditions : rallyarc.domain.Conditions
    labels : sequence of str, optional
        Names of the shots.
    serve : array (N,) of bool, optional
        Which shots are serves (landing judged against the service box diagonally opposite
        the server: the deuce box when the contact is at y < 0, the ad box otherwise).
    record : bool
        Keep trajectories for dense output (plots, tables). Metrics need no recording.
    rtol : float
        Flight integrator tolerance.

    Returns
    -------
    ShotResult
    """
    n = max(len(incoming), len(swing))
    if len(incoming) != n:
        incoming = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    if len(swing) != n:
        swing = Swing(**{f: np.broadcast_to(getattr(swing, f), (n,)) for f in Swing.FIELDS})
    labels = np.asarray(labels if labels is not None else [f"shot {i + 1}" for i in range(n)])
    labels = np.broadcast_to(labels, (n,)).astype(str)
    serve = np.broadcast_to(np.asarray(False if serve is None else serve, bool), (n,))
    ball, racket = conditions.ball, conditions.racket
    r = ball.radius

    # impact
    normal, axis = face_orientation(swing.face_tilt, swing.face_azimuth, swing.racket_roll)
    face_v = swing_velocity(swing.head_speed, swing.swing_path, swing.swing_direction)
    contact = hit(
        incoming.velocity,
        incoming.spin,
        face_v,
        normal,
        axis,
        racket.racket,
        swing.impact_from_butt,
        swing.impact_offaxis,
        ball.mass,
        r,
        ball.alpha,
        racket.string_restitution,
        racket.string_friction,
    )
    m = _impact_metrics(contact)
    result = launch(
        BallState(incoming.position, contact.velocity, contact.spin),
        conditions,
        labels=labels,
        serve=serve,
        record=record,
        rtol=rtol,
        approaching=contact.approaching,
        metrics=m,
    )
    return ShotResult(**{**result.__dict__, "incoming": incoming, "swing": swing})


def _impact_metrics(contact):
    m = {}
    v0, w0 = contact.velocity, contact.spin
    top0, side0 = topspin_sidespin(v0, w0)
    m["impact_speed_mps"] = np.linalg.norm(v0, axis=1)
    m["impact_launch_deg"] = -_angle_below(v0)
    m["impact_azimuth_deg"] = np.degrees(np.arctan2(v0[:, 1], v0[:, 0]))
    m["impact_spin_rpm"] = np.linalg.norm(w0, axis=1) / RPM
    m["impact_topspin_rpm"] = top0 / RPM
    m["impact_sidespin_rpm"] = side0 / RPM
    m["impact_regime"] = contact.regime
    m["impact_slip_linear_mps"] = contact.slip_linear_mps
    m["impact_slip_spin_mps"] = contact.slip_spin_mps
    m["impact_slip_ratio"] = contact.slip_ratio
    m["impact_spin_limit_reached"] = contact.spin_limit_reached
    m["impact_spin_ratio_out"] = contact.spin_ratio_out

    return m


def launch(
    start,
    conditions,
    labels=None,
    serve=None,
    record=True,
    rtol=1e-6,
    approaching=None,
    metrics=None,
):
    """Fly N balls from their launch (just after the racket, or out of a ball machine) over
    the net, bounce them and fly them to the receiver's plane; the metrics of :func:`simulate`
    without the impact block.

    Parameters
    ----------
    start : BallState
        Launch position [m], velocity [m/s] and spin [rad/s], ``(N, 3)`` each.
    """
    n = len(start)
    labels = np.asarray(labels if labels is not None else [f"shot {i + 1}" for i in range(n)])
    labels = np.broadcast_to(labels, (n,)).astype(str)
    serve = np.broadcast_to(np.asarray(False if serve is None else serve, bool), (n,))
    approaching = np.ones(n, bool) if approaching is None else approaching
    ball = conditions.ball
    params = conditions.flight_params()
    r = ball.radius
    m = {} if metrics is None else metrics
    v0, w0 = start.velocity, start.spin
    incoming = start
    if metrics is None:
        top0, side0 = topspin_sidespin(v0, w0)
        m["impact_speed_mps"] = np.linalg.norm(v0, axis=1)
        m["impact_launch_deg"] = -_angle_below(v0)
        m["impact_azimuth_deg"] = np.degrees(np.arctan2(v0[:, 1], v0[:, 0]))
        m["impact_spin_rpm"] = np.linalg.norm(w0, axis=1) / RPM
        m["impact_topspin_rpm"] = top0 / RPM
        m["impact_sidespin_rpm"] = side0 / RPM

    # flight to the first bounce
    far_plane = court.HALF_LENGTH + conditions.receiver_plane_m
    receiver = PlaneEvent("receiver", (1.0, 0.0, 0.0), far_plane, terminal=False, direction=1)
    events1 = [net_plane(1), receiver, apex("peak"), ground_contact(r)]
    first = fly(incoming.position, v0, w0, params, events1, t_max=T_MAX, rtol=rtol, record=record)
    net = first.events["net"]
    crossed = net.occurred & approaching
    net_y = np.where(crossed, net.position[:, 1], np.nan)
    net_top = court.net_height(np.nan_to_num(net_y), conditions.singles)
    clearance = np.where(crossed, net.position[:, 2] - r - net_top, np.nan)
    over = crossed & (clearance >= 0.0)
    m["net_crossed_plane"] = crossed
    m["net_height_m"] = np.where(crossed, net.position[:, 2], np.nan)
    m["net_top_m"] = np.where(crossed, net_top, np.nan)
    m["net_clearance_m"] = clearance
    m["net_y_m"] = net_y
    m["net_t_s"] = np.where(crossed, net.t, np.nan)
    peak = first.events["peak"]
    m["flight_peak_m"] = np.where(peak.occurred, peak.position[:, 2], start.position[:, 2])
    m["flight_peak_x_m"] = np.where(peak.occurred, peak.position[:, 0], start.position[:, 0])

    # a ball that meets the net stops there: it has no landing (the flight was carried on past
    # the net only to find where the ball would have gone, which is not reported)
    stopped = crossed & ~over
    ground = first.ended_by("ground")
    landed = ground & ~stopped
    land = first.position
    # where the free flight meets the ground, through the net if need be: a smooth function of
    # the launch for the aiming solvers, not a landing
    m["flight_ground_x_m"] = np.where(ground, land[:, 0], np.nan)
    m["flight_ground_y_m"] = np.where(ground, land[:, 1], np.nan)
    m["land_x_m"] = np.where(landed, land[:, 0], np.nan)
    m["land_y_m"] = np.where(landed, land[:, 1], np.nan)
    m["land_t_s"] = np.where(landed, first.t, np.nan)
    m.update(
        judge_landing(m["land_x_m"], m["land_y_m"], start.position[:, 1], serve, conditions.singles)
    )
    own_side = landed & (land[:, 0] <= 0)  # short of the net: margins to the far lines mean nothing
    for key in ("land_depth_m", "land_side_margin_m", "land_box_depth_m", "land_box_side_margin_m"):
        m[key] = np.where(own_side, np.nan, m[key])
    past_net = landed & over & (land[:, 0] > 0)
    outcome = np.where(past_net, m.pop("land_call"), "net").astype("<U4")
    outcome[~approaching] = "miss"
    m["outcome"] = outcome
    vin = first.velocity
    top_in, _ = topspin_sidespin(vin, first.spin)
    m["land_speed_mps"] = np.where(landed, np.linalg.norm(vin, axis=1), np.nan)
    m["land_angle_deg"] = np.where(landed, _angle_below(vin), np.nan)

    # phase ends: a ball that meets the net stops there
    end0 = np.where(crossed & ~over, net.t, first.t)

    # bounce
    bounced = past_net
    idx = np.flatnonzero(bounced)
    for key in (
        "speed_in_mps",
        "angle_in_deg",
        "speed_out_mps",
        "angle_out_deg",
        "kick_deg",
        "spin_in_rpm",
        "spin_out_rpm",
        "sidespin_in_rpm",
        "sidespin_out_rpm",
        "apex_m",
        "apex_x_m",
        "t_s",
        "x_m",
        "y_m",
        "second_x_m",
        "second_y_m",
    ):
        m[f"bounce_{key}"] = _nan(n)
    m["bounce_occurred"] = bounced
    m["bounce_apex_beyond_receiver"] = np.zeros(n, bool)
    m["bounce_regime"] = np.full(n, "", dtype="<U5")
    m["receiver_height_m"] = np.where(
        first.events["receiver"].occurred, first.events["receiver"].position[:, 2], np.nan
    )
    m["receiver_t_s"] = np.where(
        first.events["receiver"].occurred, first.events["receiver"].t, np.nan
    )
    m["receiver_y_m"] = np.where(
        first.events["receiver"].occurred, first.events["receiver"].position[:, 1], np.nan
    )
    m["receiver_before_bounce"] = first.events["receiver"].occurred & ~(land[:, 0] < far_plane)
    end1 = _nan(n)
    second = None
    if idx.size:
        surface = conditions.surface_for_ball()
        res = bounce(vin[idx], first.spin[idx], r, ball.alpha, surface)
        vb, wb = res.velocity, res.spin
        top_b, side_b = topspin_sidespin(vin[idx], wb)
        _, side_in = topspin_sidespin(vin[idx], first.spin[idx])
        angle_in = _angle_below(vin[idx])
        angle_out = -_angle_below(vb)
        m["bounce_t_s"][idx] = first.t[idx]
        m["bounce_x_m"][idx] = land[idx, 0]
        m["bounce_y_m"][idx] = land[idx, 1]
        m["bounce_speed_in_mps"][idx] = np.linalg.norm(vin[idx], axis=1)
        m["bounce_angle_in_deg"][idx] = angle_in
        m["bounce_speed_out_mps"][idx] = np.linalg.norm(vb, axis=1)
        m["bounce_angle_out_deg"][idx] = angle_out
        m["bounce_kick_deg"][idx] = angle_out - angle_in
        m["bounce_spin_in_rpm"][idx] = top_in[idx] / RPM
        m["bounce_spin_out_rpm"][idx] = top_b / RPM
        m["bounce_sidespin_in_rpm"][idx] = side_in / RPM
        m["bounce_sidespin_out_rpm"][idx] = side_b / RPM
        m["bounce_regime"][idx] = np.where(res.grip, "grip", "slide")

        # the free flight to the second bounce, so that the apex is found even where it lies
        # beyond the receiver's plane; the shot's path ends at that plane
        events2 = [
            PlaneEvent("receiver", (1.0, 0.0, 0.0), far_plane, terminal=False, direction=1),
            apex(),
            ground_contact(r),
        ]
        after = fly(
            land[idx],
            vb,
            wb,
            params,
            events2,
            t0=first.t[idx],
            t_max=T_MAX,
            rtol=rtol,
            record=record,
        )
        top = after.events["apex"]
        m["bounce_apex_m"][idx] = np.where(top.occurred, top.position[:, 2], r)
        m["bounce_apex_x_m"][idx] = np.where(top.occurred, top.position[:, 0], land[idx, 0])
        rec = after.events["receiver"]
        late = ~m["receiver_before_bounce"][idx] & rec.occurred
        j = idx[late]
        m["receiver_height_m"][j] = rec.position[late, 2]
        m["receiver_y_m"][j] = rec.position[late, 1]
        m["receiver_t_s"][j] = rec.t[late]
        twice = after.ended_by("ground")
        m["bounce_second_x_m"][idx[twice]] = after.position[twice, 0]
        m["bounce_second_y_m"][idx[twice]] = after.position[twice, 1]
        end1[idx] = np.where(rec.occurred, rec.t, after.t)
        m["bounce_apex_beyond_receiver"][idx] = top.occurred & rec.occurred & (top.t > rec.t)
        second = Phase(idx, after, end1[idx])
    m["receiver_reached"] = np.isfinite(m["receiver_height_m"])
    return ShotResult(
        labels=labels,
        serve=np.array(serve),
        metrics=m,
        before_bounce=Phase(np.arange(n), first, end0),
        after_bounce=second,
        conditions=conditions,
        incoming=incoming,
        swing=None,
    )


def play(strokes, conditions, incoming=None, record=True, **overrides):
    """Play named strokes (:class:`rallyarc.domain.Stroke`) against one incoming ball, or each
    serve against its own toss. ``incoming`` is a :class:`BallState` of one ball or one per
    stroke; ``overrides`` set swing fields to arrays (a sweep)."""
    strokes = list(strokes)
    swing = Swing.from_strokes(strokes, **overrides)
    n = len(swing)
    if len(strokes) == 1 and n > 1:
        strokes = strokes * n
    serve = np.array([s.kind == "serve" for s in strokes])
    toss = serve_states([s for s in strokes if s.toss is not None]) if serve.any() else None
    if incoming is None and not serve.all():
        raise ValueError("groundstrokes need an incoming ball")
    if incoming is not None:
        state = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    else:
        state = BallState(np.zeros((n, 3)), np.zeros((n, 3)), np.zeros((n, 3)))
    if toss is not None:
        k = np.flatnonzero(serve)
        state.position[k], state.velocity[k], state.spin[k] = (
            toss.position,
            toss.velocity,
            toss.spin,
        )
    return simulate(
        state, swing, conditions, labels=[s.name for s in strokes], serve=serve, record=record
    )
