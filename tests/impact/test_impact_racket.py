"""Tests for impact.racket: mass properties, effective mass, apparent COR, inverse masses."""

import numpy as np
import pytest

from rallyarc.impact.racket import (
    Racket,
    apparent_cor,
    effective_mass,
    inertia_about_cm,
    normal_inverse_mass,
    racket_inverse_masses,
    tangential_inverse_mass,
)

# Worked racket of REFERENCES.md (Brody 1997, Am. J. Phys. 65:981; Cross 1999, Am. J. Phys. 67:692).
M, BP, I10, X_IMPACT, M_BALL, E = 0.32, 0.32, 0.032, 0.52, 0.057, 0.85


def test_inertia_about_cm_worked_racket():
    # I_cm = 0.032 - 0.32 * 0.22**2 = 0.016512 kg m^2 (Brody 1997, Am. J. Phys. 65:981)
    assert inertia_about_cm(M, BP, I10) == pytest.approx(0.016512, rel=1e-12)


def test_brody_cross_worked_effective_mass_and_apparent_cor():
    m_e = effective_mass(M, BP, I10, X_IMPACT)
    # 1/M_e = 3.125 + 0.04 / 0.016512 -> M_e = 0.1803 kg
    # (Brody 1997, Am. J. Phys. 65:981; Cross 1999, Am. J. Phys. 67:692)
    assert m_e == pytest.approx(0.1803, rel=1e-3)
    e_a = apparent_cor(E, m_e, M_BALL)
    # e_A = (e M_e - m) / (M_e + m) = 0.4056 (Brody 1997, Am. J. Phys. 65:981)
    assert e_a == pytest.approx(0.4056, abs=1e-4)
    v_out = e_a * 20.0 + (1.0 + e_a) * 30.0
    # v_in 20 m/s, V 30 m/s -> 50.28 m/s (Brody 1997, Am. J. Phys. 65:981)
    assert v_out == pytest.approx(50.28, abs=0.01)


def test_apparent_cor_limits():
    # A clamped racket (infinite effective mass) returns the ball-on-strings COR itself,
    # and equal masses with e = 1 exchange velocities (e_A = 0): exact two-body results.
    assert apparent_cor(0.85, 1e12, 0.057) == pytest.approx(0.85, rel=1e-9)
    assert apparent_cor(1.0, 0.057, 0.057) == pytest.approx(0.0, abs=1e-15)


def test_effective_mass_off_axis_adds_twist_term():
    b, d, tw = X_IMPACT - BP, 0.04, 0.0015
    expected = 1.0 / (1.0 / M + b**2 / 0.016512 + d**2 / tw)
    assert effective_mass(M, BP, I10, X_IMPACT, offaxis=d, twistweight=tw) == pytest.approx(
        expected, rel=1e-12
    )
    # with the default infinite twistweight an off-axis offset changes nothing
    assert effective_mass(M, BP, I10, X_IMPACT, offaxis=d) == pytest.approx(
        effective_mass(M, BP, I10, X_IMPACT), rel=1e-15
    )


def test_effective_mass_at_centre_of_mass_is_racket_mass():
    assert effective_mass(M, BP, I10, BP) == pytest.approx(M, rel=1e-15)


def test_effective_mass_scalar_list_array():
    scalar = effective_mass(M, BP, I10, X_IMPACT)
    assert np.ndim(scalar) == 0
    as_list = effective_mass(M, BP, I10, [0.40, 0.52, 0.60])
    assert np.shape(as_list) == (3,)
    assert as_list[1] == pytest.approx(scalar, rel=1e-15)
    x = np.linspace(0.35, 0.65, 100_000)
    many = effective_mass(M, BP, I10, x)
    assert many.shape == x.shape
    assert np.all(np.diff(many[x > BP]) < 0.0)  # lighter toward the tip
    assert np.allclose(normal_inverse_mass(M, BP, I10, x), 1.0 / many, rtol=1e-14)


def test_effective_mass_rejects_impossible_swingweight():
    with pytest.raises(ValueError, match="swingweight"):
        effective_mass(0.32, 0.32, 0.01, 0.52)  # I10 below M (bp - 0.1)^2


def _rigid_body_in_plane_response(mass, i_cm, twistweight, b, d):
    """Impact-point velocity change per unit in-plane impulse, from the full inertia tensor."""
    inertia = np.diag([twistweight, i_cm, i_cm + twistweight])  # (a, c, n) body basis
    r = np.array([b, d, 0.0])
    columns = []
    for impulse in (np.array([1.0, 0.0, 0.0]), np.array([0.0, 1.0, 0.0])):
        omega = np.linalg.solve(inertia, np.cross(r, impulse))
        dv = impulse / mass + np.cross(omega, r)
        assert dv[2] == pytest.approx(0.0, abs=1e-12)  # in-plane impulse stays in plane
        columns.append(dv[:2])
    return np.column_stack(columns)


@pytest.mark.parametrize("x_impact, offaxis", [(0.52, 0.0), (0.55, 0.03), (0.45, -0.05)])
def test_tangential_inverse_mass_matches_rigid_body(x_impact, offaxis):
    tw = 0.0015
    k = tangential_inverse_mass(M, BP, I10, tw, x_impact, offaxis)
    expected = _rigid_body_in_plane_response(M, 0.016512, tw, x_impact - BP, offaxis)
    np.testing.assert_allclose(k, expected, rtol=1e-12, atol=1e-12)


def test_tangential_inverse_mass_shapes_and_definiteness():
    assert tangential_inverse_mass(M, BP, I10, 0.0015, X_IMPACT).shape == (2, 2)
    assert tangential_inverse_mass(M, BP, I10, 0.0015, [0.5, 0.6], 0.01).shape == (2, 2, 2)
    rng = np.random.default_rng(3)
    x = rng.uniform(0.3, 0.68, 50_000)
    d = rng.uniform(-0.06, 0.06, 50_000)
    k = tangential_inverse_mass(M, BP, I10, 0.0015, x, d)
    assert k.shape == (50_000, 2, 2)
    np.testing.assert_array_equal(k[:, 0, 1], k[:, 1, 0])
    eig = np.linalg.eigvalsh(k)
    assert np.all(eig >= 1.0 / M * (1 - 1e-12))  # never lighter than the free mass alone


def test_racket_defaults_and_inertia():
    racket = Racket(M, BP, I10)
    assert racket.twistweight_kgm2 == 0.0015
    assert racket.length_m == 0.686
    assert racket.inertia_cm_kgm2 == pytest.approx(0.016512, rel=1e-12)


@pytest.mark.parametrize(
    "kwargs, match",
    [
        (dict(mass_kg=0.0), "mass_kg"),
        (dict(mass_kg=-0.3), "mass_kg"),
        (dict(balance_m=float("nan")), "balance_m"),
        (dict(swingweight_kgm2=0.0), "swingweight_kgm2"),
        (dict(twistweight_kgm2=-1e-3), "twistweight_kgm2"),
        (dict(length_m=0.0), "length_m"),
        (dict(balance_m=0.70), "less than"),
        (dict(swingweight_kgm2=0.010), "too small"),
    ],
)
def test_racket_validation(kwargs, match):
    params = dict(mass_kg=M, balance_m=BP, swingweight_kgm2=I10)
    params.update(kwargs)
    with pytest.raises(ValueError, match=match):
        Racket(**params)


def test_racket_is_frozen():
    racket = Racket(M, BP, I10)
    with pytest.raises(AttributeError):
        racket.mass_kg = 0.3


def test_racket_inverse_masses_consistent_with_functions():
    racket = Racket(M, BP, I10, twistweight_kgm2=0.0014)
    inv_n, inv_t = racket_inverse_masses(racket, [0.50, 0.55], [0.0, 0.02])
    np.testing.assert_allclose(
        inv_n,
        1.0 / effective_mass(M, BP, I10, [0.50, 0.55], [0.0, 0.02], twistweight=0.0014),
        rtol=1e-14,
    )
    np.testing.assert_allclose(
        inv_t, tangential_inverse_mass(M, BP, I10, 0.0014, [0.50, 0.55], [0.0, 0.02]), rtol=1e-14
    )


@pytest.mark.parametrize("x_impact", [-0.01, 0.70])
def test_racket_inverse_masses_rejects_point_off_racket(x_impact):
    with pytest.raises(ValueError, match="impact_from_butt_m"):
        racket_inverse_masses(Racket(M, BP, I10), x_impact)
