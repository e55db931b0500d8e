"""Flight-only throughput and accuracy of the batch integrator against scipy's DOP853.

Run: python benchmarks/flight_throughput.py [N]
"""

import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

from rallyarc import kinematics
from rallyarc.flight.forces import FlightParams, acceleration
from rallyarc.flight.integrate import fly, ground_contact, net_plane


def shots(n, seed=2):
    rng = np.random.default_rng(seed)
    speed = rng.uniform(20, 70, n)
    elev = np.radians(rng.uniform(-10, 30, n))
    azim = np.radians(rng.uniform(-10, 10, n))
    v = kinematics.velocity(speed, elev, azim)
    axis = kinematics.unit(rng.normal(size=(n, 3)))
    w = axis * rng.uniform(0, 5000, n)[:, None] * np.pi / 30
    return np.tile([-11.885, 0.0, 1.0], (n, 1)), v, w


def main():
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 16384
    x, v, w = shots(n)
    params = FlightParams()
    events = [net_plane(), ground_contact(params.radius)]
    sample = range(0, n, max(1, n // 150))
    ref = []
    for i in sample:

        def rhs(t, y, i=i):
            return np.concatenate([y[3:], acceleration(y[3:][None], w[i][None], params)[0]])

        def ground(t, y):
            return y[2] - params.radius

        ground.terminal, ground.direction = True, -1
        sol = solve_ivp(
            rhs,
            (0, 10),
            np.concatenate([x[i], v[i]]),
            method="DOP853",
            rtol=1e-10,
            atol=1e-12,
            events=[ground],
        )
        ref.append((sol.t_events[0][0], sol.y_events[0][0][:3]))
    print(f"{'rtol':>8} {'N':>8} {'flights/s':>10} {'steps':>6} {'worst mm':>9} {'worst ms':>9}")
    for tol in (1e-5, 1e-6):
        rates = []
        for _ in range(3):
            start = time.perf_counter()
            res = fly(x, v, w, params, events, rtol=tol, atol=tol)
            rates.append(n / (time.perf_counter() - start))
        err = max(
            np.linalg.norm(res.position[i] - p) for i, (_, p) in zip(sample, ref, strict=True)
        )
        terr = max(abs(res.t[i] - t) for i, (t, _) in zip(sample, ref, strict=True))
        print(
            f"{tol:8.0e} {n:8d} {np.median(rates):10.0f} {res.n_steps.mean():6.1f} "
            f"{err * 1e3:9.3f} {terr * 1e3:9.4f}"
        )


if __name__ == "__main__":
    main()
