r"""Racket-ball impacts compiled with numba: the numpy contact model, one ball at a time in a
compiled loop instead of all balls at once in numpy.

:func:`hit` and :func:`collide` return what :func:`impact.contact.hit` and
:func:`impact.contact.collide` return for the same arguments (a
:class:`~impact.contact.ContactResult`), and :func:`face_orientation` and
:func:`swing_velocity` what the functions of :mod:`impact.geometry` return. A call of :func:`hit`
costs about 25 us plus 0.13 us per ball where numpy's costs about 0.3 ms (its hundred-odd
array operations) plus 0.25 us per ball (measured on one core of the project's test machine);
callers that strike many small batches gain most.

Each ball goes through the same formulas in the same order as in numpy: the racket's inverse
masses at the impact point (:func:`impact.racket.racket_inverse_masses`), the normal impulse,
the stopping impulse from the explicit 2x2 inverse, the slide-or-grip choice with the
tangential restitution, the ball's and the racket's velocity changes and the coach quantities.
Results differ only where ``cos`` and ``sin`` of the compiled code and of numpy round
differently, or where numpy's einsum sums a dot product in another order than :func:`_dot3`
(about one unit in the last place); on the machine the parity tests were written on they are
bit for bit numpy's, and the tests bound them at 1e-9 (tests/impact/test_compiled.py). The same
inputs are refused, with the same ``ValueError`` messages (where an input is wrong in several
ways at once the first one named may differ).

The arithmetic is IEEE's, as numpy's (numba's ``error_model="numpy"``): a division by zero
gives an infinity or NaN instead of raising, and the input checks, made on each ball in the
same loop, refuse such inputs once the loop is done.

The string bed's restitution at the normal speed is not computed here: it is an argument
(``e_n``), as in numpy, which the shot chain takes from its conditions.

A racket whose mass properties are not plain numbers (:func:`supports`) has no compiled form:
:func:`hit` refuses it with a ``TypeError``, and callers strike it with
:func:`impact.contact.hit`.

The first call in a process compiles the kernels, or loads them from numba's cache beside this
module (``cache=True``) when an earlier process compiled them.

References
----------
.. [1] H. Brody, Am. J. Phys. 65, 981 (1997).
.. [2] R. Cross, Am. J. Phys. 70, 1093 (2002), doi:10.1119/1.1507792.
.. [3] R. Cross, Am. J. Phys. 73, 914 (2005), doi:10.1119/1.2008299.
"""

from __future__ import annotations

import math

import numba
import numpy as np

from .contact import _UNIT_TOL, ContactResult, named_inputs, tangential_inverse_mass
from .racket import SWINGWEIGHT_AXIS_M

__all__ = ["collide", "face_orientation", "hit", "supports", "swing_velocity"]

_RACKET_FIELDS = ("mass_kg", "balance_m", "swingweight_kgm2", "twistweight_kgm2", "length_m")

# rows of the output blocks: vectors (6, N, 3), numbers (7, N), flags (3, N)
_V_VELOCITY, _V_SPIN, _V_TANGENTIAL, _V_FACE, _V_PARALLEL, _V_SPIN_CHANGE = range(6)
_S_JN, _S_APPROACH, _S_PARALLEL, _S_SLIP_LINEAR, _S_SLIP_SPIN, _S_SLIP_RATIO, _S_RATIO_OUT = range(
    7
)
_B_APPROACHING, _B_GRIP, _B_STOPPED = range(3)

# bits of a kernel's input check, in the order numpy checks them; the message of each
_ERRORS = (
    "impact_from_butt_m must lie in [0, {length}] m (the racket's length)",
    "swingweight too small for the mass and balance: the moment of inertia about the centre of "
    "mass, swingweight - mass * (balance - 0.10)**2, must be positive",
    "twistweight must be positive",
    "face_normal must be a unit vector",
    "face_axis must be a unit vector",
    "face_axis must be perpendicular to face_normal",
    "ball_mass must be positive",
    "ball_radius must be positive",
    "ball_alpha must be positive",
    "racket_inv_mass_normal must be >= 0",
    "racket_inv_mass_tangential must be finite and symmetric",
    "racket_inv_mass_tangential must be positive semi-definite",
    "e_n must lie in [0, 1]",
    "e_t must lie in [0, 1]",
    "mu must be >= 0",
)
(
    _E_IMPACT_POINT,
    _E_INERTIA,
    _E_TWIST,
    _E_NORMAL,
    _E_AXIS,
    _E_PERPENDICULAR,
    _E_MASS,
    _E_RADIUS,
    _E_ALPHA,
    _E_INV_MASS,
    _E_K_SYMMETRIC,
    _E_K_DEFINITE,
    _E_EN,
    _E_ET,
    _E_MU,
) = (1 << k for k in range(len(_ERRORS)))


def supports(racket):
    """Whether :func:`hit` can strike with ``racket``: its mass, balance, swingweight,
    twistweight and length are plain numbers (as in every :class:`~impact.racket.Racket`), not
    arrays."""
    try:
        return all(np.ndim(getattr(racket, name)) == 0 for name in _RACKET_FIELDS) and all(
            np.isrealobj(getattr(racket, name)) for name in _RACKET_FIELDS
        )
    except AttributeError:
        return False


@numba.njit(cache=True, error_model="numpy")
def _dot3(x0, x1, x2, y0, y1, y2):
    """``x . y`` of two 3-vectors, summed as numpy's einsum sums three products (the first
    and the last, then the middle one); another order changes the last bit of one dot in
    three."""
    return (x0 * y0 + x2 * y2) + x1 * y1


@numba.njit(cache=True, error_model="numpy")
def _at(arr, i):
    """Row ``i`` of an input shared by all balls (one row) or given per ball."""
    return i if arr.shape[0] > 1 else 0


@numba.njit(cache=True, error_model="numpy")
def _check_ball(n, a, m, r, alpha, inv_big_m, k00, k01, k10, k11, e_n, mu, e_t):
    """The input checks of :func:`impact.contact.collide` on one ball, as error bits."""
    bad = 0
    if abs(math.sqrt(_dot3(n[0], n[1], n[2], n[0], n[1], n[2])) - 1.0) > _UNIT_TOL:
        bad |= _E_NORMAL
    if abs(math.sqrt(_dot3(a[0], a[1], a[2], a[0], a[1], a[2])) - 1.0) > _UNIT_TOL:
        bad |= _E_AXIS
    if abs(_dot3(n[0], n[1], n[2], a[0], a[1], a[2])) > _UNIT_TOL:
        bad |= _E_PERPENDICULAR
    if not m > 0.0:
        bad |= _E_MASS
    if not r > 0.0:
        bad |= _E_RADIUS
    if not alpha > 0.0:
        bad |= _E_ALPHA
    if not inv_big_m >= 0.0:
        bad |= _E_INV_MASS
    finite = math.isfinite(k00) and math.isfinite(k01) and math.isfinite(k10) and math.isfinite(k11)
    if not finite or abs(k01 - k10) > 1e-12 * (abs(k01) + 1.0):
        bad |= _E_K_SYMMETRIC
    if k00 < 0.0 or k00 * k11 - k01 * k10 < -1e-15:
        bad |= _E_K_DEFINITE
    if not (e_n >= 0.0 and e_n <= 1.0):
        bad |= _E_EN
    if not (e_t >= 0.0 and e_t <= 1.0):
        bad |= _E_ET
    if not mu >= 0.0:
        bad |= _E_MU
    return bad


@numba.njit(cache=True, error_model="numpy")
def _collide_ball(
    i,
    v,
    w,
    face_v,
    n,
    a,
    m,
    r,
    alpha,
    inv_big_m,
    kr00,
    kr01,
    kr10,
    kr11,
    e_n,
    mu,
    e_t,
    vec,
    num,
    flag,
):
    """One ball of :func:`impact.contact.collide`, operation for operation; writes its outputs
    into row ``i`` of the blocks ``vec``, ``num`` and ``flag``."""
    c0 = n[1] * a[2] - n[2] * a[1]
    c1 = n[2] * a[0] - n[0] * a[2]
    c2 = n[0] * a[1] - n[1] * a[0]
    inv_m = 1.0 / m

    # approach: relative velocity split along and across the face
    vr0 = v[0] - face_v[0]
    vr1 = v[1] - face_v[1]
    vr2 = v[2] - face_v[2]
    v_n = _dot3(vr0, vr1, vr2, n[0], n[1], n[2])
    approaching = v_n < 0.0
    vt0 = vr0 - v_n * n[0]
    vt1 = vr1 - v_n * n[1]
    vt2 = vr2 - v_n * n[2]
    l0 = -r * n[0]
    l1 = -r * n[1]
    l2 = -r * n[2]
    ss0 = w[1] * l2 - w[2] * l1
    ss1 = w[2] * l0 - w[0] * l2
    ss2 = w[0] * l1 - w[1] * l0
    u0 = vt0 + ss0
    u1 = vt1 + ss1
    u2 = vt2 + ss2

    # normal impulse on the ball [N s]
    j_n = (1.0 + e_n) * (-v_n) / (inv_m + inv_big_m) if approaching else 0.0

    # stopping impulse in the (a, c) basis
    k_b = inv_m * (1.0 + 1.0 / alpha)
    k00 = kr00 + k_b
    k01 = kr01
    k10 = kr10
    k11 = kr11 + k_b
    det = k00 * k11 - k01 * k10
    u_a = _dot3(u0, u1, u2, a[0], a[1], a[2])
    u_c = _dot3(u0, u1, u2, c0, c1, c2)
    stop_a = (k11 * u_a - k01 * u_c) / det if approaching else 0.0
    stop_c = (k00 * u_c - k10 * u_a) / det if approaching else 0.0
    stop_mag = math.hypot(stop_a, stop_c)

    # slide or grip
    grip = approaching and (1.0 + e_t) * stop_mag <= mu * j_n
    sliding = approaching and not grip
    slide_scale = -mu * j_n / stop_mag if sliding else 0.0
    scale = -(1.0 + e_t) if grip else slide_scale
    jt_a = scale * stop_a
    jt_c = scale * stop_c
    jt0 = jt_a * a[0] + jt_c * c0
    jt1 = jt_a * a[1] + jt_c * c1
    jt2 = jt_a * a[2] + jt_c * c2
    im0 = j_n * n[0] + jt0
    im1 = j_n * n[1] + jt1
    im2 = j_n * n[2] + jt2

    # ball and racket after contact
    vo0 = v[0] + im0 * inv_m
    vo1 = v[1] + im1 * inv_m
    vo2 = v[2] + im2 * inv_m
    inertia = alpha * m * r**2
    wo0 = w[0] + (l1 * im2 - l2 * im1) / inertia
    wo1 = w[1] + (l2 * im0 - l0 * im2) / inertia
    wo2 = w[2] + (l0 * im1 - l1 * im0) / inertia
    dv_a = -(kr00 * jt_a + kr01 * jt_c)
    dv_c = -(kr10 * jt_a + kr11 * jt_c)
    jm = j_n * inv_big_m
    df0 = dv_a * a[0] + dv_c * c0 - jm * n[0]
    df1 = dv_a * a[1] + dv_c * c1 - jm * n[1]
    df2 = dv_a * a[2] + dv_c * c2 - jm * n[2]

    # coach quantities (ratios of tiny nonzero speeds may be huge; they overflow to inf)
    linear_mag = math.sqrt(_dot3(vt0, vt1, vt2, vt0, vt1, vt2))
    rm0 = vo0 - (face_v[0] + df0)
    rm1 = vo1 - (face_v[1] + df1)
    rm2 = vo2 - (face_v[2] + df2)
    rm_n = _dot3(rm0, rm1, rm2, n[0], n[1], n[2])
    rt0 = rm0 - rm_n * n[0]
    rt1 = rm1 - rm_n * n[1]
    rt2 = rm2 - rm_n * n[2]
    remaining_mag = math.sqrt(_dot3(rt0, rt1, rt2, rt0, rt1, rt2))
    if linear_mag > 0.0:
        spin_along = _dot3(ss0, ss1, ss2, vt0, vt1, vt2) / linear_mag
        slip_ratio = spin_along / linear_mag
    else:
        slip_ratio = np.nan
    if remaining_mag > 0.0:
        x0 = wo1 * l2 - wo2 * l1
        x1 = wo2 * l0 - wo0 * l2
        x2 = wo0 * l1 - wo1 * l0
        spin_ratio_out = math.sqrt(_dot3(x0, x1, x2, x0, x1, x2)) / remaining_mag
    else:
        spin_ratio_out = np.nan

    vec[_V_VELOCITY, i, 0], vec[_V_VELOCITY, i, 1], vec[_V_VELOCITY, i, 2] = vo0, vo1, vo2
    vec[_V_SPIN, i, 0], vec[_V_SPIN, i, 1], vec[_V_SPIN, i, 2] = wo0, wo1, wo2
    vec[_V_TANGENTIAL, i, 0], vec[_V_TANGENTIAL, i, 1], vec[_V_TANGENTIAL, i, 2] = jt0, jt1, jt2
    vec[_V_FACE, i, 0], vec[_V_FACE, i, 1], vec[_V_FACE, i, 2] = df0, df1, df2
    vec[_V_PARALLEL, i, 0], vec[_V_PARALLEL, i, 1], vec[_V_PARALLEL, i, 2] = vt0, vt1, vt2
    vec[_V_SPIN_CHANGE, i, 0] = wo0 - w[0]
    vec[_V_SPIN_CHANGE, i, 1] = wo1 - w[1]
    vec[_V_SPIN_CHANGE, i, 2] = wo2 - w[2]
    num[_S_JN, i] = j_n
    num[_S_APPROACH, i] = -v_n
    num[_S_PARALLEL, i] = linear_mag
    num[_S_SLIP_LINEAR, i] = linear_mag
    num[_S_SLIP_SPIN, i] = math.sqrt(_dot3(ss0, ss1, ss2, ss0, ss1, ss2))
    num[_S_SLIP_RATIO, i] = slip_ratio
    num[_S_RATIO_OUT, i] = spin_ratio_out
    flag[_B_APPROACHING, i] = approaching
    flag[_B_GRIP, i] = grip
    flag[_B_STOPPED, i] = approaching and math.hypot(jt_a, jt_c) >= stop_mag


@numba.njit(cache=True, error_model="numpy")
def _collide_all(v, w, face_v, n, a, m, r, alpha, inv_big_m, k_r, e_n, mu, e_t, vec, num, flag):
    """:func:`impact.contact.collide` on every ball; returns the error bits of the inputs."""
    bad = 0
    for i in range(vec.shape[1]):
        kr = k_r[_at(k_r, i)]
        args = (
            m[_at(m, i)],
            r[_at(r, i)],
            alpha[_at(alpha, i)],
            inv_big_m[_at(inv_big_m, i)],
            kr[0, 0],
            kr[0, 1],
            kr[1, 0],
            kr[1, 1],
            e_n[_at(e_n, i)],
            mu[_at(mu, i)],
            e_t[_at(e_t, i)],
        )
        nb = n[_at(n, i)]
        ab = a[_at(a, i)]
        bad |= _check_ball(nb, ab, *args)
        _collide_ball(
            i, v[_at(v, i)], w[_at(w, i)], face_v[_at(face_v, i)], nb, ab, *args, vec, num, flag
        )
    return bad


@numba.njit(cache=True, error_model="numpy")
def _racket_constants(mass, balance, swingweight, twistweight):
    """The racket's moments that every impact point shares, as
    :func:`impact.racket.racket_inverse_masses` computes them: ``i_cm`` (about the centre of
    mass) [kg m^2], ``i_nn = i_cm + twistweight`` [kg m^2], ``1 / mass`` [1/kg], and the error
    bits of the racket."""
    bad = 0
    i_cm = swingweight - mass * (balance - SWINGWEIGHT_AXIS_M) ** 2
    if i_cm <= 0.0:
        bad |= _E_INERTIA
    if twistweight <= 0.0:
        bad |= _E_TWIST
    return i_cm, i_cm + twistweight, 1.0 / mass, bad


@numba.njit(cache=True, error_model="numpy")
def _hit_ball(
    i,
    v,
    w,
    face_v,
    n,
    a,
    mass,
    balance,
    twistweight,
    length,
    i_cm,
    i_nn,
    inv_mass,
    x,
    d,
    m,
    r,
    alpha,
    e_n,
    mu,
    e_t,
    vec,
    num,
    flag,
):
    """One ball of :func:`impact.contact.hit` at the impact point ``x`` [m] from the butt and
    ``d`` [m] off the axis, with the racket's constants of :func:`_racket_constants`: the
    racket's inverse masses there, then the contact; writes row ``i`` of ``vec``, ``num`` and
    ``flag`` and returns the error bits of the ball's inputs."""
    bad = 0
    if x < 0.0 or x > length:
        bad |= _E_IMPACT_POINT
    b = x - balance
    inv_n = 1.0 / mass + b**2 / i_cm + d**2 / twistweight
    k01 = -b * d / i_nn
    k00 = inv_mass + d**2 / i_nn
    k11 = inv_mass + b**2 / i_nn
    bad |= _check_ball(n, a, m, r, alpha, inv_n, k00, k01, k01, k11, e_n, mu, e_t)
    _collide_ball(
        i, v, w, face_v, n, a, m, r, alpha, inv_n, k00, k01, k01, k11, e_n, mu, e_t, vec, num, flag
    )
    return bad


@numba.njit(cache=True, error_model="numpy")
def _hit_all(
    v,
    w,
    face_v,
    n,
    a,
    mass,
    balance,
    swingweight,
    twistweight,
    length,
    x_impact,
    offaxis,
    m,
    r,
    alpha,
    e_n,
    mu,
    e_t,
    vec,
    num,
    flag,
):
    """:func:`impact.contact.hit` on every ball: the racket's inverse masses at each impact
    point as :func:`impact.racket.racket_inverse_masses` computes them, then the contact;
    returns the error bits of the inputs."""
    i_cm, i_nn, inv_mass, bad = _racket_constants(mass, balance, swingweight, twistweight)
    for i in range(vec.shape[1]):
        bad |= _hit_ball(
            i,
            v[_at(v, i)],
            w[_at(w, i)],
            face_v[_at(face_v, i)],
            n[_at(n, i)],
            a[_at(a, i)],
            mass,
            balance,
            twistweight,
            length,
            i_cm,
            i_nn,
            inv_mass,
            x_impact[_at(x_impact, i)],
            offaxis[_at(offaxis, i)],
            m[_at(m, i)],
            r[_at(r, i)],
            alpha[_at(alpha, i)],
            e_n[_at(e_n, i)],
            mu[_at(mu, i)],
            e_t[_at(e_t, i)],
            vec,
            num,
            flag,
        )
    return bad


@numba.njit(cache=True, error_model="numpy")
def _face_ball(t, p, q):
    """:func:`impact.geometry.face_orientation` of one face: tilt ``t``, azimuth ``p`` and roll
    ``q`` [rad]; returns the unit normal's and the unit long axis's components [-]."""
    ct, st = math.cos(t), math.sin(t)
    cp, sp = math.cos(p), math.sin(p)
    cr, sr = math.cos(q), math.sin(q)
    return (
        ct * cp,
        ct * sp,
        st,
        cr * -sp + sr * (-st * cp),
        cr * cp + sr * (-st * sp),
        cr * 0.0 + sr * ct,
    )


@numba.njit(cache=True, error_model="numpy")
def _face_all(tilt, azimuth, roll, normal, axis):
    """:func:`impact.geometry.face_orientation` on every ball."""
    for i in range(normal.shape[0]):
        n0, n1, n2, a0, a1, a2 = _face_ball(
            tilt[_at(tilt, i)], azimuth[_at(azimuth, i)], roll[_at(roll, i)]
        )
        normal[i, 0], normal[i, 1], normal[i, 2] = n0, n1, n2
        axis[i, 0], axis[i, 1], axis[i, 2] = a0, a1, a2


@numba.njit(cache=True, error_model="numpy")
def _swing_ball(s, p, d):
    """:func:`impact.geometry.swing_velocity` of one swing: speed ``s`` [m/s], path ``p`` and
    direction ``d`` [rad]; returns the velocity's components [m/s]."""
    cp = math.cos(p)
    return s * (cp * math.cos(d)), s * (cp * math.sin(d)), s * math.sin(p)


@numba.njit(cache=True, error_model="numpy")
def _swing_all(speed, path, direction, out):
    """:func:`impact.geometry.swing_velocity` on every ball."""
    for i in range(out.shape[0]):
        v0, v1, v2 = _swing_ball(
            speed[_at(speed, i)], path[_at(path, i)], direction[_at(direction, i)]
        )
        out[i, 0], out[i, 1], out[i, 2] = v0, v1, v2


def _contiguous_inputs(vectors, scalars):
    """:func:`impact.contact.named_inputs`, each array C-contiguous for the kernels."""
    vecs, nums = named_inputs(vectors, scalars)
    return [np.ascontiguousarray(x) for x in vecs], [np.ascontiguousarray(x) for x in nums]


def _batch(arrays):
    """The batch size N of inputs with one row (shared) or N rows."""
    sizes = {arr.shape[0] for arr in arrays}
    sizes.discard(1)
    if len(sizes) > 1:
        shapes = ", ".join(str(arr.shape[:1]) for arr in arrays)
        raise ValueError(f"inputs do not share one batch size N: {shapes}")
    return sizes.pop() if sizes else 1


def _angles(values, name):
    arrays = [np.ascontiguousarray(np.atleast_1d(np.asarray(x, dtype=float))) for x in values]
    if any(arr.ndim != 1 for arr in arrays):
        shape = np.broadcast_shapes(*(arr.shape for arr in arrays))
        raise ValueError(f"{name} must be numbers or 1-D arrays, got shape {shape}")
    sizes = {arr.shape[0] for arr in arrays}
    sizes.discard(1)
    if len(sizes) > 1:
        np.broadcast_shapes(*(arr.shape for arr in arrays))  # numpy's own error
    return arrays, sizes.pop() if sizes else 1


def _result(vec, num, flag, bad, length=None):
    if bad:
        k = (bad & -bad).bit_length() - 1
        raise ValueError(_ERRORS[k].format(length=length))
    return ContactResult(
        velocity=vec[_V_VELOCITY],
        spin=vec[_V_SPIN],
        approaching=flag[_B_APPROACHING],
        grip=flag[_B_GRIP],
        normal_impulse=num[_S_JN],
        tangential_impulse=vec[_V_TANGENTIAL],
        face_velocity_change=vec[_V_FACE],
        approach_normal_mps=num[_S_APPROACH],
        approach_parallel_velocity=vec[_V_PARALLEL],
        approach_parallel_mps=num[_S_PARALLEL],
        slip_linear_mps=num[_S_SLIP_LINEAR],
        slip_spin_mps=num[_S_SLIP_SPIN],
        slip_ratio=num[_S_SLIP_RATIO],
        spin_change=vec[_V_SPIN_CHANGE],
        stopped=flag[_B_STOPPED],
        spin_ratio_out=num[_S_RATIO_OUT],
    )


def _blocks(n_balls):
    return (
        np.empty((6, n_balls, 3)),
        np.empty((7, n_balls)),
        np.empty((3, n_balls), dtype=np.bool_),
    )


def collide(
    ball_velocity,
    ball_spin,
    face_velocity,
    face_normal,
    face_axis,
    ball_mass,
    ball_radius,
    ball_alpha,
    racket_inv_mass_normal,
    racket_inv_mass_tangential,
    e_n,
    mu,
    e_t=0.0,
):
    """:func:`impact.contact.collide`, compiled: the slide-or-grip contact of N balls with a
    racket face.

    Parameters
    ----------
    ball_velocity, ball_spin, face_velocity, face_normal, face_axis
        ``(N, 3)`` or ``(3,)``: ball velocity [m/s], ball spin [rad/s], face velocity at the
        impact point [m/s], unit face normal [-], unit long axis [-].
    ball_mass, ball_radius, ball_alpha
        Numbers or ``(N,)``: [kg], [m], [-].
    racket_inv_mass_normal : float or array_like
        ``1/M_e`` [1/kg].
    racket_inv_mass_tangential : array_like
        ``K_r`` in the ``(a, c)`` basis, ``(2, 2)`` or ``(N, 2, 2)`` [1/kg].
    e_n, mu, e_t
        Normal restitution [-], friction [-], tangential restitution [-] (default 0).

    Returns
    -------
    ContactResult
        As :func:`impact.contact.collide` returns it. Its arrays are views of three blocks
        (vectors, numbers, flags), each one C-contiguous.

    Raises
    ------
    ValueError
        For the inputs :func:`impact.contact.collide` refuses.

    References
    ----------
    .. [1] R. Cross, Am. J. Phys. 70, 1093 (2002), doi:10.1119/1.1507792.
    .. [2] R. Cross, Am. J. Phys. 73, 914 (2005), doi:10.1119/1.2008299.
    """
    vectors, scalars = _contiguous_inputs(
        (ball_velocity, ball_spin, face_velocity, face_normal, face_axis),
        (
            ("ball_mass", ball_mass),
            ("ball_radius", ball_radius),
            ("ball_alpha", ball_alpha),
            ("racket_inv_mass_normal", racket_inv_mass_normal),
            ("e_n", e_n),
            ("mu", mu),
            ("e_t", e_t),
        ),
    )
    k_r = np.ascontiguousarray(tangential_inverse_mass(racket_inv_mass_tangential))
    n_balls = _batch([*vectors, *scalars, k_r])
    v, w, face_v, n, a = vectors
    m, r, alpha, inv_big_m, e_n, mu, e_t = scalars
    vec, num, flag = _blocks(n_balls)
    bad = _collide_all(
        v, w, face_v, n, a, m, r, alpha, inv_big_m, k_r, e_n, mu, e_t, vec, num, flag
    )
    return _result(vec, num, flag, bad)


def hit(
    ball_velocity,
    ball_spin,
    face_velocity,
    face_normal,
    face_axis,
    racket,
    impact_from_butt_m,
    offaxis_m,
    ball_mass,
    ball_radius,
    ball_alpha,
    e_n,
    mu,
    e_t=0.0,
):
    """:func:`impact.contact.hit`, compiled: the contact of N balls with a free ``racket`` at a
    given impact point.

    Parameters
    ----------
    ball_velocity, ball_spin, face_velocity, face_normal, face_axis
        As in :func:`collide` ([m/s], [rad/s], [m/s], [-], [-]).
    racket : Racket
        The racket's mass properties, plain numbers (:func:`supports`).
    impact_from_butt_m : float or array_like
        Impact point's distance from the butt along the long axis [m].
    offaxis_m : float or array_like
        Impact point's offset along ``c = n x a`` [m].
    ball_mass, ball_radius, ball_alpha, e_n, mu, e_t
        As in :func:`collide` ([kg], [m], [-], [-], [-], [-]).

    Returns
    -------
    ContactResult
        As :func:`impact.contact.hit` returns it (see :func:`collide` for its arrays).

    Raises
    ------
    TypeError
        For a racket without a compiled form (:func:`supports`); strike it with
        :func:`impact.contact.hit`.
    ValueError
        For the inputs :func:`impact.contact.hit` refuses.

    References
    ----------
    .. [1] H. Brody, Am. J. Phys. 65, 981 (1997).
    .. [2] R. Cross, Am. J. Phys. 70, 1093 (2002), doi:10.1119/1.1507792.
    """
    if not supports(racket):
        raise TypeError(
            "no compiled impact for a racket whose mass properties are not plain numbers; "
            "use impact.contact.hit"
        )
    vectors, scalars = _contiguous_inputs(
        (ball_velocity, ball_spin, face_velocity, face_normal, face_axis),
        (
            ("impact_from_butt_m", impact_from_butt_m),
            ("offaxis_m", offaxis_m),
            ("ball_mass", ball_mass),
            ("ball_radius", ball_radius),
            ("ball_alpha", ball_alpha),
            ("e_n", e_n),
            ("mu", mu),
            ("e_t", e_t),
        ),
    )
    n_balls = _batch([*vectors, *scalars])
    v, w, face_v, n, a = vectors
    x, d, m, r, alpha, e_n, mu, e_t = scalars
    props = [float(getattr(racket, name)) for name in _RACKET_FIELDS]
    vec, num, flag = _blocks(n_balls)
    bad = _hit_all(v, w, face_v, n, a, *props, x, d, m, r, alpha, e_n, mu, e_t, vec, num, flag)
    return _result(vec, num, flag, bad, length=racket.length_m)


def face_orientation(tilt, azimuth=0.0, roll=0.0):
    """:func:`impact.geometry.face_orientation`, compiled: face normal and long axis from the
    face tilt [rad], azimuth [rad] and racket roll [rad] (numbers or ``(N,)``).

    Returns
    -------
    normal, axis : numpy.ndarray
        Unit face normal and unit long axis, ``(N, 3)`` each [-].

    Raises
    ------
    ValueError
        For angles that are not numbers or 1-D arrays of one batch size.
    """
    (tilt, azimuth, roll), n_balls = _angles((tilt, azimuth, roll), "angles")
    normal = np.empty((n_balls, 3))
    axis = np.empty((n_balls, 3))
    _face_all(tilt, azimuth, roll, normal, axis)
    return normal, axis


def swing_velocity(head_speed, path_angle=0.0, direction=0.0):
    """:func:`impact.geometry.swing_velocity`, compiled: the racket's velocity at the impact
    point from its speed [m/s], path angle [rad] and direction [rad] (numbers or ``(N,)``).

    Returns
    -------
    numpy.ndarray
        Velocity ``(N, 3)`` [m/s].

    Raises
    ------
    ValueError
        For inputs that are not numbers or 1-D arrays of one batch size.
    """
    (speed, path, direction), n_balls = _angles((head_speed, path_angle, direction), "inputs")
    out = np.empty((n_balls, 3))
    _swing_all(speed, path, direction, out)
    return out
