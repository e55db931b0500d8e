"""Many rallies: blocks of rallies, each with its own random stream, in one process or several.

A run of N rallies is split into blocks of :data:`BLOCK` rallies; each block gets its own
random stream spawned from the seed and is played by :func:`rallyarc.rally.rounds.play_block`,
so the tables depend on the seed and the block size only, never on how many processes play
the blocks.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc.rally.patterns import Patterns
from rallyarc.rally.rounds import play_block

#: Rallies simulated together in one batch; a run of more rallies is split into blocks of
#: this size, each with its own random stream from the seed, so that the tables do not depend
#: on how many processes play the blocks.
BLOCK = 5000


@dataclass
class RallyRun:
    """N rallies: ``shots`` (one row per shot) and ``rallies`` (one row per rally), pandas
    DataFrames with units in their column names, positions in the court frame."""

    patterns: Patterns
    shots: object
    rallies: object
    seed: int
    n: int
    max_shots: int


def play_rallies(
    patterns, n=10_000, seed=0, max_shots=None, progress=False, workers=1, block=BLOCK
):
    """Play ``n`` rallies of a pattern pair, all live rallies advancing shot by shot together.

    Parameters
    ----------
    patterns : Patterns
    n : int
        Rallies.
    seed : int
        Seed of the random numbers (shot choice, aim points, scatter); the same seed gives the
        same tables, whatever ``workers`` is.
    max_shots : int, optional
        Longest rally in shots (a faulted first serve counts as a shot); the pattern file's
        ``max_shots`` by default. A rally still going then is ``unfinished``.
    progress : bool
        Show a tqdm progress bar of finished rallies.
    workers : int
        Processes playing the blocks at once (at most one per block).
    block : int
        Rallies per block (:data:`BLOCK`); each block has its own random stream, spawned from
        the seed, so the tables depend on the seed and the block size only.

    Returns
    -------
    RallyRun
    """
    import pandas as pd
    from tqdm import tqdm

    limit = int(patterns.max_shots if max_shots is None else max_shots)
    starts = list(range(0, n, int(block)))
    streams = np.random.SeedSequence(seed).spawn(len(starts))
    jobs = [(s, min(int(block), n - s), q) for s, q in zip(starts, streams, strict=True)]
    bar = tqdm(total=n, desc="rallies", unit="rally", disable=not progress, leave=False)
    workers = max(1, min(int(workers), len(jobs)))
    if workers == 1:
        parts = [play_block(patterns, s, m, q, limit, bar.update) for s, m, q in jobs]
    else:
        parts = _play_parallel(patterns, jobs, limit, workers, bar)
    bar.close()
    shots = pd.concat([p[0] for p in parts], ignore_index=True)
    rallies = pd.concat([p[1] for p in parts], ignore_index=True)
    return RallyRun(patterns, shots, rallies, int(seed), int(n), limit)


def _play_parallel(patterns, jobs, limit, workers, bar):
    """Blocks in worker processes; finished rallies are reported through a queue."""
    import multiprocessing
    import queue as queue_mod
    from concurrent.futures import ProcessPoolExecutor

    ctx = multiprocessing.get_context("fork")
    with ctx.Manager() as manager:
        done = manager.Queue()
        with ProcessPoolExecutor(max_workers=workers, mp_context=ctx) as pool:
            futures = [
                pool.submit(_play_block_reporting, patterns, s, m, q, limit, done)
                for s, m, q in jobs
            ]
            while not all(f.done() for f in futures):
                try:
                    bar.update(done.get(timeout=0.2))
                except queue_mod.Empty:
                    pass
            while not done.empty():
                bar.update(done.get())
            return [f.result() for f in futures]


def _play_block_reporting(patterns, start, n, stream, limit, done):
    return play_block(patterns, start, n, stream, limit, done.put)
