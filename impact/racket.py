"""Racket mass properties and the racket's inverse mass at the impact point.

The racket is a free rigid body during the few milliseconds of contact. Its string plane is
taken to pass through its centre of mass (the frame's thickness is neglected). Body frame:

- ``a``: unit long axis, butt to tip, in the face plane;
- ``c = n x a``: unit across axis, in the face plane;
- ``n``: unit face normal, out of the hitting face toward where the ball goes.

``(a, c, n)`` is right-handed. An impact point is given by its distance from the butt along
``a`` (``impact_from_butt``) and its offset along ``c`` (``offaxis``); relative to the centre of
mass it sits at ``r = b a + d c`` with ``b = impact_from_butt - balance`` and ``d = offaxis``.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = [
    "SWINGWEIGHT_AXIS_M",
    "Racket",
    "apparent_cor",
    "effective_mass",
    "inertia_about_cm",
    "normal_inverse_mass",
    "racket_inverse_masses",
    "tangential_inverse_mass",
]

#: Distance of the swingweight axis from the butt [m] (the trade's standard, `common practice`).
SWINGWEIGHT_AXIS_M = 0.10


@dataclass(frozen=True)
class Racket:
    """Mass properties of a strung racket.

    Parameters
    ----------
    mass_kg : float
        Strung mass [kg].
    balance_m : float
        Balance point (centre of mass) measured from the butt along the long axis [m].
    swingweight_kgm2 : float
        Moment of inertia about an axis 0.10 m from the butt, parallel to the string plane and
        perpendicular to the long axis [kg m^2].
    twistweight_kgm2 : float, optional
        Moment of inertia about the long axis [kg m^2]. The default 0.0015 kg m^2 is a typical
        strung value (`from memory`; common rackets lie around 0.0013-0.0016 kg m^2).
    length_m : float, optional
        Overall length [m]. The default 0.686 m (27 in) is the usual adult length
        (`common practice`).

    Raises
    ------
    ValueError
        If a value is not finite and positive, the balance point is not inside the racket, or
        the swingweight is too small to leave a positive moment of inertia about the centre of
        mass.
    """

    mass_kg: float
    balance_m: float
    swingweight_kgm2: float
    twistweight_kgm2: float = 0.0015
    length_m: float = 0.686

    def __post_init__(self) -> None:
        for name in ("mass_kg", "balance_m", "swingweight_kgm2", "twistweight_kgm2", "length_m"):
            value = getattr(self, name)
            if not (np.isfinite(value) and value > 0.0):
                raise ValueError(f"Racket.{name} must be finite and positive, got {value!r}")
        if self.balance_m >= self.length_m:
            raise ValueError(
                f"Racket.balance_m ({self.balance_m} m) must be less than "
                f"Racket.length_m ({self.length_m} m)"
            )
        i_cm = inertia_about_cm(self.mass_kg, self.balance_m, self.swingweight_kgm2)
        if not i_cm > 0.0:
            raise ValueError(
                f"Racket.swingweight_kgm2 ({self.swingweight_kgm2} kg m^2) is too small for "
                f"mass {self.mass_kg} kg and balance {self.balance_m} m: the moment of inertia "
                f"about the centre of mass would be {i_cm:.6g} kg m^2"
            )

    @property
    def inertia_cm_kgm2(self) -> float:
        """Moment of inertia about the across axis through the centre of mass [kg m^2]."""
        return float(inertia_about_cm(self.mass_kg, self.balance_m, self.swingweight_kgm2))


def inertia_about_cm(mass, balance, swingweight):
    """Moment of inertia about the across axis through the centre of mass.

    Parameters
    ----------
    mass : float or array_like
        Racket mass [kg].
    balance : float or array_like
        Balance point from the butt [m].
    swingweight : float or array_like
        Moment of inertia about the axis 0.10 m from the butt [kg m^2].

    Returns
    -------
    numpy.ndarray or float
        ``I_cm`` [kg m^2], broadcast over the inputs.

    Notes
    -----
    Parallel-axis theorem between the swingweight axis and the parallel axis through the
    centre of mass:

    .. math:: I_{cm} = I_{10} - M (b_p - 0.10)^2

    References
    ----------
    .. [1] H. Brody, Am. J. Phys. 65, 981 (1997).
    .. [2] R. Cross, Am. J. Phys. 67, 692 (1999).
    """
    mass = np.asarray(mass, dtype=float)
    balance = np.asarray(balance, dtype=float)
    swingweight = np.asarray(swingweight, dtype=float)
    return swingweight - mass * (balance - SWINGWEIGHT_AXIS_M) ** 2


def effective_mass(mass, balance, swingweight, impact_from_butt, offaxis=0.0, twistweight=np.inf):
    r"""Effective mass of a free racket for a normal impulse at the impact point.

    Parameters
    ----------
    mass : float or array_like
        Racket mass [kg].
    balance : float or array_like
        Balance point from the butt [m].
    swingweight : float or array_like
        Moment of inertia about the axis 0.10 m from the butt [kg m^2].
    impact_from_butt : float or array_like
        Impact point's distance from the butt along the long axis [m].
    offaxis : float or array_like, optional
        Impact point's offset from the long axis, along the across axis [m]. Default 0.
    twistweight : float or array_like, optional
        Moment of inertia about the long axis [kg m^2]. Default infinite (no twisting), which
        with ``offaxis = 0`` gives the on-axis formula.

    Returns
    -------
    numpy.ndarray or float
        ``M_e`` [kg], broadcast over the inputs.

    Raises
    ------
    ValueError
        If the moment of inertia about the centre of mass is not positive.

    Notes
    -----
    A normal impulse ``J`` at ``r = b a + d c`` moves the impact point by
    ``J (1/M + b^2/I_cm + d^2/I_tw)`` along ``n``:

    .. math:: \frac{1}{M_e} = \frac{1}{M} + \frac{b^2}{I_{cm}} + \frac{d^2}{I_{tw}},
       \qquad b = x_{impact} - b_p,\ d = \text{offaxis}

    References
    ----------
    .. [1] H. Brody, Am. J. Phys. 65, 981 (1997).
    .. [2] R. Cross, Am. J. Phys. 67, 692 (1999).
    """
    return 1.0 / normal_inverse_mass(
        mass, balance, swingweight, impact_from_butt, offaxis=offaxis, twistweight=twistweight
    )


def normal_inverse_mass(
    mass, balance, swingweight, impact_from_butt, offaxis=0.0, twistweight=np.inf
):
    """Racket's inverse mass ``1/M_e`` along the face normal at the impact point [1/kg].

    Same parameters and equation as :func:`effective_mass`, which returns the reciprocal.
    """
    mass = np.asarray(mass, dtype=float)
    i_cm = _checked_inertia_cm(mass, balance, swingweight)
    b = np.asarray(impact_from_butt, dtype=float) - np.asarray(balance, dtype=float)
    d = np.asarray(offaxis, dtype=float)
    twistweight = np.asarray(twistweight, dtype=float)
    return 1.0 / mass + b**2 / i_cm + d**2 / twistweight


def tangential_inverse_mass(mass, balance, swingweight, twistweight, impact_from_butt, offaxis=0.0):
    r"""Racket's 2x2 inverse-mass matrix for in-plane impulses at the impact point.

    Parameters
    ----------
    mass : float or array_like
        Racket mass [kg].
    balance : float or array_like
        Balance point from the butt [m].
    swingweight : float or array_like
        Moment of inertia about the axis 0.10 m from the butt [kg m^2].
    twistweight : float or array_like
        Moment of inertia about the long axis [kg m^2].
    impact_from_butt : float or array_like
        Impact point's distance from the butt along the long axis [m].
    offaxis : float or array_like, optional
        Impact point's offset along the across axis [m]. Default 0.

    Returns
    -------
    numpy.ndarray
        ``K_r`` [1/kg], shape ``(..., 2, 2)`` in the ``(a, c)`` basis, where ``...`` is the
        broadcast shape of the inputs: an in-plane impulse ``J = (J_a, J_c)`` changes the
        velocity of the racket's impact point by ``K_r J``.

    Notes
    -----
    For a flat frame the perpendicular-axis theorem gives the moment of inertia about the
    normal through the centre of mass, ``I_nn = I_cm + I_tw``. An in-plane impulse at
    ``r = b a + d c`` exerts the angular impulse ``r x J = (b J_c - d J_a) n``; the spin
    ``w_n = (b J_c - d J_a) / I_nn`` about ``n`` moves the impact point by
    ``w_n n x r = w_n (b c - d a)``. With the centre-of-mass part ``J / M``:

    .. math:: K_r = \frac{1}{M} I_2 + \frac{1}{I_{nn}}
       \begin{pmatrix} d^2 & -b d \\ -b d & b^2 \end{pmatrix}

    The in-plane and normal responses decouple because ``r`` lies in the string plane: a
    normal impulse turns the racket about in-plane axes, which moves ``r`` only along ``n``,
    and an in-plane impulse turns it about ``n`` only. Rigid-body impulse mechanics,
    `common practice`.
    """
    mass = np.asarray(mass, dtype=float)
    i_cm = _checked_inertia_cm(mass, balance, swingweight)
    twistweight = np.asarray(twistweight, dtype=float)
    if np.any(twistweight <= 0.0):
        raise ValueError("twistweight must be positive")
    i_nn = i_cm + twistweight
    b = np.asarray(impact_from_butt, dtype=float) - np.asarray(balance, dtype=float)
    d = np.asarray(offaxis, dtype=float)
    inv_m, i_nn, b, d = np.broadcast_arrays(1.0 / mass, i_nn, b, d)
    k = np.empty(inv_m.shape + (2, 2))
    k[..., 0, 0] = inv_m + d**2 / i_nn
    k[..., 0, 1] = -b * d / i_nn
    k[..., 1, 0] = k[..., 0, 1]
    k[..., 1, 1] = inv_m + b**2 / i_nn
    return k


def racket_inverse_masses(racket: Racket, impact_from_butt_m, offaxis_m=0.0):
    """Normal and tangential inverse masses of ``racket`` at an impact point.

    Parameters
    ----------
    racket : Racket
        The racket.
    impact_from_butt_m : float or array_like
        Impact point's distance from the butt [m], inside ``[0, racket.length_m]``.
    offaxis_m : float or array_like, optional
        Impact point's offset along the across axis [m]. Default 0.

    Returns
    -------
    inv_mass_normal : numpy.ndarray or float
        ``1/M_e`` [1/kg], see :func:`effective_mass`.
    inv_mass_tangential : numpy.ndarray
        ``K_r`` [1/kg], shape ``(..., 2, 2)``, see :func:`tangential_inverse_mass`.

    Raises
    ------
    ValueError
        If an impact point lies beyond the butt or the tip.
    """
    x = np.asarray(impact_from_butt_m, dtype=float)
    if np.any((x < 0.0) | (x > racket.length_m)):
        raise ValueError(
            f"impact_from_butt_m must lie in [0, {racket.length_m}] m (the racket's length)"
        )
    args = (racket.mass_kg, racket.balance_m, racket.swingweight_kgm2)
    inv_n = normal_inverse_mass(*args, x, offaxis=offaxis_m, twistweight=racket.twistweight_kgm2)
    inv_t = tangential_inverse_mass(*args, racket.twistweight_kgm2, x, offaxis=offaxis_m)
    return inv_n, inv_t


def apparent_cor(e, effective_mass_kg, ball_mass):
    r"""Apparent coefficient of restitution of a ball on a free racket.

    Parameters
    ----------
    e : float or array_like
        Ball-on-strings coefficient of restitution (racket clamped) [-].
    effective_mass_kg : float or array_like
        Racket's effective mass at the impact point [kg].
    ball_mass : float or array_like
        Ball mass [kg].

    Returns
    -------
    numpy.ndarray or float
        ``e_A`` [-]: the ratio of outgoing to incoming ball speed when the ball strikes a
        racket initially at rest.

    Notes
    -----
    .. math:: e_A = \frac{e M_e - m}{M_e + m}

    A head-on hit of a ball arriving at speed ``v_in`` on a racket moving at ``V`` at the
    impact point then leaves at ``v_out = e_A v_in + (1 + e_A) V``.

    References
    ----------
    .. [1] H. Brody, Am. J. Phys. 65, 981 (1997).
    .. [2] R. Cross, Am. J. Phys. 67, 692 (1999).
    """
    e = np.asarray(e, dtype=float)
    big_m = np.asarray(effective_mass_kg, dtype=float)
    m = np.asarray(ball_mass, dtype=float)
    return (e * big_m - m) / (big_m + m)


def _checked_inertia_cm(mass, balance, swingweight):
    i_cm = inertia_about_cm(mass, balance, swingweight)
    if np.any(i_cm <= 0.0):
        raise ValueError(
            "swingweight too small for the mass and balance: the moment of inertia about the "
            "centre of mass, swingweight - mass * (balance - 0.10)**2, must be positive"
        )
    return i_cm
