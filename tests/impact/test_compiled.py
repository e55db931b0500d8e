"""The compiled impact (rallyarc.impact.compiled) against the numpy impact model.

Reference: the project's numpy impact model, ``rallyarc.impact.contact.hit`` and ``collide``
and ``rallyarc.impact.geometry``, itself checked against the published worked values
(Brody's head-on hit, the clamped bounce formulas of Cross) in
tests/impact/test_impact_contact.py and tests/impact/test_impact_geometry.py. The compiled
kernels run the same formulas in the same order, so every output must agree: floats within
``TOL`` = 1e-9 (plus 1e-12 of their size, for ratios of tiny speeds that grow huge), NaN where
numpy's are NaN, flags and regimes equal. On the machine these tests were written on the
outputs are bit for bit numpy's (largest difference 0.0); ``cos`` and ``sin`` or numpy's
summation order may round differently elsewhere, by about one unit in the last place.
"""

from dataclasses import dataclass, fields

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.impact import compiled
from rallyarc.impact.contact import ContactResult, collide, hit
from rallyarc.impact.geometry import face_orientation, swing_velocity
from rallyarc.impact.racket import Racket, racket_inverse_masses
from rallyarc.impact.strings import string_restitution

TOL = 1e-9
RTOL = 1e-12
PRESETS = ("light", "standard", "heavy")


def _assert_same(got, want):
    """Every field of two contact results: floats within TOL (NaN alike), flags equal."""
    assert isinstance(got, ContactResult)
    for f in fields(ContactResult):
        a, b = getattr(got, f.name), getattr(want, f.name)
        assert a.shape == b.shape and a.dtype == b.dtype, f.name
        if b.dtype.kind == "f":
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=f.name)
            np.testing.assert_allclose(a, b, rtol=RTOL, atol=TOL, err_msg=f.name)
        else:
            np.testing.assert_array_equal(a, b, err_msg=f.name)
    np.testing.assert_array_equal(got.regime, want.regime)


def _impacts(rng, n, racket, friction_only):
    """N swings into N balls with a preset racket: faces and swings from random angles, balls
    into the face at 1-60 m/s with a random in-plane part and spin up to ~5000 rpm, impact
    points over the head (some at the tip, the butt and the frame's edge), friction from 0 to
    0.8, the string bed's restitution at each normal speed with a slope; a tenth of the swings
    miss (the ball moves away from the face or along it: the racket comes from behind), a few
    meet the ball with no slip at all, or with no in-plane motion but spin."""
    setup = domain.load_racket(racket)
    tilt = rng.normal(0.0, 0.4, n)
    azimuth = rng.normal(0.0, 0.5, n)
    roll = rng.uniform(-np.pi, np.pi, n)
    normal, axis = face_orientation(tilt, azimuth, roll)
    face_v = swing_velocity(
        rng.uniform(5.0, 45.0, n), rng.normal(0.3, 0.4, n), rng.normal(0, 0.3, n)
    )
    across = np.cross(normal, axis)
    into = rng.uniform(1.0, 60.0, n)
    in_plane = rng.normal(0.0, 12.0, (n, 2))
    v_rel = -into[:, None] * normal + in_plane[:, :1] * axis + in_plane[:, 1:] * across
    spin = rng.normal(0.0, 250.0, (n, 3))
    kind = rng.integers(0, 20, n)
    away = kind < 2  # the ball leaves the face (a swing from behind)
    v_rel[away] = v_rel[away] + 2.0 * into[away, None] * normal[away]
    along = kind == 2  # no normal speed at all: not approaching
    v_rel[along] = in_plane[along, :1] * axis[along]
    no_slip = kind == 3  # straight in, no spin: the slip is zero (grip by definition)
    v_rel[no_slip] = -into[no_slip, None] * normal[no_slip]
    spin[no_slip] = 0.0
    spin_only = kind == 4  # straight in with spin: no linear slip (slip ratio NaN)
    v_rel[spin_only] = -into[spin_only, None] * normal[spin_only]
    ball_v = face_v + v_rel
    x_impact = rng.uniform(0.40, 0.66, n)
    x_impact[kind == 5] = setup.racket.length_m
    x_impact[kind == 6] = 0.0
    offaxis = rng.uniform(-0.05, 0.05, n)
    offaxis[kind == 7] = 0.12
    normal_speed = np.einsum("ij,ij->i", v_rel, normal)
    e_n = string_restitution(setup.string_restitution, normal_speed, -0.003)
    mu = rng.uniform(0.0, 0.8, n)
    mu[kind == 8] = 0.0
    e_t = 0.0 if friction_only else rng.uniform(0.0, 0.3, n)
    ball = domain.load_ball("itf_type2")
    return (
        ball_v,
        spin,
        face_v,
        normal,
        axis,
        setup.racket,
        x_impact,
        offaxis,
        ball.mass,
        ball.radius,
        ball.alpha,
        e_n,
        mu,
        e_t,
    )


@pytest.mark.parametrize("friction_only", [False, True])
@pytest.mark.parametrize("racket", PRESETS)
def test_compiled_hit_gives_numpys_contact_on_thousands_of_impacts(racket, friction_only):
    rng = np.random.default_rng([PRESETS.index(racket), friction_only])
    args = _impacts(rng, 3000, racket, friction_only)
    want = hit(*args)
    got = compiled.hit(*args)
    _assert_same(got, want)
    # the draw reaches every branch of the contact
    regime = want.regime
    assert min((regime == r).sum() for r in ("grip", "slide", "none")) > 100
    assert want.stopped.any() and not want.stopped.all()
    assert np.isnan(want.slip_ratio).any() and np.isnan(want.spin_ratio_out).any()
    if friction_only:
        # no spring-back: the contact point that stops grips, and never slips back
        np.testing.assert_array_equal(want.stopped, want.grip)
        assert "grip-slip" not in set(regime)
    else:
        assert (regime == "grip-slip").sum() > 20


def test_compiled_hit_shares_inputs_given_once_for_all_balls():
    rng = np.random.default_rng(7)
    args = list(_impacts(rng, 400, "standard", False))
    racket = args[5]
    for shared in ([0, 1], [2, 3, 4], [6, 7], [11, 12, 13]):
        one = list(args)
        for k in shared:
            one[k] = args[k][0] if np.ndim(args[k]) else args[k]
        _assert_same(compiled.hit(*one), hit(*one))
    single = [a[0] if np.ndim(a) else a for a in args]
    single[5] = racket
    _assert_same(compiled.hit(*single), hit(*single))
    empty = [a[:0] if np.ndim(a) else a for a in args]
    empty[5] = racket
    got = compiled.hit(*empty)
    _assert_same(got, hit(*empty))
    assert got.velocity.shape == (0, 3)


def test_compiled_collide_gives_numpys_contact_for_free_and_clamped_rackets():
    rng = np.random.default_rng(11)
    args = list(_impacts(rng, 2000, "heavy", False))
    inv_n, inv_t = racket_inverse_masses(args[5], args[6], args[7])
    clamped = rng.random(2000) < 0.2
    inv_n = np.where(clamped, 0.0, inv_n)
    inv_t = np.where(clamped[:, None, None], 0.0, inv_t)
    kw = dict(zip(("ball_mass", "ball_radius", "ball_alpha"), args[8:11], strict=True))
    kw.update(racket_inv_mass_normal=inv_n, racket_inv_mass_tangential=inv_t)
    kw.update(zip(("e_n", "mu", "e_t"), args[11:14], strict=True))
    want = collide(*args[:5], **kw)
    got = compiled.collide(*args[:5], **kw)
    _assert_same(got, want)
    # one (2, 2) matrix for all balls
    shared = (args[0], args[1], args[2], args[3], args[4], 0.057, 0.0335, 0.55, inv_n[0], inv_t[0])
    _assert_same(compiled.collide(*shared, 0.8, 0.4, 0.1), collide(*shared, 0.8, 0.4, 0.1))


def test_compiled_geometry_gives_numpys_faces_and_swings():
    rng = np.random.default_rng(3)
    tilt, azimuth, roll = rng.uniform(-np.pi, np.pi, (3, 5000))
    for args in ((tilt, azimuth, roll), (tilt,), (0.1, azimuth, 2.0), (0.3, -0.2, np.pi)):
        for a, b in zip(compiled.face_orientation(*args), face_orientation(*args), strict=True):
            assert a.shape == b.shape
            np.testing.assert_allclose(a, b, rtol=0, atol=TOL)
    speed = rng.uniform(0.0, 60.0, 5000)
    for args in ((speed, tilt, azimuth), (speed,), (30.0, tilt, 0.5), (25.0,)):
        a, b = compiled.swing_velocity(*args), swing_velocity(*args)
        assert a.shape == b.shape
        np.testing.assert_allclose(a, b, rtol=0, atol=TOL)
    for bad in ((np.zeros((2, 2)),), (np.zeros(3), np.zeros(4))):
        with pytest.raises(ValueError):
            face_orientation(*bad)
        with pytest.raises(ValueError):
            compiled.face_orientation(*bad)
        with pytest.raises(ValueError):
            compiled.swing_velocity(*bad)


def _refusals(args):
    """Inputs that numpy's hit refuses, one way each: (index of the argument, its value,
    whether the message is numpy's word for word: not for shapes that do not broadcast, where
    numpy's message comes from the first operation that fails)."""
    n = len(args[0])
    normal, axis = args[3], args[4]
    tilted = np.array(axis)
    tilted[5] = (axis[5] + 0.01 * normal[5]) / np.linalg.norm(axis[5] + 0.01 * normal[5])
    return [
        (6, np.where(np.arange(n) == 3, 0.7, args[6]), True),  # beyond the tip
        (6, -0.01, True),  # beyond the butt
        (3, 1.01 * normal, True),
        (4, 0.99 * axis, True),
        (4, tilted, True),
        (8, 0.0, True),
        (9, -0.03, True),
        (10, np.nan, True),
        (11, np.where(np.arange(n) == 2, 1.2, args[11]), True),
        (12, -0.1, True),
        (13, 1.5, True),
        (0, np.zeros((n, 2)), True),
        (6, np.zeros((n, 2)), False),
        (7, np.zeros(n + 1), False),
    ]


def test_compiled_hit_refuses_what_numpys_refuses_with_its_message():
    rng = np.random.default_rng(5)
    args = list(_impacts(rng, 50, "light", False))
    for k, value, same_message in _refusals(args):
        bad = list(args)
        bad[k] = value
        with pytest.raises(ValueError) as want:
            hit(*bad)
        with pytest.raises(ValueError) as got:
            compiled.hit(*bad)
        if same_message:
            assert str(got.value) == str(want.value)


def test_compiled_collide_refuses_a_bad_racket_matrix_as_numpy_does():
    v, n, a = [0.0, 0.0, -10.0], [0.0, 0.0, 1.0], [1.0, 0.0, 0.0]
    for k_r, inv_n in (
        (np.array([[1.0, 0.5], [0.4, 1.0]]), 0.1),
        (np.array([[-1.0, 0.0], [0.0, 1.0]]), 0.1),
        (np.array([[np.inf, 0.0], [0.0, 1.0]]), 0.1),
        (np.eye(2), -1.0),
        (np.zeros((3, 2)), 0.1),
    ):
        args = (v, [0.0, 0.0, 0.0], [0.0, 0.0, 0.0], n, a, 0.057, 0.0335, 0.55, inv_n, k_r)
        with pytest.raises(ValueError) as want:
            collide(*args, 0.8, 0.4)
        with pytest.raises(ValueError) as got:
            compiled.collide(*args, 0.8, 0.4)
        assert str(got.value) == str(want.value)


def test_a_racket_without_plain_numbers_has_no_compiled_form():
    @dataclass(frozen=True)
    class PerBallRacket:
        mass_kg: object
        balance_m: float = 0.32
        swingweight_kgm2: float = 0.032
        twistweight_kgm2: float = 0.0015
        length_m: float = 0.686

    assert compiled.supports(Racket(0.315, 0.32, 0.032))
    assert compiled.supports(domain.load_racket("heavy").racket)
    per_ball = PerBallRacket(np.array([0.30, 0.32]))
    assert not compiled.supports(per_ball)
    assert not compiled.supports(object())
    args = list(_impacts(np.random.default_rng(2), 2, "standard", False))
    args[5] = per_ball
    hit(*args)  # numpy strikes it
    with pytest.raises(TypeError, match="impact.contact.hit"):
        compiled.hit(*args)
