"""Large batches of whole shots: chunks of cache-sized batches, spread over processes.

:func:`run_batch` plays N shots through :func:`rallyarc.shot.simulate` (impact, flight, bounce,
flight to the receiver's plane, metrics) in chunks of ``chunk`` shots. Each chunk is one
vectorized call without trajectories; its metrics are written into preallocated columns at the
chunk's own rows, so the result does not depend on the number of processes or the order in which
chunks finish, and memory stays at the columns plus a few chunks in flight. A chunk's shots are
taken from the source as it is handed out, and travel to its worker with the run's settings as
the task's arguments: no module keeps any state of a run.

The shots come from a *source*: an object with ``len(source)`` and ``source.take(start, stop)``
returning ``(incoming, swing, serve)`` for shots ``start`` to ``stop - 1``. :class:`ShotArrays`
wraps arrays already in memory; :class:`RandomShots` draws plausible groundstrokes and serves from
a seed, block by block, so that a run of 10^7 shots never holds all its inputs at once.
"""

from __future__ import annotations

import functools
import multiprocessing
import os
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from dataclasses import dataclass

import numpy as np

from rallyarc import kinematics
from rallyarc.shot import BallState, Swing, simulate
from rallyarc.units import KMH, RPM

#: Shots per chunk: big enough to amortise numpy's per-call overhead, small enough for the
#: working arrays to stay in cache (see DEVELOPERS.md, Throughput).
DEFAULT_CHUNK = 20_000

#: A compact set of metrics for very large runs.
COMPACT_COLUMNS = (
    "land_x_m",
    "land_y_m",
    "net_clearance_m",
    "bounce_apex_m",
    "receiver_height_m",
    "outcome",
)


@dataclass(frozen=True)
class ShotArrays:
    """Shots already in memory: the incoming balls, the swings and which shots are serves."""

    incoming: BallState
    swing: Swing
    serve: np.ndarray | None = None

    def __len__(self):
        return max(len(self.incoming), len(self.swing))

    def take(self, start, stop):
        n = len(self)
        inc = self.incoming
        if len(inc) != n:
            inc = BallState.of(inc.position, inc.velocity, inc.spin, n)
        sw = self.swing
        part = slice(start, stop)
        swing = Swing(**{f: np.broadcast_to(getattr(sw, f), (n,))[part] for f in Swing.FIELDS})
        incoming = BallState(inc.position[part], inc.velocity[part], inc.spin[part])
        serve = None if self.serve is None else np.broadcast_to(self.serve, (n,))[part]
        return incoming, swing, serve


#: Ranges of the random shots [SI]: each shot takes a preset stroke and moves every swing
#: field by a uniform amount within these half-widths (common practice for club play, from
#: memory: they keep most shots plausible while mixing in, long, wide and net).
JITTER = {
    "head_speed": 0.15,  # relative
    "swing_path": np.radians(6.0),
    "swing_direction": np.radians(6.0),
    "face_tilt": np.radians(2.0),
    "face_azimuth": np.radians(4.0),
    "racket_roll": np.radians(5.0),
    "impact_from_butt": 0.03,
    "impact_offaxis": 0.02,
}
GROUNDSTROKES = ("flat_drive", "topspin_drive", "heavy_topspin", "slice", "lob", "drop_shot")
SERVES = ("flat_serve", "kick_serve", "slice_serve")


class RandomShots:
    """``n`` random whole shots from ``seed``: groundstrokes against random incoming balls
    (``serve_fraction`` of them serves from a jittered toss).

    Shot ``i`` is drawn in block ``i // block`` from a generator seeded with ``(seed, block
    index)``, so any range of shots can be drawn on its own and gives the same shots whatever
    the chunking. Incoming balls: contact 0.5 m to 2 m behind the near baseline, up to 3.5 m
    either side of the centre, 0.5-1.4 m high; 50-110 km/h, descending -5 to 20 degrees,
    heading 180 +- 12 degrees; -1500 to 3000 rpm of topspin and +-600 rpm of sidespin.
    """

    def __init__(self, n, seed=0, serve_fraction=0.2, block=4096):
        from rallyarc.domain import load_stroke

        if n < 0 or int(n) != n:
            raise ValueError("n must be a non-negative whole number")
        self.n, self.seed = int(n), int(seed)
        self.serve_fraction, self.block = float(serve_fraction), int(block)
        self.ground = [load_stroke(s) for s in GROUNDSTROKES]
        self.serves = [load_stroke(s) for s in SERVES]

    def __len__(self):
        return self.n

    def _block(self, k):
        size = self.block  # always a whole block, so that shot i does not depend on n
        rng = np.random.default_rng([self.seed, k])
        serve = rng.random(size) < self.serve_fraction
        g = rng.integers(len(self.ground), size=size)
        s = rng.integers(len(self.serves), size=size)
        fields = {}
        for f in Swing.FIELDS:
            base = np.where(
                serve,
                np.array([getattr(st, f) for st in self.serves])[s],
                np.array([getattr(st, f) for st in self.ground])[g],
            )
            u = rng.uniform(-1.0, 1.0, size) * JITTER[f]
            fields[f] = base * (1.0 + u) if f == "head_speed" else base + u
        # incoming groundstroke balls
        pos = np.stack(
            (
                rng.uniform(-13.9, -12.4, size),
                rng.uniform(-3.5, 3.5, size),
                rng.uniform(0.5, 1.4, size),
            ),
            axis=1,
        )
        speed = rng.uniform(50.0, 110.0, size) * KMH
        descent = np.radians(rng.uniform(-5.0, 20.0, size))
        heading = np.pi + np.radians(rng.uniform(-12.0, 12.0, size))
        vel = kinematics.velocity(speed, -descent, heading)
        top = rng.uniform(-1500.0, 3000.0, size) * RPM
        side = rng.uniform(-600.0, 600.0, size) * RPM
        spin = kinematics.spin(top, side, heading)
        # serves: the preset's toss with its contact moved a little and its height varied
        toss = [st.toss for st in self.serves]
        contact = np.array([t.contact for t in toss])[s] + rng.uniform(-0.1, 0.1, (size, 3))
        drop = np.array([t.apex_above_contact_m for t in toss])[s] * rng.uniform(0.5, 1.5, size)
        toss_v = np.zeros((size, 3))
        toss_v[:, 2] = -np.sqrt(2.0 * 9.80665 * drop)
        pos = np.where(serve[:, None], contact, pos)
        vel = np.where(serve[:, None], toss_v, vel)
        spin = np.where(serve[:, None], 0.0, spin)
        return BallState(pos, vel, spin), Swing(**fields), serve

    def take(self, start, stop):
        stop = min(stop, self.n)
        first, last = start // self.block, (stop - 1) // self.block
        parts = [self._block(k) for k in range(first, last + 1)]
        lo = start - first * self.block
        hi = lo + (stop - start)

        def cat(arrays):
            return np.concatenate(arrays)[lo:hi]

        incoming = BallState(
            *(cat([getattr(p[0], f) for p in parts]) for f in ("position", "velocity", "spin"))
        )
        swing = Swing(**{f: cat([getattr(p[1], f) for p in parts]) for f in Swing.FIELDS})
        return incoming, swing, cat([p[2] for p in parts])


@dataclass
class BatchResult:
    """Metrics of N shots (``metrics``: columns of ``(N,)`` arrays, named as in
    :attr:`rallyarc.shot.ShotResult.metrics`), in the order of the shots."""

    metrics: dict

    def __len__(self):
        return len(next(iter(self.metrics.values()))) if self.metrics else 0

    def to_frame(self):
        """Metrics as a pandas DataFrame, one row per shot."""
        import pandas as pd

        frame = pd.DataFrame({"shot": np.arange(len(self))})
        for key, value in self.metrics.items():
            frame[key] = value
        return frame


def _cores():
    """Cores this process may run on."""
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # not on every platform
        return os.cpu_count() or 1


def _play_chunk(shots, conditions, columns, rtol):
    """Metrics of one chunk of shots, ``(incoming, swing, serve)`` from ``source.take``."""
    incoming, swing, serve = shots
    res = simulate(incoming, swing, conditions, serve=serve, record=False, rtol=rtol)
    return {c: res.metrics[c] for c in (columns or list(res.metrics))}


def run_batch(
    source,
    conditions,
    workers=None,
    chunk=DEFAULT_CHUNK,
    columns=None,
    float_dtype=np.float64,
    rtol=1e-6,
    progress=None,
):
    """Play every shot of ``source`` and return their metrics in order.

    Parameters
    ----------
    source : ShotArrays, RandomShots or any object with ``__len__`` and ``take(start, stop)``
        The shots.
    conditions : rallyarc.domain.Conditions
    workers : int, optional
        Processes; ``None`` uses every core of the machine, 1 plays in this process.
    chunk : int
        Shots per vectorized call.
    columns : sequence of str, optional
        Metrics to keep (default: all of them, as :func:`rallyarc.shot.simulate` gives them).
    float_dtype : numpy dtype
        Storage of the floating-point metrics; ``numpy.float32`` halves the memory of a long
        run (landing points to better than a millimetre on a court).
    rtol : float
        Flight integrator tolerance.
    progress : callable, optional
        Called with the number of shots finished so far after each chunk.

    Returns
    -------
    BatchResult
    """
    n = len(source)
    if int(chunk) != chunk or chunk < 1:
        raise ValueError("chunk must be a positive whole number")
    chunk = int(chunk)
    workers = _cores() if workers is None else int(workers)
    if workers < 1:
        raise ValueError("workers must be at least 1")
    columns = None if columns is None else list(columns)
    if workers > 1 and n:
        # a whole number of chunks per worker, none larger than asked: no worker idles at the end
        pieces = -(-n // chunk)
        pieces = -(-pieces // workers) * workers
        chunk = -(-n // pieces)
    bounds = [(i, min(i + chunk, n)) for i in range(0, n, chunk)]
    out = {}
    done = 0

    def store(start, stop, metrics):
        nonlocal done
        if not out:
            for key, value in metrics.items():
                dtype = float_dtype if value.dtype.kind == "f" else value.dtype
                out[key] = np.empty(n, dtype=dtype)
        for key, value in metrics.items():
            if value.dtype.kind == "U" and value.dtype.itemsize > out[key].dtype.itemsize:
                out[key] = out[key].astype(value.dtype)
            out[key][start:stop] = value
        done += stop - start
        if progress is not None:
            progress(done)

    # each task carries its own shots and settings: nothing is left in a module of this process
    # or of the workers, and only a chunk's inputs travel to a worker, not the whole source
    play = functools.partial(_play_chunk, conditions=conditions, columns=columns, rtol=rtol)
    if workers == 1 or len(bounds) <= 1:
        for start, stop in bounds:
            store(start, stop, play(source.take(start, stop)))
        return BatchResult(out)

    methods = multiprocessing.get_all_start_methods()
    context = multiprocessing.get_context("fork" if "fork" in methods else "spawn")
    with ProcessPoolExecutor(max_workers=workers, mp_context=context) as pool:
        # a bounded window of chunks in flight keeps memory flat however long the run
        pending = {}
        for start, stop in bounds:
            pending[pool.submit(play, source.take(start, stop))] = (start, stop)
            if len(pending) >= 2 * workers:
                finished, _ = wait(pending, return_when=FIRST_COMPLETED)
                for fut in finished:
                    store(*pending.pop(fut), fut.result())
        for fut, (start, stop) in pending.items():
            store(start, stop, fut.result())
    return BatchResult(out)
