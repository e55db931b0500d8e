"""Batch integrator: many balls in flight at once, with events located inside the step.

The scheme is the embedded Dormand-Prince 5(4) Runge-Kutta pair with a step size of its own for
every ball, in plain numpy. Balls that have finished drop out of the working arrays, so a batch
costs what its live balls cost. Events are planes ``n . x = c`` (the net, the ground, a receiver's
contact plane); each is located on the step that crosses it by the quintic Hermite interpolant
built from the positions, velocities and accelerations at both ends of the step.

References
----------
Dormand, J. R. and Prince, P. J. (1980), A family of embedded Runge-Kutta formulae,
J. Comput. Appl. Math. 6:19-26, doi:10.1016/0771-050X(80)90013-3.
Hairer, E., Norsett, S. P. and Wanner, G. (1993), Solving Ordinary Differential Equations I,
2nd ed., Springer, section II.4 (step size control, starting step size).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .forces import aerodynamic_acceleration, gravity_acceleration, spin_at

# Dormand-Prince 5(4) tableau.
_C = (0.0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1.0, 1.0)
_A = (
    (),
    (1 / 5,),
    (3 / 40, 9 / 40),
    (44 / 45, -56 / 15, 32 / 9),
    (19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729),
    (9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656),
    (35 / 384, 0.0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84),
)
# Fifth-order weights are the last row of _A (FSAL); the error weights are b5 - b4.
_E = (
    71 / 57600,
    0.0,
    -71 / 16695,
    71 / 1920,
    -17253 / 339200,
    22 / 525,
    -1 / 40,
)

#: Balls integrated together; numpy keeps batches of this size in cache.
DEFAULT_CHUNK = 16384


@dataclass(frozen=True)
class PlaneEvent:
    """A plane ``normal . x = offset`` that balls may cross.

    Parameters
    ----------
    name : str
        Key of the event in :attr:`FlightResult.events`.
    normal : array of 3
        Plane normal (need not be unit length).
    offset : float or array (N,)
        Plane offset [m]; an array gives every ball a plane of its own.
    terminal : bool
        Whether the flight ends at the crossing.
    direction : int
        +1 counts crossings where ``normal . x - offset`` increases, -1 where it decreases, 0 both.
    on : str
        ``"position"`` (default): the plane is in space, ``normal . x = offset``.
        ``"velocity"``: the plane is in velocity space, ``normal . v = offset``; with normal
        (0, 0, 1), offset 0 and direction -1 it is the apex of the flight (:func:`apex`).
    """

    name: str
    normal: tuple
    offset: object = 0.0
    terminal: bool = False
    direction: int = 0
    on: str = "position"

    def __post_init__(self):
        if self.direction not in (-1, 0, 1):
            raise ValueError("direction must be -1, 0 or +1")
        if self.on not in ("position", "velocity"):
            raise ValueError("on must be 'position' or 'velocity'")
        object.__setattr__(self, "normal", tuple(float(c) for c in self.normal))


def net_plane(direction=1):
    """The net plane x = 0, not terminal."""
    return PlaneEvent("net", (1.0, 0.0, 0.0), 0.0, terminal=False, direction=direction)


def ground_contact(radius):
    """Ground contact: the ball's centre at z = r while descending; terminal."""
    return PlaneEvent("ground", (0.0, 0.0, 1.0), radius, terminal=True, direction=-1)


def apex(name="apex"):
    """The top of the flight: vertical velocity passes from up to down; not terminal."""
    return PlaneEvent(name, (0.0, 0.0, 1.0), 0.0, terminal=False, direction=-1, on="velocity")


@dataclass
class EventRecord:
    """Where and when each ball crossed one event plane (first crossing)."""

    occurred: np.ndarray
    t: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray


@dataclass
class Trajectory:
    """Step knots of every ball, for dense output.

    ``t`` is ``(K, N)``, ``position``, ``velocity`` and ``acceleration`` are ``(K, N, 3)``. A ball
    that did not move on an iteration repeats its knot; sampling skips such empty segments.
    """

    t: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    acceleration: np.ndarray
    spin0: np.ndarray
    t0: np.ndarray
    spin_decay_rate: float

    def sample(self, times):
        """Positions, velocities and spins at ``times`` ``(M,)`` or ``(M, N)`` [s].

        Times outside a ball's flight are clamped to its ends. Returns arrays ``(M, N, 3)``.
        """
        tau, idx, cols, s, h = self._segments(times)
        x0, x1 = self.position[idx, cols], self.position[idx + 1, cols]
        v0, v1 = self.velocity[idx, cols], self.velocity[idx + 1, cols]
        a0, a1 = self.acceleration[idx, cols], self.acceleration[idx + 1, cols]
        hh = h[..., None]
        pos, vel = _hermite(s[..., None], hh, x0, v0, a0, x1, v1, a1)
        decay = np.exp(-self.spin_decay_rate * (tau - self.t0[None, :]))
        spin = self.spin0[None, :, :] * decay[..., None]
        return pos, vel, spin

    def take(self, cols):
        """The knots of some of the balls (indices ``cols``), as a trajectory of their own:
        sampling it costs what those balls cost."""
        return Trajectory(
            self.t[:, cols],
            self.position[:, cols],
            self.velocity[:, cols],
            self.acceleration[:, cols],
            self.spin0[cols],
            self.t0[cols],
            self.spin_decay_rate,
        )

    def sample_positions(self, times):
        """Positions alone at ``times`` ``(M,)`` or ``(M, N)`` [s], as :meth:`sample` gives
        them, at less cost (for searches over many sample times). Returns ``(M, N, 3)``."""
        _, idx, cols, s, h = self._segments(times)
        hh = h[..., None]
        return _hermite_position(
            s[..., None],
            self.position[idx, cols],
            hh * self.velocity[idx, cols],
            hh * hh * self.acceleration[idx, cols],
            self.position[idx + 1, cols],
            hh * self.velocity[idx + 1, cols],
            hh * hh * self.acceleration[idx + 1, cols],
        )

    def _segments(self, times):
        """Clamped times ``(M, N)``, the index of each one's step, the ball columns, the
        fraction of the step and the step length."""
        knots_t = self.t
        n = knots_t.shape[1]
        tau = np.broadcast_to(
            np.asarray(times, dtype=float).reshape(-1, 1)
            if np.ndim(times) == 1
            else np.asarray(times, dtype=float),
            (np.shape(times)[0], n),
        )
        tau = np.clip(tau, knots_t[0], knots_t[-1])
        # index of the segment [k, k+1] holding tau; empty segments never hold it
        below = (knots_t[None, :, :] <= tau[:, None, :]).sum(axis=1) - 1
        idx = np.clip(below, 0, knots_t.shape[0] - 2)
        cols = np.arange(n)[None, :]
        t_a, t_b = knots_t[idx, cols], knots_t[idx + 1, cols]
        h = t_b - t_a
        s = np.where(h > 0, (tau - t_a) / np.where(h > 0, h, 1.0), 0.0)
        return tau, idx, cols, s, h


@dataclass
class FlightResult:
    """The end of each ball's flight and the events it passed."""

    t: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray
    terminated_by: np.ndarray
    events: dict = field(default_factory=dict)
    n_steps: np.ndarray | None = None
    trajectory: Trajectory | None = None
    event_names: tuple = ()

    def ended_by(self, name):
        """Boolean mask of balls whose flight ended at the terminal event ``name``."""
        return self.terminated_by == self.event_names.index(name)


def _hermite(s, h, x0, v0, a0, x1, v1, a1):
    """Quintic Hermite position and its derivative (velocity) at fraction ``s`` of a step ``h``."""
    s2 = s * s
    s3 = s2 * s
    s4 = s3 * s
    hv0, hv1 = h * v0, h * v1
    ha0, ha1 = h * h * a0, h * h * a1
    pos = _hermite_position(s, x0, hv0, ha0, x1, hv1, ha1)
    d0 = -30 * s2 + 60 * s3 - 30 * s4
    d1 = 1 - 18 * s2 + 32 * s3 - 15 * s4
    d2 = 0.5 * (2 * s - 9 * s2 + 12 * s3 - 5 * s4)
    d4 = -12 * s2 + 28 * s3 - 15 * s4
    d5 = 0.5 * (3 * s2 - 8 * s3 + 5 * s4)
    dpos = (x0 - x1) * d0 + hv0 * d1 + ha0 * d2 + hv1 * d4 + ha1 * d5
    with np.errstate(invalid="ignore", divide="ignore"):
        vel = np.where(h > 0, dpos / np.where(h > 0, h, 1.0), v0)
    return pos, vel


def _hermite_position(s, x0, hv0, ha0, x1, hv1, ha1):
    """Quintic Hermite position at fraction ``s`` of a step, from the end values ``x``, the
    velocities times the step ``hv`` and the accelerations times its square ``ha``."""
    s2 = s * s
    s3 = s2 * s
    s4 = s3 * s
    s5 = s4 * s
    h0 = 1 - 10 * s3 + 15 * s4 - 6 * s5
    h1 = s - 6 * s3 + 8 * s4 - 3 * s5
    h2 = 0.5 * (s2 - 3 * s3 + 3 * s4 - s5)
    h3 = 10 * s3 - 15 * s4 + 6 * s5
    h4 = -4 * s3 + 7 * s4 - 3 * s5
    h5 = 0.5 * (s3 - 2 * s4 + s5)
    return x0 * h0 + hv0 * h1 + ha0 * h2 + x1 * h3 + hv1 * h4 + ha1 * h5


class _Rhs:
    """Right-hand side of ``x' = v, v' = a(t, v)`` on component-first arrays."""

    def __init__(self, params):
        self.params = params
        self.gravity = gravity_acceleration(params)
        self.wind = np.asarray(params.wind)[:, None]
        self.still_air = not np.any(self.wind)

    def __call__(self, t, v, spin0):
        air = v if self.still_air else v - self.wind
        spin = spin_at(spin0, t, self.params)
        acc = aerodynamic_acceleration(air, spin, self.params)
        acc += self.gravity
        return acc


def _error_norm(err_x, err_v, x0, x1, v0, v1, rtol, atol):
    sc_x = atol + rtol * np.maximum(np.abs(x0), np.abs(x1))
    sc_v = atol + rtol * np.maximum(np.abs(v0), np.abs(v1))
    total = ((err_x / sc_x) ** 2).sum(axis=0) + ((err_v / sc_v) ** 2).sum(axis=0)
    return np.sqrt(total / 6.0)


def _initial_step(v, a, rhs, t, spin0, x, rtol, atol, t_left):
    """Starting step of Hairer et al. (1993), II.4, for every ball."""
    sc_x = atol + rtol * np.abs(x)
    sc_v = atol + rtol * np.abs(v)
    d0 = np.sqrt((((x / sc_x) ** 2).sum(0) + ((v / sc_v) ** 2).sum(0)) / 6)
    d1 = np.sqrt((((v / sc_x) ** 2).sum(0) + ((a / sc_v) ** 2).sum(0)) / 6)
    h0 = np.where((d0 < 1e-5) | (d1 < 1e-5), 1e-6, 0.01 * d0 / np.maximum(d1, 1e-300))
    a1 = rhs(t + h0, v + h0 * a, spin0)
    dv = ((a * h0 / sc_x) ** 2).sum(0)
    da = (((a1 - a) / sc_v) ** 2).sum(0)
    d2 = np.sqrt((dv + da) / 6) / h0
    big = np.maximum(d1, d2)
    tiny = big <= 1e-15
    h1 = np.where(tiny, np.maximum(1e-6, h0 * 1e-3), (0.01 / np.where(tiny, 1.0, big)) ** 0.2)
    return np.minimum(np.minimum(100 * h0, h1), t_left)


def _quintic_coefficients(p0, q0, r0, p1, q1, r1):
    """Monomial coefficients ``c0..c5`` in ``s`` of the quintic Hermite interpolant.

    ``p`` are values, ``q = h g'`` and ``r = h^2 g''`` at the two ends of the step.
    """
    return (
        p0,
        q0,
        0.5 * r0,
        -10 * p0 - 6 * q0 - 1.5 * r0 + 10 * p1 - 4 * q1 + 0.5 * r1,
        15 * p0 + 8 * q0 + 1.5 * r0 - 15 * p1 + 7 * q1 - r1,
        -6 * p0 - 3 * q0 - 0.5 * r0 + 6 * p1 - 3 * q1 + 0.5 * r1,
    )


def _horner(c, s):
    """Value and derivative in ``s`` of the polynomial with coefficients ``c`` (lowest first)."""
    value = c[5]
    slope = 0.0
    for coeff in c[4::-1]:
        slope = slope * s + value
        value = value * s + coeff
    return value, slope


_GRIDS = {}  # sample points of a step, by number of samples


def _first_root(c, n_samples=8, iterations=6):
    """First root in (0, 1] where ``g`` goes from > 0 to <= 0, for every column.

    The step is sampled at ``n_samples`` points so that a ball that starts on the plane (just
    after a bounce) and comes back to it within one step is still caught; the bracket is then
    refined by safeguarded Newton iterations on the quintic. Returns ``(found, s)``.
    """
    grid = _GRIDS.get(n_samples)
    if grid is None:
        grid = _GRIDS[n_samples] = np.linspace(0.0, 1.0, n_samples + 1)
    values = _horner(c, grid[:, None])[0]  # (n_samples + 1, M) in one pass
    hit = (values[:-1] > 0) & (values[1:] <= 0)
    found = hit.any(axis=0)
    first = np.argmax(hit, axis=0)
    cols = np.arange(values.shape[1])
    lo, hi = grid[first], grid[first + 1]
    g_lo, g_hi = values[first, cols], values[first + 1, cols]
    denom = g_lo - g_hi
    s = lo + (hi - lo) * g_lo / np.where(denom > 0, denom, 1.0)
    for _ in range(iterations):
        g, dg = _horner(c, s)
        lo = np.where(g > 0, s, lo)
        hi = np.where(g <= 0, s, hi)
        s_new = s - g / np.where(dg != 0, dg, 1.0)
        s = np.where((s_new >= lo) & (s_new <= hi), s_new, 0.5 * (lo + hi))
    return found, s


def _crossings(event, normal, offset, sense, h, ends):
    """Step fractions at which balls cross one event plane on an accepted step.

    ``ends`` are the component-first ``(x0, v0, a0, x1, v1, a1)`` of the candidate balls.
    Returns ``(found, s)``.
    """
    x0, v0, a0, x1, v1, a1 = ends
    n = normal[:, None]
    sign = -sense  # make the pre-crossing side positive

    def proj(vec, scale):
        return sign * scale * (n * vec).sum(axis=0)

    if event.on == "velocity":
        # cubic Hermite of n . v from the velocities and accelerations at both ends
        p0 = sign * ((n * v0).sum(axis=0) - offset)
        p1 = sign * ((n * v1).sum(axis=0) - offset)
        q0, q1 = proj(a0, h), proj(a1, h)
        zero = np.zeros_like(p0)
        c = (p0, q0, -3 * p0 - 2 * q0 + 3 * p1 - q1, 2 * p0 + q0 - 2 * p1 + q1, zero, zero)
        return _first_root(c)
    c = _quintic_coefficients(
        sign * ((n * x0).sum(axis=0) - offset),
        proj(v0, h),
        proj(a0, h * h),
        sign * ((n * x1).sum(axis=0) - offset),
        proj(v1, h),
        proj(a1, h * h),
    )
    return _first_root(c)


def _states_on_planes(rhs, events, normals, offsets, hits, gi, t, h, start, spin0):
    """Time, position and velocity where balls meet event planes inside accepted steps.

    ``hits`` are the ``(event, columns, s)`` of :func:`_event_roots`: the interpolant gives the
    fraction ``s`` of the step. One fresh Dormand-Prince step of that length from the start of
    the step, for the balls of every event together, gives the state there to the integrator's
    own accuracy, and one Taylor correction ``dt = -g / g'`` puts each ball on its plane.
    Returns ``(t, x, v)`` for each entry of ``hits``.
    """
    if not hits:
        return []
    cols = np.concatenate([cand for _, cand, _ in hits])
    h_sub = np.concatenate([s for _, _, s in hits]) * h[cols]
    t_sub = t[cols]
    x_all, v_all, a_all, _, _ = _dp_step(
        rhs, t_sub, *(e[:, cols] for e in start), h_sub, spin0[:, cols]
    )
    placed, first = [], 0
    for ev, cand, _ in hits:
        part = slice(first, first + cand.size)
        first += cand.size
        j = events.index(ev)
        normal, offset = normals[j], offsets[j][gi[cand]]
        x, v, a = x_all[:, part], v_all[:, part], a_all[:, part]
        if ev.on == "velocity":
            slope = normal @ a
            dt = -(normal @ v - offset) / np.where(slope != 0, slope, 1.0)
        else:
            dt = -(normal @ x - offset) / (normal @ v)
        x = x + v * dt + 0.5 * a * dt * dt
        v = v + a * dt
        placed.append((t_sub[part] + h_sub[part] + dt, x, v))
    return placed


def _event_roots(events, normals, offsets, gi, h, ends, rec):
    """Crossings of every event plane on the given steps: a list of ``(event, columns, s)``."""
    hits = []
    for j, ev in enumerate(events):
        off = offsets[j][gi]
        first = 1 if ev.on == "velocity" else 0
        g_old = normals[j] @ ends[first] - off
        g_new = normals[j] @ ends[first + 3] - off
        sense = np.full(gi.size, ev.direction) if ev.direction else np.sign(g_new - g_old)
        cand = np.flatnonzero(
            (sense * g_old <= 0) & (sense * g_new >= 0) & (sense != 0) & ~rec[ev.name].occurred[gi]
        )
        if not cand.size:
            continue
        found, s = _crossings(
            ev, normals[j], off[cand], sense[cand], h[cand], tuple(e[:, cand] for e in ends)
        )
        hits.append((ev, cand[found], s[found]))
    return hits


def _dp_step(rhs, t, x, v, a, h, spin0):
    """One Dormand-Prince 5(4) step of ``x' = v, v' = a`` for every live ball.

    Returns the fifth-order ``x, v, a`` at ``t + h`` and the error estimates of x and v.
    """
    hb = h[None, :]
    kv, ka = [v], [a]
    for i in range(1, 7):
        coeffs = _A[i]
        dx = sum(c * k for c, k in zip(coeffs, kv, strict=True) if c)
        dv = sum(c * k for c, k in zip(coeffs, ka, strict=True) if c)
        xs = x + hb * dx
        vs = v + hb * dv
        kv.append(vs)
        ka.append(rhs(t + _C[i] * h, vs, spin0))
    err_x = hb * sum(e * k for e, k in zip(_E, kv, strict=True) if e)
    err_v = hb * sum(e * k for e, k in zip(_E, ka, strict=True) if e)
    return xs, vs, ka[6], err_x, err_v


def checked_launch(position, velocity, spin, t0, t_max):
    """The launch of N balls as :func:`fly` takes it: position, velocity and spin ``(N, 3)``
    [m, m/s, rad/s] (one row is shared by all) and launch times ``(N,)`` [s]; a ValueError for
    values that are not finite, shapes that are not (N, 3), or ``t_max`` [s] not positive."""
    x = np.atleast_2d(np.asarray(position, dtype=float))
    n = x.shape[0]
    v = np.broadcast_to(np.atleast_2d(np.asarray(velocity, dtype=float)), (n, 3))
    w = np.broadcast_to(np.atleast_2d(np.asarray(spin, dtype=float)), (n, 3))
    t0 = np.broadcast_to(np.asarray(t0, dtype=float), (n,))
    for name, arr in (("position", x), ("velocity", v), ("spin", w)):
        if arr.shape != (n, 3) or not np.all(np.isfinite(arr)):
            raise ValueError(f"{name} must be finite and shaped (N, 3)")
    if not np.all(np.isfinite(t0)) or not (np.isfinite(t_max) and t_max > 0):
        raise ValueError("t0 must be finite and t_max positive")
    return x, v, w, t0


def fly(
    position,
    velocity,
    spin,
    params,
    events=(),
    t0=0.0,
    t_max=10.0,
    rtol=1e-6,
    atol=1e-6,
    record=False,
    chunk=DEFAULT_CHUNK,
):
    """Fly N balls until a terminal event or ``t_max``.

    Parameters
    ----------
    position, velocity, spin : array (N, 3)
        Initial ball centre [m], velocity [m/s] and spin [rad/s] in the court frame.
    params : flight.forces.FlightParams
    events : sequence of PlaneEvent
    t0 : float or array (N,)
        Launch time of each ball [s]; event and end times are on the same clock.
    t_max : float
        Longest flight [s]; balls still flying then stop with ``terminated_by == -1``.
    rtol, atol : float
        Relative and absolute tolerances of the local error (position [m], velocity [m/s]).
        The defaults land within about 0.1 mm of a tight reference integrator (see the tests).
    record : bool
        Keep the step knots for dense output (:class:`Trajectory`).
    chunk : int
        Balls integrated together; larger batches are split into chunks of this size.

    Returns
    -------
    FlightResult
    """
    x, v, w, t0 = checked_launch(position, velocity, spin, t0, t_max)
    n = x.shape[0]
    events = tuple(events)
    offsets = [np.broadcast_to(np.asarray(ev.offset, dtype=float), (n,)) for ev in events]
    if n <= chunk or record:
        return _fly_chunk(x, v, w, params, events, offsets, t0, t_max, rtol, atol, record)
    parts = []
    for i in range(0, n, chunk):
        part = slice(i, i + chunk)
        parts.append(
            _fly_chunk(
                x[part],
                v[part],
                w[part],
                params,
                events,
                [o[part] for o in offsets],
                t0[part],
                t_max,
                rtol,
                atol,
                False,
            )
        )
    return _concatenate(parts, events)


def _concatenate(parts, events):
    cat = np.concatenate
    records = {
        ev.name: EventRecord(
            *(
                cat([getattr(p.events[ev.name], f) for p in parts])
                for f in ("occurred", "t", "position", "velocity", "spin")
            )
        )
        for ev in events
    }
    return FlightResult(
        t=cat([p.t for p in parts]),
        position=cat([p.position for p in parts]),
        velocity=cat([p.velocity for p in parts]),
        spin=cat([p.spin for p in parts]),
        terminated_by=cat([p.terminated_by for p in parts]),
        events=records,
        n_steps=cat([p.n_steps for p in parts]),
        event_names=parts[0].event_names,
    )


def _fly_chunk(x_in, v_in, w_in, params, events, offsets, t0_in, t_max, rtol, atol, record):
    n = x_in.shape[0]
    rhs = _Rhs(params)
    out_t = t0_in + t_max
    out_x = np.array(x_in, dtype=float)
    out_v = np.array(v_in, dtype=float)
    term = np.full(n, -1, dtype=int)
    steps = np.zeros(n, dtype=int)
    rec = {
        ev.name: EventRecord(
            np.zeros(n, dtype=bool),
            np.full(n, np.nan),
            np.full((n, 3), np.nan),
            np.full((n, 3), np.nan),
            np.full((n, 3), np.nan),
        )
        for ev in events
    }
    normals = [np.asarray(ev.normal) for ev in events]

    # working arrays of the live balls, component-first; t counts from each ball's launch
    live = np.arange(n)
    x = np.array(x_in.T, order="C")
    v = np.array(v_in.T, order="C")
    w0 = np.array(w_in.T, order="C")
    t = np.zeros(n)
    a = rhs(t, v, w0)
    h = _initial_step(v, a, rhs, t, w0, x, rtol, atol, np.full(n, t_max))
    knots = [(t0_in.copy(), out_x.copy(), out_v.copy(), a.T.copy())] if record else None

    while live.size:
        x_new, v_new, a_new, err_x, err_v = _dp_step(rhs, t, x, v, a, h, w0)
        err = _error_norm(err_x, err_v, x, x_new, v, v_new, rtol, atol)
        ok = err <= 1.0
        factor = np.clip(0.9 * np.maximum(err, 1e-10) ** -0.2, 0.2, 5.0)
        factor = np.where(ok, factor, np.minimum(factor, 1.0))
        done = np.zeros(live.size, dtype=bool)

        # events on the steps that passed the error test
        acc = np.flatnonzero(ok)
        ends = tuple(arr[:, acc] for arr in (x, v, a, x_new, v_new, a_new))
        hits = _event_roots(events, normals, offsets, live[acc], h[acc], ends, rec)
        gi = live[acc]
        steps[gi] += 1
        h_acc, t_acc = h[acc], t[acc]
        s_end = np.ones(acc.size)
        which_term = np.full(acc.size, -1)
        for ev, cand, s in hits:
            if ev.terminal:
                earlier = s < s_end[cand]
                s_end[cand[earlier]] = s[earlier]
                which_term[cand[earlier]] = events.index(ev)
        stop = np.flatnonzero(which_term >= 0)
        hits = [(ev, cand[s <= s_end[cand]], s[s <= s_end[cand]]) for ev, cand, s in hits]
        placed = _states_on_planes(
            rhs, events, normals, offsets, hits, gi, t_acc, h_acc, ends[:3], w0[:, acc]
        )
        for (ev, cand, _), (t_ev, pos, vel) in zip(hits, placed, strict=True):
            g = gi[cand]
            r = rec[ev.name]
            r.occurred[g] = True
            r.t[g] = t0_in[g] + t_ev
            r.position[g], r.velocity[g] = pos.T, vel.T
            r.spin[g] = spin_at(w0[:, acc[cand]], t_ev, params).T
            if ev.terminal:
                ends_here = which_term[cand] == events.index(ev)
                g = g[ends_here]
                out_x[g], out_v[g] = r.position[g], r.velocity[g]
                out_t[g] = r.t[g]
                term[g] = which_term[cand[ends_here]]
        done[acc[stop]] = True

        t[acc] += h_acc
        x[:, acc], v[:, acc], a[:, acc] = ends[3], ends[4], ends[5]
        if record:
            kt, kx, kv, ka = (arr.copy() for arr in knots[-1])
            kt[gi] = t0_in[gi] + t[acc]
            kx[gi], kv[gi], ka[gi] = x[:, acc].T, v[:, acc].T, a[:, acc].T
            if stop.size:
                g = gi[stop]
                kt[g], kx[g], kv[g] = out_t[g], out_x[g], out_v[g]
                ka[g] = rhs(out_t[g] - t0_in[g], out_v[g].T, w0[:, acc[stop]]).T
            knots.append((kt, kx, kv, ka))

        t_left = t_max - t
        timed_out = (t_left <= 1e-12) & ~done
        if timed_out.any():
            g = live[timed_out]
            out_x[g], out_v[g] = x[:, timed_out].T, v[:, timed_out].T
            out_t[g] = t0_in[g] + t[timed_out]
            done |= timed_out
        h = np.minimum(h * factor, np.maximum(t_left, 1e-12))
        if done.any():
            keep = ~done
            live, t, h = live[keep], t[keep], h[keep]
            x, v, a, w0 = x[:, keep], v[:, keep], a[:, keep], w0[:, keep]

    trajectory = None
    if record:
        kt, kx, kv, ka = (np.stack(parts) for parts in zip(*knots, strict=True))
        trajectory = Trajectory(
            kt, kx, kv, ka, np.array(w_in), np.array(t0_in), params.spin_decay_rate
        )
    return FlightResult(
        t=out_t,
        position=out_x,
        velocity=out_v,
        spin=spin_at(w_in.T, out_t - t0_in, params).T.copy(),
        terminated_by=term,
        events=rec,
        n_steps=steps,
        trajectory=trajectory,
        event_names=tuple(ev.name for ev in events),
    )
