"""The result of the chain: per-shot metrics and the flight phases for dense output."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc.shot.metrics import BLOCKS, block_fields, missing_reason
from rallyarc.shot.state import BallState, Swing
from rallyarc.units import RPM


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

    def trajectory_of(self, shots):
        """The recorded trajectory of some of the result's shots ``shots`` (indices), as a
        trajectory of their own: sampling it costs what those shots cost."""
        return self.flight.trajectory.take(self.columns(shots))


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

    def _with(self, **fields):
        """A copy with some fields replaced."""
        return ShotResult(**{**self.__dict__, **fields})

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

    def sample(self, times, shots=None):
        """Position, velocity and spin of the shots ``shots`` (default every shot, ``(S,)``
        indices) at ``times`` (M,) after contact [s], and the phase index (0 before the bounce,
        1 after, -1 outside the shot), ``(M, S)``. The cost grows with the shots sampled, not
        with the shots of the result.
        """
        times = np.asarray(times, float)
        shots = np.arange(len(self)) if shots is None else np.asarray(shots, int).reshape(-1)
        before = self.before_bounce
        pos, vel, spin = before.trajectory_of(shots).sample(times)
        end0, end1 = (e[shots] for e in self.phase_ends())
        phase = np.where(times[:, None] <= end0[None, :], 0, -1)
        after = self.after_bounce
        j = np.flatnonzero(np.isin(shots, after.shots)) if after is not None else []
        if len(j):
            sub = after.trajectory_of(shots[j])
            p2, v2, s2 = sub.sample(times)
            late = (times[:, None] > end0[None, j]) & (times[:, None] <= end1[None, j])
            rows, cols = np.nonzero(late)
            pos[rows, j[cols]] = p2[rows, cols]
            vel[rows, j[cols]] = v2[rows, cols]
            spin[rows, j[cols]] = s2[rows, cols]
            phase[rows, j[cols]] = 1
        return pos, vel, spin, phase

    def path(self, i, dt=0.002):
        """One shot's path: times (M,), positions (M, 3) and phases (M,), with the contact,
        bounce and end points included exactly."""
        end0, end1 = self.phase_ends()
        t_end = end1[i] if np.isfinite(end1[i]) else end0[i]
        times = np.union1d(np.arange(0.0, t_end, dt), [0.0, end0[i], t_end])
        pos, _, _, phase = self.sample(times, [i])
        pos, phase = pos[:, 0], phase[:, 0]
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
        flight, receiver and outcome; each block's fields are its metrics
        (:mod:`rallyarc.shot.metrics`), missing values ``None``; ``missing`` gives the reason
        for each ``None`` (``"landing"`` for a whole block, ``"landing.box_depth_m"`` for a
        field)."""
        m = {k: v[i] for k, v in self.metrics.items()}

        def block(name):
            return {x.field: _plain(m[x.key]) for x in block_fields(name, m)}

        out = {
            "inputs": self._inputs(i),
            "impact": block("impact"),
            "net_crossing": block("net_crossing") if m["net_crossed_plane"] else None,
            "landing": block("landing") if np.isfinite(m["land_x_m"]) else None,
            "bounce": block("bounce") if m["bounce_occurred"] else None,
            "flight": block("flight"),
            "receiver": block("receiver"),
            "outcome": _plain(m["outcome"]),
        }
        out["missing"] = _missing(out)
        return out

    def _inputs(self, i):
        c = self.conditions
        inputs = {
            "label": str(self.labels[i]),
            "serve": bool(self.serve[i]),
            "contact_m": [float(v) for v in self.incoming.position[i]],
            "incoming_velocity_mps": [float(v) for v in self.incoming.velocity[i]],
            "incoming_spin_rpm": [float(v) / RPM for v in self.incoming.spin[i]],
        }
        sw = self.swing
        if sw is not None:
            inputs.update(
                {
                    "head_speed_mps": float(sw.head_speed[i]),
                    "swing_path_deg": float(np.degrees(sw.swing_path[i])),
                    "swing_direction_deg": float(np.degrees(sw.swing_direction[i])),
                    "face_tilt_deg": float(np.degrees(sw.face_tilt[i])),
                    "face_azimuth_deg": float(np.degrees(sw.face_azimuth[i])),
                    "racket_roll_deg": float(np.degrees(sw.racket_roll[i])),
                    "impact_from_butt_m": float(sw.impact_from_butt[i]),
                    "impact_offaxis_m": float(sw.impact_offaxis[i]),
                }
            )
        inputs.update(
            {
                "ball": c.ball.name,
                "racket": c.racket.name,
                "air": c.air.name,
                "air_density_kgm3": c.air.density,
                "surface": c.surface_name,
                "receiver_plane_m": c.receiver_plane_m,
                "singles": c.singles,
                "friction_only": c.friction_only,
                "bounce_model": c.bounce_model,
            }
        )
        return inputs

    def __repr__(self):
        labels = list(dict.fromkeys(str(v) for v in self.labels))
        shown = ", ".join(labels[:4]) + (", ..." if len(labels) > 4 else "")
        outcomes = dict(zip(*np.unique(self.metrics["outcome"], return_counts=True), strict=True))
        counts = ", ".join(f"{k} {int(v)}" for k, v in outcomes.items())
        return f"<ShotResult: {len(self)} shots ({shown}); {counts}>"


def _missing(record):
    """Why each null of a record is null: ``{"block": reason}`` or ``{"block.field": reason}``."""
    reasons = {}
    for name in BLOCKS:
        if name == "outcome" or name not in record:
            continue
        values = record[name]
        if values is None:
            reasons[name] = missing_reason(name)
            continue
        for field, value in values.items():
            if value is None:
                reasons[f"{name}.{field}"] = missing_reason(BLOCKS[name] + field)
    return reasons


def _plain(value):
    """A metric value as JSON holds it: bool, str, finite float or None."""
    if isinstance(value, np.bool_ | bool):
        return bool(value)
    if isinstance(value, str | np.str_):
        return str(value)
    value = float(value)
    return None if not np.isfinite(value) else value


def _nan(n):
    return np.full(n, np.nan)
