"""The stroke aim's whole solve compiled with numba: for each target, the Levenberg-Marquardt
iteration of :func:`rallyarc.aim.solver.solve` (method "newton" or "broyden") with its residual,
one target at a time in a compiled loop instead of one round of numpy calls per iteration for
the batch.

The residual is :meth:`rallyarc.aim.stroke._StrokeSystem.evaluate` with the compiled engine: the
swing of the parameters (the face azimuth turning with the swing direction), the string bed's
restitution at the normal speed, the racket impact of :mod:`rallyarc.impact.compiled`
(:func:`~rallyarc.impact.compiled._hit_ball`), the first flight to the ground with the net plane
of :mod:`rallyarc.flight.compiled` (:func:`~rallyarc.flight.compiled._fly_ball`), the net
clearance as :func:`rallyarc.shot.stages.net` computes it and the ground point as
:func:`rallyarc.shot.stages.landing` does, with the fallbacks of the numpy residual for a ball
that never reaches the ground or the net.

The iteration is the numpy solver's, step for step: the start clipped to the bounds, the
forward differences (a step of 1e-4 of the parameter's scale, downward at the upper bound), the
inactive parameters pinned, the damped normal equations, the step clipped to five scales and
the trial to the bounds, the damping times 0.3 after a success and 10 after a failure, the stop
at a cost of at most 1 or a damping of 1e8, and the cap on iterations. Method "broyden" takes
the differences at the start only and then, per iteration, either one trial step with
Broyden's rank-one update of the Jacobian (in parameters measured in their scales) or fresh
differences at the current point where the last step of an updated Jacobian failed or stalled
(lowered the cost by less than :data:`rallyarc.aim.solver.STALL_RATIO`), with the numpy
solver's damping rules (a failed step of a Jacobian from differences: ten times the damping;
of an updated one: the same damping). Each target's iteration count is what the numpy solver
counts for it; the batch's count is the largest.

The normal equations are summed and solved in the order of the BLAS and LAPACK routines numpy
calls for the numpy solver's arrays on the machine the parity tests were written on (``J'J``
accumulated by fused multiply-adds in index order, ``J'r`` from the product of the first two
terms onward, an LU factorisation with partial pivoting computed column by column, the back
substitution from the last column), and Broyden's ``J dq`` in index order as numpy's ``einsum``
sums it over the numpy solver's Jacobians: there the solutions are bit for bit numpy's, and the
tests bound them at 1e-9 (tests/aim/test_aim_compiled.py). Another BLAS, or another memory
layout of the numpy solver's Jacobians (over C-ordered ones ``einsum`` sums the even terms of
``J dq`` first), may round the last bit differently, and the iteration may magnify that.

Targets whose inputs the impact or the flight would refuse (or whose normal equations are
singular) are reported as refused, so that the caller solves the batch with numpy, which
raises the errors it raises.

The first call in a process compiles the kernel, or loads it from numba's cache beside this
module (``cache=True``). numba's cache checks this file only: after a change of the impact or
flight kernels it calls, remove the cache files of this module (``__pycache__/compiled.*.nbi``
and ``.nbc`` beside it).
"""

from __future__ import annotations

import math

import numba
import numpy as np
from numba.core import types
from numba.extending import intrinsic

from rallyarc import court
from rallyarc.aim.solver import HEIGHT_TOL_M, LAND_TOL_M, METHODS, STALL_RATIO
from rallyarc.domain.objects import Conditions, RacketSetup
from rallyarc.flight import compiled as flight_kernels
from rallyarc.impact import compiled as impact_kernels
from rallyarc.impact.strings import STRING_RESTITUTION_REFERENCE_SPEED_MPS
from rallyarc.shot import Swing, stages

__all__ = ["solve_stroke", "supports"]

# the swing's fields, in the order of Swing.FIELDS
_SPEED, _PATH, _DIRECTION, _TILT, _AZIMUTH, _ROLL, _FROM_BUTT, _OFFAXIS = (
    Swing.FIELDS.index(f)
    for f in (
        "head_speed",
        "swing_path",
        "swing_direction",
        "face_tilt",
        "face_azimuth",
        "racket_roll",
        "impact_from_butt",
        "impact_offaxis",
    )
)
#: Error bit of a ball whose velocity or spin after the impact is not finite (the flight
#: refuses it), and of singular normal equations; above the impact's bits.
_E_FLIGHT = 1 << 20
_E_SINGULAR = 1 << 21
# LAPACK's safe minimum: a pivot at least this large is inverted once, a smaller one divides
_SAFE_MIN = 2.2250738585072014e-308
_NET_CENTRE = court.NET_HEIGHT_CENTRE
_NET_RISE = court.NET_HEIGHT_POST - court.NET_HEIGHT_CENTRE
_LAND_TOL = LAND_TOL_M
_HEIGHT_TOL = HEIGHT_TOL_M
_STALL = STALL_RATIO


@intrinsic
def _fma(typingctx, x, y, z):
    """``x * y + z`` rounded once [-]."""
    sig = types.float64(types.float64, types.float64, types.float64)

    def codegen(context, builder, signature, args):
        return builder.fma(*args)

    return sig, codegen


def supports(conditions):
    """Whether the compiled solve can aim in ``conditions``: an aero model with a compiled
    flight, a racket with a compiled impact, and the string bed's contact of
    :meth:`rallyarc.domain.Conditions.string_contact` (not an override of it)."""
    return (
        stages.compiled_flight(conditions.flight_params(), "compiled") is not None
        and stages.compiled_impact(conditions.racket.racket, "compiled") is not None
        and type(conditions).string_contact is Conditions.string_contact
        and type(conditions.racket).normal_restitution is RacketSetup.normal_restitution
    )


@numba.njit(cache=True, error_model="numpy")
def _scratch():
    """The scratch arrays of one residual: the swing's fields, the impact's output blocks
    (one ball), the ball at contact, after the impact and in flight, and the flight's rows."""
    return (
        np.empty(8),
        np.empty((6, 1, 3)),
        np.empty((7, 1)),
        np.empty((3, 1), dtype=np.bool_),
        np.empty(3),
        np.empty(3),
        np.empty(3),
        np.empty(3),
        np.empty(3),
        np.empty((1, 3)),
        np.empty((1, 3)),
        np.empty((1, 3)),
        np.empty((1, 10)),
        np.empty((1, 10)),
        np.empty((1, 10)),
        np.empty(1, dtype=np.int64),
        np.empty(1, dtype=np.int64),
        np.empty(3),
        np.empty(3),
        np.empty(3),
        np.empty(3),
    )


@numba.njit(cache=True, error_model="numpy")
def _residual(
    q, i, k, balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol, sc, work, res
):
    """The residual of target ``i`` at parameters ``q`` (k,) (SI) into ``res`` (k,), divided
    by the tolerances [-]; returns the error bits of the impact's and the flight's inputs.

    ``balls`` (N, 9): position [m], velocity [m/s] and spin [rad/s] at contact; ``swing``
    (N, 8): the base swing's fields (SI, in the order of ``Swing.FIELDS``), ``offset`` (N,)
    the face azimuth less the swing direction [rad], ``slots`` (k,) the field each parameter
    sets; ``goal`` (N, 3): target x, y [m] and net clearance [m], ``has`` (N,) whether the
    clearance counts; ``racket``, ``ball``, ``strings``, ``fp`` and ``tol`` as
    :func:`_solve_all` takes them; ``sc`` the arrays of :func:`_scratch`, ``work`` those of
    :func:`rallyarc.flight.compiled._scratch`."""
    fields, vec, num, flag, face_n, face_a, face_v, v_in, w_in = sc[:9]
    pos, vel, spin, net, ground, end, term, steps = sc[9:17]
    x, v, a, w0 = sc[17:]
    mass, balance, twistweight, length, i_cm, i_nn, inv_mass = racket
    m, r, alpha, r_net, support = ball
    e_ref, slope, v_ref, mu, e_t = strings
    t_max, rtol, atol = tol
    for f in range(8):
        fields[f] = swing[i, f]
    for j in range(k):
        fields[slots[j]] = q[j]
    fields[_AZIMUTH] = fields[_DIRECTION] + offset[i]
    n0, n1, n2, a0, a1, a2 = impact_kernels._face_ball(
        fields[_TILT], fields[_AZIMUTH], fields[_ROLL]
    )
    face_n[0], face_n[1], face_n[2] = n0, n1, n2
    face_a[0], face_a[1], face_a[2] = a0, a1, a2
    f0, f1, f2 = impact_kernels._swing_ball(fields[_SPEED], fields[_PATH], fields[_DIRECTION])
    face_v[0], face_v[1], face_v[2] = f0, f1, f2
    for c in range(3):
        v_in[c] = balls[i, 3 + c]
        w_in[c] = balls[i, 6 + c]
    # the string bed's restitution at the ball's normal speed into the face
    v_n = impact_kernels._dot3(v_in[0] - f0, v_in[1] - f1, v_in[2] - f2, n0, n1, n2)
    e_n = e_ref + slope * (abs(v_n) - v_ref)
    if e_n < 0.0:
        e_n = 0.0
    elif e_n > 1.0:
        e_n = 1.0
    bad = impact_kernels._hit_ball(
        0,
        v_in,
        w_in,
        face_v,
        face_n,
        face_a,
        mass,
        balance,
        twistweight,
        length,
        i_cm,
        i_nn,
        inv_mass,
        fields[_FROM_BUTT],
        fields[_OFFAXIS],
        m,
        r,
        alpha,
        e_n,
        mu,
        e_t,
        vec,
        num,
        flag,
    )
    for c in range(3):
        pos[0, c] = balls[i, c]
        vel[0, c] = vec[0, 0, c]
        spin[0, c] = vec[1, 0, c]
        if not (
            math.isfinite(pos[0, c]) and math.isfinite(vel[0, c]) and math.isfinite(spin[0, c])
        ):
            bad |= _E_FLIGHT
    if bad:
        for j in range(k):
            res[j] = 0.0
        return bad
    for c in range(10):
        net[0, c] = np.nan
        ground[0, c] = np.nan
    term[0] = -1
    steps[0] = 0
    flight_kernels._fly_ball(
        0, pos, vel, spin, fp, t_max, rtol, atol, net, ground, end, term, steps, work, x, v, a, w0
    )
    gx = end[0, 1] if term[0] == 1 else np.nan
    gy = end[0, 2] if term[0] == 1 else np.nan
    res[0] = ((gx if math.isfinite(gx) else -30.0) - goal[i, 0]) / _LAND_TOL
    res[1] = ((gy if math.isfinite(gy) else 0.0) - goal[i, 1]) / _LAND_TOL
    if k == 3:
        if has[i]:
            clearance = np.nan
            if flag[0, 0] and not math.isnan(net[0, 0]):
                frac = min(abs(net[0, 2]) / support, 1.0)
                top = _NET_CENTRE + _NET_RISE * frac**2
                clearance = net[0, 3] - r_net - top
            res[2] = ((clearance if math.isfinite(clearance) else -2.0) - goal[i, 2]) / _HEIGHT_TOL
        else:
            res[2] = 0.0
    return bad


@numba.njit(cache=True, error_model="numpy")
def _jacobian(q, r0, i, k, act, lo_hi, h, data, sc, work, jac, pert, rp):
    """Forward differences of the residual at ``q`` (residual ``r0``) into ``jac`` (k eqs,
    k params), as the numpy solver takes them: active parameters only, each perturbed by its
    step ``h`` [SI] (downward where that reaches the upper bound), non-finite entries zero, and
    the inactive parameters pinned to rows of their own. Returns the error bits."""
    balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol = data
    hi = lo_hi[1]
    bad = 0
    for e in range(k):
        for j in range(k):
            jac[e, j] = 0.0
    for j in range(k):
        if not act[j]:
            continue
        step = h[j] * (-1.0 if q[j] + h[j] >= hi[j] else 1.0)
        for c in range(k):
            pert[c] = q[c]
        pert[j] = q[j] + step
        bad |= _residual(
            pert, i, k, balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol,
            sc, work, rp,
        )  # fmt: skip
        for e in range(k):
            d = (rp[e] - r0[e]) / step
            jac[e, j] = d if math.isfinite(d) else 0.0
    _pin(jac, act, k)
    return bad


@numba.njit(cache=True, error_model="numpy")
def _pin(jac, act, k):
    """Pin the inactive parameters of ``jac`` (k eqs, k params) as the numpy solver's
    ``_pinned`` does: no part in the active residuals (their columns zero), and an identity
    row of their own in place of one of the zero residuals."""
    off = 0
    for j in range(k):
        if not act[j]:
            off += 1
    if off == 0:
        return
    for j in range(k):
        if not act[j]:
            for e in range(k):
                jac[e, j] = 0.0
    # a system's j inactive parameters take its last j rows, in parameter order
    for e in range(k - off, k):
        for j in range(k):
            jac[e, j] = 0.0
    row = k - off
    for j in range(k):
        if not act[j]:
            jac[row, j] = 1.0
            row += 1


@numba.njit(cache=True, error_model="numpy")
def _evaluate(q, i, k, act, lo_hi, h, data, sc, work, res, jac, pert, rp):
    """Residual and Jacobian of target ``i`` at ``q``; returns the error bits."""
    balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol = data
    bad = _residual(
        q, i, k, balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol, sc,
        work, res,
    )  # fmt: skip
    if bad:
        return bad
    return _jacobian(q, res, i, k, act, lo_hi, h, data, sc, work, jac, pert, rp)


@numba.njit(cache=True, error_model="numpy")
def _cost(res, k):
    total = res[0] * res[0]
    for e in range(1, k):
        total = total + res[e] * res[e]
    return total


@numba.njit(cache=True, error_model="numpy")
def _lm_step(jac, res, lam, scale, act, k, mat, rhs, step):
    """The damped Gauss-Newton step into ``step`` (k,) [SI]: ``(J'J + lam diag(J'J + 1e-9)) s
    = -J'r`` by an LU factorisation with partial pivoting, clipped to five scales, zero for
    the inactive parameters. Returns False where the equations are singular."""
    for a in range(k):
        for c in range(k):
            s = jac[0, a] * jac[0, c]
            for e in range(1, k):
                s = _fma(jac[e, a], jac[e, c], s)
            mat[a, c] = s
        s = _fma(jac[0, a], res[0], jac[1, a] * res[1])
        for e in range(2, k):
            s = _fma(jac[e, a], res[e], s)
        rhs[a] = -s
    for a in range(k):
        damp = lam * (mat[a, a] + 1e-9)
        for c in range(k):
            mat[a, c] = mat[a, c] + damp * (1.0 if a == c else 0.0)
    # LU, column by column: the column's upper part, then its lower part, then the pivot
    for j in range(k):
        for i in range(1, j):
            s = mat[i, 0] * mat[0, j]
            for c in range(1, i):
                s = _fma(mat[i, c], mat[c, j], s)
            mat[i, j] = mat[i, j] - s
        if j > 0:
            for i in range(j, k):
                s = mat[i, 0] * mat[0, j]
                for c in range(1, j):
                    s = _fma(mat[i, c], mat[c, j], s)
                mat[i, j] = mat[i, j] - s
        p = j
        for i in range(j + 1, k):
            if abs(mat[i, j]) > abs(mat[p, j]):
                p = i
        pivot = mat[p, j]
        if pivot == 0.0 or not math.isfinite(pivot):
            return False
        if p != j:
            for c in range(k):
                mat[j, c], mat[p, c] = mat[p, c], mat[j, c]
            rhs[j], rhs[p] = rhs[p], rhs[j]
        if abs(pivot) >= _SAFE_MIN:
            inv = 1.0 / pivot
            for i in range(j + 1, k):
                mat[i, j] = mat[i, j] * inv
        else:
            for i in range(j + 1, k):
                mat[i, j] = mat[i, j] / pivot
    for i in range(1, k):
        s = rhs[i]
        for c in range(i):
            s = _fma(-mat[i, c], rhs[c], s)
        rhs[i] = s
    for i in range(k - 1, -1, -1):
        s = rhs[i]
        for c in range(k - 1, i, -1):
            s = _fma(-mat[i, c], rhs[c], s)
        rhs[i] = s / mat[i, i]
    for a in range(k):
        if act[a]:
            limit = 5.0 * scale[a]
            s = rhs[a]
            step[a] = -limit if s < -limit else (limit if s > limit else s)
        else:
            step[a] = 0.0
    return True


@numba.njit(cache=True, error_model="numpy")
def _solve_all(
    p0, lo, hi, scale, active, iterations, balls, swing, offset, slots, goal, has, racket,
    ball, strings, fp, tol, p, solved, iters,
):  # fmt: skip
    """The Levenberg-Marquardt solve of every target, one after the other.

    ``p0`` (N, k): starts (SI); ``lo``, ``hi``, ``scale`` (k,): bounds and scales (SI);
    ``active`` (N, k) the parameters each target may move; ``iterations`` the cap. ``racket``:
    mass [kg], balance [m], twistweight [kg m^2], length [m] and the constants of
    :func:`rallyarc.impact.compiled._racket_constants`; ``ball``: mass [kg], radius [m], alpha
    [-], the radius the net clearance takes off [m] and the net's support from the centre [m];
    ``strings``: restitution at the reference speed [-], its slope [s/m], the reference speed
    [m/s], friction [-] and tangential restitution [-]; ``fp`` the flight's parameter vector;
    ``tol``: longest flight [s], rtol and atol. Writes the solutions ``p`` (N, k), ``solved``
    (N,) (cost at most 1) and ``iters`` (N,), and returns the error bits of each target (N,).
    """
    n, k = p0.shape
    data = (balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol)
    lo_hi = (lo, hi)
    sc = _scratch()
    work = flight_kernels._scratch()
    h = 1e-4 * scale
    res, res_t, step = np.empty(k), np.empty(k), np.empty(k)
    trial, pert, rp, rhs = np.empty(k), np.empty(k), np.empty(k), np.empty(k)
    jac, jac_t, mat = np.empty((k, k)), np.empty((k, k)), np.empty((k, k))
    bad = np.zeros(n, dtype=np.int64)
    for i in range(n):
        q = p[i]
        act = active[i]
        for j in range(k):
            q[j] = min(max(p0[i, j], lo[j]), hi[j])
        flags = _evaluate(q, i, k, act, lo_hi, h, data, sc, work, res, jac, pert, rp)
        cost = _cost(res, k)
        lam = 1e-2
        done = 0
        while flags == 0 and done < iterations:
            if not (cost > 1.0 and lam < 1e8):
                break
            done += 1
            if not _lm_step(jac, res, lam, scale, act, k, mat, rhs, step):
                flags |= _E_SINGULAR
                break
            for j in range(k):
                trial[j] = min(max(q[j] + step[j], lo[j]), hi[j])
            flags |= _evaluate(trial, i, k, act, lo_hi, h, data, sc, work, res_t, jac_t, pert, rp)
            cost_t = _cost(res_t, k)
            if cost_t < cost:
                for j in range(k):
                    q[j] = trial[j]
                    res[j] = res_t[j]
                    for e in range(k):
                        jac[e, j] = jac_t[e, j]
                cost = cost_t
                lam = lam * 0.3
            else:
                lam = lam * 10.0
        solved[i] = cost <= 1.0
        iters[i] = done
        bad[i] = flags
    return bad


@numba.njit(cache=True, error_model="numpy")
def _broyden_update(jac, dq, dr, scale, act, k):
    """Broyden's rank-one update of ``jac`` (k eqs, k params) in place from the step ``dq``
    (k,) [SI] and the residual change ``dr`` (k,) [-], in parameters measured in ``scale``
    (SI), as the numpy solver's ``_broyden_update`` computes it: no update where ``dr`` is not
    finite or the step is zero, the inactive parameters pinned. ``J dq`` is summed in index
    order, as numpy's ``einsum`` sums it over the numpy solver's Jacobians (whose parameter
    axis is the outer one in memory)."""
    norm = (dq[0] / scale[0]) * (dq[0] / scale[0])
    for j in range(1, k):
        du = dq[j] / scale[j]
        norm = norm + du * du
    ok = norm > 0.0
    for e in range(k):
        if not math.isfinite(dr[e]):
            ok = False
    if ok:
        for e in range(k):
            pred = jac[e, 0] * dq[0]
            for j in range(1, k):
                pred = pred + jac[e, j] * dq[j]
            miss = dr[e] - pred
            for j in range(k):
                jac[e, j] = jac[e, j] + miss * ((dq[j] / scale[j]) / scale[j]) / norm
    _pin(jac, act, k)


@numba.njit(cache=True, error_model="numpy")
def _solve_all_broyden(
    p0, lo, hi, scale, active, iterations, balls, swing, offset, slots, goal, has, racket,
    ball, strings, fp, tol, p, solved, iters,
):  # fmt: skip
    """The Levenberg-Marquardt solve with Broyden updates of every target, one after the
    other: the iteration of the numpy solver's method "broyden", with the arguments, outputs
    and error bits of :func:`_solve_all`.

    A target starts from forward differences at its start; an iteration either takes
    differences at the current point (where the last step of an updated Jacobian failed or
    lowered the cost by less than :data:`rallyarc.aim.solver.STALL_RATIO`) or tries one step,
    one residual, and updates the Jacobian from it (keeping the Jacobian from differences,
    and ten times the damping, where a step from one fails). The damping falls to 0.3 times
    after a success and stays after a failed step of an updated Jacobian.
    """
    n, k = p0.shape
    data = (balls, swing, offset, slots, goal, has, racket, ball, strings, fp, tol)
    lo_hi = (lo, hi)
    sc = _scratch()
    work = flight_kernels._scratch()
    h = 1e-4 * scale
    res, res_t, step = np.empty(k), np.empty(k), np.empty(k)
    trial, pert, rp, rhs = np.empty(k), np.empty(k), np.empty(k), np.empty(k)
    dq, dr = np.empty(k), np.empty(k)
    jac, mat = np.empty((k, k)), np.empty((k, k))
    bad = np.zeros(n, dtype=np.int64)
    for i in range(n):
        q = p[i]
        act = active[i]
        for j in range(k):
            q[j] = min(max(p0[i, j], lo[j]), hi[j])
        flags = _evaluate(q, i, k, act, lo_hi, h, data, sc, work, res, jac, pert, rp)
        cost = _cost(res, k)
        lam = 1e-2
        fresh = True  # the Jacobian is from differences at q
        refresh = False  # take differences at q on the next iteration
        done = 0
        while flags == 0 and done < iterations:
            if not (cost > 1.0 and lam < 1e8):
                break
            done += 1
            if refresh:
                flags |= _jacobian(q, res, i, k, act, lo_hi, h, data, sc, work, jac, pert, rp)
                fresh, refresh = True, False
                continue
            if not _lm_step(jac, res, lam, scale, act, k, mat, rhs, step):
                flags |= _E_SINGULAR
                break
            for j in range(k):
                trial[j] = min(max(q[j] + step[j], lo[j]), hi[j])
            flags |= _residual(
                trial, i, k, balls, swing, offset, slots, goal, has, racket, ball, strings, fp,
                tol, sc, work, res_t,
            )  # fmt: skip
            cost_t = _cost(res_t, k)
            better = cost_t < cost
            failed_fresh = fresh and not better
            if not failed_fresh:
                for j in range(k):
                    dq[j] = trial[j] - q[j]
                    dr[j] = res_t[j] - res[j]
                _broyden_update(jac, dq, dr, scale, act, k)
            stalled = better and cost_t > _STALL * cost and not fresh
            if better:
                for j in range(k):
                    q[j] = trial[j]
                    res[j] = res_t[j]
                cost = cost_t
                lam = lam * 0.3
            elif failed_fresh:
                lam = lam * 10.0
            # a failed or stalled step of an updated Jacobian: differences at q next time; a
            # failed step of a Jacobian from differences: more damping (it stays the one at q)
            refresh = (stalled or not better) and not failed_fresh
            fresh = failed_fresh
        solved[i] = cost <= 1.0
        iters[i] = done
        bad[i] = flags
    return bad


def solve_stroke(system, p0, lo, hi, scale, active=None, iterations=30, method="newton"):
    """Solve the aiming systems of a :class:`rallyarc.aim.stroke._StrokeSystem` (a tilt or
    speed style, no third goal or a net clearance) with the compiled iteration.

    ``p0`` (N, k): starts (SI); ``lo``, ``hi``, ``scale`` (k,) bounds and scales (SI);
    ``active`` (N, k) bool, optional; ``method`` the Jacobian rule of
    :func:`rallyarc.aim.solver.solve` ("newton" or "broyden"). Returns
    ``(p, solved, iterations)`` as
    :func:`rallyarc.aim.solver.solve` does, and the iterations of each target ``(N,)``; or
    None where a target's inputs are refused by the impact or the flight, or its normal
    equations are singular (the numpy solver then raises the error it raises).
    """
    if method not in METHODS:
        raise ValueError(f"method must be one of {', '.join(METHODS)}")
    p0 = np.ascontiguousarray(p0, dtype=float)
    n, k = p0.shape
    cond = system.conditions
    state, base = system.state, system.base
    balls = np.ascontiguousarray(np.concatenate([state.position, state.velocity, state.spin], 1))
    swing = np.ascontiguousarray(np.stack([getattr(base, f) for f in Swing.FIELDS], axis=1))
    offset = np.ascontiguousarray(system.offset, dtype=float)
    slots = np.array([Swing.FIELDS.index(name) for name in system.names], dtype=np.int64)
    goal = np.zeros((n, 3))
    goal[:, 0], goal[:, 1] = system.tx, system.ty
    has = np.zeros(n, dtype=np.bool_)
    if system.extra is not None:
        if system.extra_key != "net_clearance_m":
            raise ValueError("the compiled aim meets a net clearance, not a receiver height")
        goal[:, 2] = system.extra
        has = np.ones(n, bool) if system.has_extra is None else np.asarray(system.has_extra)
    active = np.ones((n, k), bool) if active is None else np.asarray(active, bool)
    rk = cond.racket.racket
    mass, balance = float(rk.mass_kg), float(rk.balance_m)
    swingweight, twistweight = float(rk.swingweight_kgm2), float(rk.twistweight_kgm2)
    i_cm, i_nn, inv_mass, bad_racket = impact_kernels._racket_constants(
        mass, balance, swingweight, twistweight
    )
    if bad_racket:
        return None
    racket = (mass, balance, twistweight, float(rk.length_m), i_cm, i_nn, inv_mass)
    b = cond.ball
    support = court.SINGLES_STICK_Y if cond.singles else court.POST_Y
    ball = (float(b.mass), float(b.radius), float(b.alpha), float(b.radius), float(support))
    rs = cond.racket
    strings = (
        float(rs.string_restitution),
        float(rs.string_restitution_slope_s_per_m),
        float(STRING_RESTITUTION_REFERENCE_SPEED_MPS),
        float(rs.string_friction),
        float(cond.string_tangential_restitution),
    )
    params = cond.flight_params()
    fp = flight_kernels._param_vector(params)
    tol = (float(stages.T_MAX), 1e-6, 1e-6)
    p = np.empty((n, k))
    solved = np.zeros(n, dtype=np.bool_)
    iters = np.zeros(n, dtype=np.int64)
    kernel = _solve_all if method == "newton" else _solve_all_broyden
    bad = kernel(
        p0, np.asarray(lo, float), np.asarray(hi, float),
        np.ascontiguousarray(np.broadcast_to(np.asarray(scale, float), (k,))),
        np.ascontiguousarray(active), int(iterations), balls, swing, offset, slots, goal,
        has, racket, ball, strings, fp, tol, p, solved, iters,
    )  # fmt: skip
    if bad.any():
        return None
    return p, solved, int(iters.max()) if n else 0, iters
