"""Aiming: the swing or the ball-machine setting that puts the ball on a target.

Both solvers are batch-native: N targets (or N incoming balls) are solved together by a damped
Gauss-Newton iteration whose Jacobian comes from finite differences, all perturbed shots of all
targets flown in one call of the chain. Free parameters stay inside their bounds (the swing's
plausible range, or the machine's limits); a target that cannot be reached within them is
reported with the nearest landing found and the reason, never silently clipped. While
iterating, only the part of the chain the residual needs is flown (the first flight to the net
and the ground, nothing recorded: :mod:`rallyarc.aim.first`); the solved shot is then played
once through the whole chain, or left to the caller (``play=False``). The Jacobian rule is a
choice (``method``): differences at every iteration, or Broyden updates.

Targets are in the court frame of the shot: for strokes the hitter is at the near end and hits
toward +x; a ball machine may stand at either end (a machine at x > 0 feeds toward -x and its
results are reported in the court frame).
"""

from rallyarc.aim.machine import Machine, aim_feed, load_machine
from rallyarc.aim.solver import HEIGHT_TOL_M, LAND_TOL_M, AimResult
from rallyarc.aim.stroke import STYLES, aim_stroke

__all__ = [
    "HEIGHT_TOL_M",
    "LAND_TOL_M",
    "STYLES",
    "AimResult",
    "Machine",
    "aim_feed",
    "aim_stroke",
    "load_machine",
]
