"""Air density from the International Standard Atmosphere or from measured weather.

All functions take SI numbers or arrays and return arrays of the same shape.
"""

from __future__ import annotations

import numpy as np

#: Sea-level standard density of the ISA [kg/m^3].
ISA_SEA_LEVEL_DENSITY = 1.225
#: Sea-level standard temperature [K] and pressure [Pa] of the ISA.
ISA_T0 = 288.15
ISA_P0 = 101325.0
#: Temperature lapse rate of the ISA troposphere [K/m].
ISA_LAPSE = 0.0065
#: Specific gas constants of dry air and of water vapour [J/(kg K)].
R_DRY = 287.05287
R_VAPOUR = 461.495
#: Standard gravity [m/s^2] (ISO 80000-3).
G0 = 9.80665


def isa_temperature_pressure(altitude):
    """Temperature and pressure of the ISA troposphere.

    Parameters
    ----------
    altitude : float or array
        Geopotential altitude above mean sea level [m], from -500 to 11000.

    Returns
    -------
    temperature, pressure : array
        Air temperature [K] and static pressure [Pa].

    Notes
    -----
    ``T = T0 - L h`` and ``p = p0 (T / T0) ** (g0 / (R L))`` with T0 = 288.15 K, p0 = 101325 Pa,
    L = 0.0065 K/m.

    References
    ----------
    ISO 2533:1975, Standard Atmosphere.
    """
    h = np.asarray(altitude, dtype=float)
    if np.any((h < -500.0) | (h > 11000.0)) or np.any(~np.isfinite(h)):
        raise ValueError("altitude must lie in the ISA troposphere, -500 to 11000 m")
    temperature = ISA_T0 - ISA_LAPSE * h
    pressure = ISA_P0 * (temperature / ISA_T0) ** (G0 / (R_DRY * ISA_LAPSE))
    return temperature, pressure


def isa_density(altitude):
    """Density of the ISA troposphere at an altitude [kg/m^3].

    Parameters
    ----------
    altitude : float or array
        Geopotential altitude above mean sea level [m].

    Returns
    -------
    array
        Dry-air density ``p / (R T)`` [kg/m^3]: 1.225 at 0 m, 1.1116 at 1000 m.

    References
    ----------
    ISO 2533:1975, Standard Atmosphere.
    """
    temperature, pressure = isa_temperature_pressure(altitude)
    return pressure / (R_DRY * temperature)


def saturation_vapour_pressure(temperature_c):
    """Saturation vapour pressure over water [Pa], Tetens' formula.

    Parameters
    ----------
    temperature_c : float or array
        Air temperature [degC].

    Notes
    -----
    ``p_sat = 610.78 exp(17.27 T / (T + 237.3))`` with T in degC; within 0.1 % of tabulated values
    from 0 to 50 degC.

    References
    ----------
    Tetens, O. (1930), Z. Geophys. 6:297-309.
    """
    t = np.asarray(temperature_c, dtype=float)
    return 610.78 * np.exp(17.27 * t / (t + 237.3))


def air_density(temperature_c, pressure_pa, relative_humidity=0.0):
    """Density of moist air from measured weather [kg/m^3].

    Parameters
    ----------
    temperature_c : float or array
        Air temperature [degC], -40 to 60.
    pressure_pa : float or array
        Static air pressure [Pa], 30000 to 110000.
    relative_humidity : float or array
        Relative humidity [-], 0 to 1.

    Returns
    -------
    array
        ``rho = p_d / (R_d T) + p_v / (R_v T)`` with ``p_v = RH p_sat(T)`` and ``p_d = p - p_v``.
        Humid air is lighter than dry air at the same pressure and temperature.

    References
    ----------
    Picard, A. et al. (2008), Metrologia 45:149-155 (DOI 10.1088/0026-1394/45/2/004, from
    memory). The ideal-gas form here ignores the compressibility factor, a 0.04 % effect.
    """
    t = np.asarray(temperature_c, dtype=float)
    p = np.asarray(pressure_pa, dtype=float)
    rh = np.asarray(relative_humidity, dtype=float)
    if np.any((t < -40.0) | (t > 60.0)) or np.any(~np.isfinite(t)):
        raise ValueError("temperature must lie in -40 to 60 degC")
    if np.any((p < 30000.0) | (p > 110000.0)) or np.any(~np.isfinite(p)):
        raise ValueError("pressure must lie in 30000 to 110000 Pa")
    if np.any((rh < 0.0) | (rh > 1.0)) or np.any(~np.isfinite(rh)):
        raise ValueError("relative humidity must lie in 0 to 1")
    kelvin = t + 273.15
    p_vapour = rh * saturation_vapour_pressure(t)
    return (p - p_vapour) / (R_DRY * kelvin) + p_vapour / (R_VAPOUR * kelvin)
