"""Study throughput: whole shots/s on 1 and 2 local processes and on a 2-worker Dask LocalCluster,
the cost of one chunk beyond its shots, and the chunk size at which that cost falls under 5 %.

Every row plays the same shot study: the demo scenario's topspin drive over a grid of head
speed and face tilt (``--shots`` points), through impact, flight, bounce, flight to the
receiver's plane and metrics, each chunk written as a Parquet partition. "1 process" plays the
chunks in this process (``workers=1``); "2 local workers" is ``run_study(workers=2)``, which
starts and stops its own 2-process cluster (start-up counted, as ``rallyarc study run`` pays it);
"LocalCluster" runs on a 2-worker, 1-thread-each Dask cluster on 127.0.0.1 already running and
warmed.

The per-chunk overhead is measured on the cluster with chunks of ``--small`` shots: the time
per chunk (wall time x workers / chunks) less ``--small`` times the per-shot time of large
chunks in one process. It holds the chain's fixed cost per vectorised call, the Parquet
encoding, the task's round trip through the scheduler and the partition's atomic write. With
overhead ``o`` and per-shot time ``t``, a chunk of ``c`` shots spends ``o / (o + c t)`` on
overhead, under 5 % from ``c = 19 o / t``.

Run: python benchmarks/study.py [--shots 40000] [--chunk 10000] [--small 20]
"""

from __future__ import annotations

import argparse
import math
import tempfile
import time
from pathlib import Path

STUDY = """
name = "Benchmark window"
source = "benchmark study of our own"
description = "head speed and face tilt of the demo topspin drive"
kind = "shots"
scenario = "demo"
stroke = "topspin_drive"
design = "grid"
seed = 1
chunk = {chunk}

[[parameters]]
name = "head_speed"
low = 90.0
high = 140.0
steps = {a}

[[parameters]]
name = "face_tilt"
low = -6.0
high = 6.0
steps = {b}
"""


def _study(folder, shots, chunk):
    from rallyarc.study import load_study

    a = max(1, int(math.sqrt(shots)))
    b = max(1, shots // a)
    path = Path(folder) / f"study-{shots}-{chunk}.toml"
    path.write_text(STUDY.format(chunk=chunk, a=a, b=b), encoding="utf-8")
    return load_study(path)


def _timed(study, out, **kwargs):
    from rallyarc.study import run_study

    t0 = time.perf_counter()
    run = run_study(study, out, force=True, **kwargs)
    return time.perf_counter() - t0, run


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--shots", type=int, default=40_000)
    ap.add_argument("--chunk", type=int, default=10_000)
    ap.add_argument("--small", type=int, default=20)
    ap.add_argument("--small-chunks", type=int, default=60)
    args = ap.parse_args()

    from distributed import Client, LocalCluster

    with tempfile.TemporaryDirectory() as tmp:
        big = _study(tmp, args.shots, args.chunk)
        small = _study(tmp, args.small * args.small_chunks, args.small)
        _timed(_study(tmp, 2000, 2000), Path(tmp) / "warm", workers=1)  # imports, caches
        one, run = _timed(big, Path(tmp) / "one", workers=1)
        per_shot = one / run.rows
        print(f"shots: {run.rows} in chunks of {big.chunk}")
        print(f"1 process:            {run.rows / one:10,.0f} whole shots/s")
        two, run2 = _timed(big, Path(tmp) / "two", workers=2)
        print(
            f"2 local workers:      {run2.rows / two:10,.0f} whole shots/s "
            "(rallyarc study run --workers 2: its own cluster's start-up counted)"
        )
        with (
            LocalCluster(
                n_workers=2,
                threads_per_worker=1,
                processes=True,
                host="127.0.0.1",
                dashboard_address=None,
            ) as cluster,
            Client(cluster) as client,
        ):
            _timed(_study(tmp, 4000, 1000), Path(tmp) / "warm2", client=client)
            best = min(_timed(big, Path(tmp) / f"c{i}", client=client)[0] for i in range(2))
            print(
                f"2-worker LocalCluster:{run.rows / best:10,.0f} whole shots/s "
                "(a running, warmed cluster; best of 2)"
            )
            wall, runs = _timed(small, Path(tmp) / "small", client=client)
        workers = 2
        per_chunk = wall * workers / len(runs.played)
        overhead = max(per_chunk - args.small * per_shot, 0.0)
        print(f"per-shot time:        {1e6 * per_shot:10.1f} us (1 process, large chunks)")
        print(
            f"per-chunk overhead:   {1e3 * overhead:10.1f} ms "
            f"({len(runs.played)} chunks of {args.small} shots: {1e3 * per_chunk:.1f} ms each)"
        )
        print(f"chunk for < 5 % overhead: {math.ceil(19 * overhead / per_shot):,} shots or more")


if __name__ == "__main__":
    main()
