"""The whole shot: the chain impact -> flight -> net -> landing -> bounce -> flight ->
receiver for N shots at once, its metrics and its result.

Modules, in the order the ball meets them:

- :mod:`.state`: what enters the chain (:class:`BallState`, :class:`Swing`).
- :mod:`.stages`: one function per stage.
- :mod:`.landing`: the line call.
- :mod:`.metrics`: the registry of every reported number (unit, JSON block, label, meaning).
- :mod:`.result`: :class:`ShotResult` with its flight phases, tables and JSON records.
- :mod:`.chain`: :func:`simulate`, :func:`launch` and :func:`play`, short pipelines of stages.
"""

from rallyarc.kinematics import topspin_sidespin
from rallyarc.shot.chain import launch, play, simulate
from rallyarc.shot.landing import judge_landing
from rallyarc.shot.metrics import METRICS, Metric
from rallyarc.shot.result import Phase, ShotResult
from rallyarc.shot.stages import T_MAX
from rallyarc.shot.state import BallState, Swing, serve_states

#: Every outcome a shot can have.
OUTCOMES = ("in", "net", "long", "wide", "out", "miss")

__all__ = [
    "BallState",
    "METRICS",
    "Metric",
    "OUTCOMES",
    "Phase",
    "ShotResult",
    "Swing",
    "T_MAX",
    "judge_landing",
    "launch",
    "play",
    "serve_states",
    "simulate",
    "topspin_sidespin",
]
