"""Aerodynamic coefficient models of a spinning tennis ball.

A model maps the spin parameter ``S = r w_perp / v`` to the drag coefficient ``C_D`` and to the
lift slope ``C_L / S``. Writing lift through ``C_L / S`` lets the lift force be computed as
``1/2 rho A r (C_L / S) (w x v)`` without dividing by the spin, so a ball without spin needs no
special case (see :func:`flight.forces.acceleration`).

Models are small frozen dataclasses kept in :data:`AERO_MODELS`, looked up by name.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class StepanekAero:
    """Stepanek's fits of drag and lift of spinning tennis balls.

    Notes
    -----
    ``C_D = 0.508 + (22.053 + 4.196 S^-2.5)^-0.4`` and ``C_L = 1 / (2.022 + 0.981 / S)``.
    Copies of the paper print the constant as 22.053 or 22.503; this model uses 22.053 (the value
    of the original typesetting as most later work quotes it). At S = 1: C_D = 0.779, C_L = 0.333.
    Written without branches: with ``u = S^2.5``, ``C_D = 0.508 + (u / (22.053 u + 4.196))^0.4``
    and ``C_L / S = 1 / (2.022 S + 0.981)``, both finite at S = 0 (C_D(0) = 0.508).

    References
    ----------
    Range of validity: fitted to wind-tunnel data over spin parameters of about 0.05 to 1 (from
    memory); free-flight drag is 15-20 % lower (Cross and Lindsey 2014), so this model flies a
    ball shorter than measured on court.

    Stepanek, A. (1988), The aerodynamics of tennis balls - the topspin lob,
    Am. J. Phys. 56:138-142 (DOI 10.1119/1.15692, from memory).
    """

    name: str = "stepanek1988"
    drag_constant: float = 22.053
    #: Where the model comes from and where it holds.
    source: str = "Stepanek (1988), Am. J. Phys. 56:138, wind-tunnel fits for spinning balls"
    validity: str = "wind tunnel; spin parameter about 0.05-1 (from memory); C_D 0.54-0.78 there"

    def drag(self, spin_parameter):
        """Drag coefficient ``C_D(S)`` [-]."""
        s = np.asarray(spin_parameter, dtype=float)
        u = s * s * np.sqrt(s)  # S^2.5, cheaper than a power
        return 0.508 + (u / (self.drag_constant * u + 4.196)) ** 0.4

    def lift_slope(self, spin_parameter):
        """Lift slope ``C_L(S) / S`` [-]."""
        return 1.0 / (2.022 * np.asarray(spin_parameter, dtype=float) + 0.981)


@dataclass(frozen=True)
class CrossLindseyAero:
    """Constant drag measured in free flight with a spin-dependent lift.

    Notes
    -----
    Cross and Lindsey filmed balls in free flight at 15-30 m/s with up to 2500 rpm and found
    ``C_D = 0.507 +- 0.024``, independent of speed and spin, and a lift coefficient rising with spin
    with scatter. This model pairs their constant drag with Stepanek's wind-tunnel lift curve
    ``C_L = S / (2.022 S + 0.981)`` (the pairing is this project's choice). Their lift values
    could not be read for this project, so the curve is checked against free flight only for
    its direction: it rises with spin, as they measured (``tests/validation``).

    Range of validity: new balls in free flight at 15-30 m/s with topspin or backspin up to
    2500 rpm (spin parameter up to about 0.6 at 15 m/s, 0.3 at 30 m/s). Faster serves and
    heavier spin are extrapolations. This is the default model of the ball presets.

    References
    ----------
    Cross, R. and Lindsey, C. (2014), Measurements of drag and lift on tennis balls in flight,
    Sports Engineering 17:89-96 (DOI 10.1007/s12283-013-0144-6, from memory).
    """

    name: str = "cross_lindsey2014"
    drag_coefficient: float = 0.507
    #: Where the model comes from and where it holds.
    source: str = (
        "Cross and Lindsey (2014), Sports Eng. 17:89, free flight: C_D 0.507 +- 0.024; "
        "lift curve of Stepanek (1988)"
    )
    validity: str = "free flight of new balls, 15-30 m/s, spin up to 2500 rpm (S up to about 0.6)"

    def drag(self, spin_parameter):
        """Drag coefficient, constant [-]."""
        return np.full_like(np.asarray(spin_parameter, dtype=float), self.drag_coefficient)

    def lift_slope(self, spin_parameter):
        """Lift slope ``C_L(S) / S`` [-]."""
        return 1.0 / (2.022 * np.asarray(spin_parameter, dtype=float) + 0.981)


@dataclass(frozen=True)
class ConstantAero:
    """Constant drag and lift coefficients, for tests and for coefficients measured by the user.

    Parameters
    ----------
    drag_coefficient : float
        ``C_D`` [-], 0 to 2.
    lift_coefficient : float
        ``C_L`` [-], 0 to 2, applied whenever the ball spins about an axis across its path. It is
        ramped to zero for ``S < 1e-9`` so that a ball without spin has no lift.
    """

    drag_coefficient: float = 0.55
    lift_coefficient: float = 0.0
    name: str = "constant"
    source: str = "user-given constant coefficients"
    validity: str = "wherever the given coefficients were measured"

    def __post_init__(self):
        for field, value in (
            ("drag_coefficient", self.drag_coefficient),
            ("lift_coefficient", self.lift_coefficient),
        ):
            if not (np.isfinite(value) and 0.0 <= value <= 2.0):
                raise ValueError(f"{field} must lie in 0 to 2, got {value}")

    def drag(self, spin_parameter):
        """Drag coefficient, constant [-]."""
        return np.full_like(np.asarray(spin_parameter, dtype=float), self.drag_coefficient)

    def lift_slope(self, spin_parameter):
        """Lift slope ``C_L / S`` [-]."""
        s = np.asarray(spin_parameter, dtype=float)
        return self.lift_coefficient / np.maximum(s, 1e-9)


#: Aerodynamic models by name.
AERO_MODELS = {
    "stepanek1988": StepanekAero(),
    "cross_lindsey2014": CrossLindseyAero(),
    "constant": ConstantAero(),
}


def get_aero_model(name):
    """Return the aerodynamic model registered under ``name``.

    Raises
    ------
    ValueError
        For an unknown name; the message lists the valid ones.
    """
    try:
        return AERO_MODELS[name]
    except KeyError:
        valid = ", ".join(sorted(AERO_MODELS))
        raise ValueError(f"unknown aero model {name!r}; choose one of {valid}") from None
