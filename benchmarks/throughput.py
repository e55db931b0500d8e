"""Whole-shot throughput: the batch engine against per-shot scipy solve_ivp, and memory at scale.

The fair per-shot baseline is solve_ivp RK45 at the batch engine's tolerance with a plain-float
right-hand side for one ball (as a careful analyst writes a per-shot script); the per-shot run
through the project's numpy force function on one ball is printed as a second row. The last
line is the batch engine's ratio against the fair baseline.

Every method plays the same seeded random shots (rallyarc.batch.RandomShots: jittered preset
groundstrokes against random incoming balls, and serves) through impact, flight, bounce, flight
to the receiver's plane and metrics, in the demo scenario's conditions. Landing errors are
against scipy solve_ivp DOP853 at rtol 1e-10, atol 1e-12 (rallyarc.reference), on a subset of
the shots (the first --subset shots; the per-shot methods run on that subset only).

Every row is measured in a fresh process, so that its peak memory is its own: peak RSS from
resource.getrusage ru_maxrss, the measuring process and (for several workers) the largest worker.

Run: python benchmarks/throughput.py [--quick] [--sizes 1000,10000] [--workers 2] [--chunk 10000]
     [--subset 300] [--repeat 3] [--big] [--big-n 10000000]
"""

from __future__ import annotations

import argparse
import multiprocessing
import os
import resource
import sys
import time

import numpy as np

from rallyarc import domain
from rallyarc.batch import COMPACT_COLUMNS, DEFAULT_CHUNK, RandomShots, _cores, run_batch
from rallyarc.reference import BASELINE, BASELINE_PLAIN, REFERENCE, play_shots

SEED = 7


class _Parser(argparse.ArgumentParser):
    def error(self, message):
        sys.stderr.write(f"throughput.py: error: {message}\n")
        sys.exit(2)


def _positive_int(text):
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a number: {text!r}") from None
    if not (np.isfinite(value) and value >= 1 and value == int(value)):
        raise argparse.ArgumentTypeError(f"must be a whole number >= 1: {text!r}")
    return int(value)


def _sizes(text):
    sizes = [_positive_int(part) for part in text.split(",") if part.strip()]
    if not sizes:
        raise argparse.ArgumentTypeError("give at least one size, e.g. 1000,10000")
    return sizes


def _parse(argv):
    p = _Parser(description="Whole shots per second: batch engine against per-shot solve_ivp.")
    p.add_argument("--quick", action="store_true", help="sizes 1e3,1e4,1e5; 2 runs per row")
    p.add_argument("--sizes", type=_sizes, help="comma-separated N (default 1e3,1e4,1e5,1e6)")
    p.add_argument("--workers", type=_positive_int, help="processes of the multi-process rows")
    p.add_argument("--chunk", type=_positive_int, default=DEFAULT_CHUNK, help="shots per chunk")
    p.add_argument("--subset", type=_positive_int, default=300, help="shots of the per-shot runs")
    p.add_argument("--repeat", type=_positive_int, help="runs per row (median; default 3)")
    p.add_argument("--big", action="store_true", help="also run --big-n shots (once)")
    p.add_argument("--big-n", type=_positive_int, default=10_000_000)
    args = p.parse_args(argv)
    if args.sizes is None:
        args.sizes = [1000, 10_000, 100_000] if args.quick else [1000, 10_000, 100_000, 1_000_000]
    if args.repeat is None:
        args.repeat = 2 if args.quick else 3
    if args.workers is None:
        args.workers = _cores()
    return args


def _peak_mb():
    own = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    kids = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024.0
    return own, kids


def _in_fresh_process(fn, *args):
    """Run ``fn(*args)`` in a forked process; return its result and its peak RSS [MB]."""
    ctx = multiprocessing.get_context("fork")
    parent, child = ctx.Pipe(duplex=False)

    def target():
        result = fn(*args)
        child.send((result, _peak_mb()))
        child.close()

    proc = ctx.Process(target=target)
    proc.start()
    result, peaks = parent.recv()
    proc.join()
    if proc.exitcode != 0:
        raise RuntimeError(f"measurement process failed with exit code {proc.exitcode}")
    return result, peaks


def _landing(metrics, k):
    return np.stack([metrics["land_x_m"][:k], metrics["land_y_m"][:k]], axis=1).astype(float)


def _errors(points, ref_points):
    """Worst and 99th-percentile landing distance [mm] over shots landing in both; and the
    number of shots where only one of the two landed."""
    both = np.isfinite(points[:, 0]) & np.isfinite(ref_points[:, 0])
    mismatch = int((np.isfinite(points[:, 0]) != np.isfinite(ref_points[:, 0])).sum())
    d = np.linalg.norm(points[both] - ref_points[both], axis=1) * 1e3
    if not d.size:
        return np.nan, np.nan, mismatch
    return float(d.max()), float(np.percentile(d, 99)), mismatch


def _batch_rows(n, workers, chunk, repeat, k, columns=None, float_dtype=np.float64):
    conditions = domain.load_scenario("demo").conditions
    source = RandomShots(n, seed=SEED)
    rates = []
    for _ in range(repeat):
        start = time.perf_counter()
        res = run_batch(
            source,
            conditions,
            workers=workers,
            chunk=chunk,
            columns=columns,
            float_dtype=float_dtype,
        )
        rates.append(n / (time.perf_counter() - start))
        landing = _landing(res.metrics, min(k, n))
        outcome = res.metrics["outcome"][: min(k, n)].copy()
        del res
    return float(np.median(rates)), landing, outcome


def _per_shot(k, repeat, solver):
    conditions = domain.load_scenario("demo").conditions
    incoming, swing, serve = RandomShots(k, seed=SEED).take(0, k)
    rates = []
    for _ in range(repeat):
        start = time.perf_counter()
        out = play_shots(incoming, swing, conditions, serve, **solver)
        rates.append(k / (time.perf_counter() - start))
    landing = np.stack([out["land_x_m"], out["land_y_m"]], axis=1)
    return float(np.median(rates)), landing, out["outcome"]


def _row(method, n, rate, err, peaks, runs):
    worst, p99, mismatch = err
    own, kids = peaks
    mem = f"{own:7.0f}" + (f" + {kids:4.0f}" if kids > 0 else "       ")
    err_text = f"{'(reference)':>19}" if mismatch < 0 else f"{worst:9.4f} {p99:9.4f}"
    extra = f" {mismatch} landed in one only" if mismatch > 0 else ""
    print(f"{method:<44} {n:>9d} {rate:>11.0f} {err_text} {mem}  {runs}{extra}", flush=True)


def main(argv=None):
    args = _parse(sys.argv[1:] if argv is None else argv)
    k = args.subset
    print(
        f"rallyarc whole-shot throughput: seed {SEED}, {_cores()} cores available, "
        f"chunk {args.chunk}, demo scenario conditions; load average at start "
        f"{os.getloadavg()[0]:.2f} (other work on the machine slows every row)"
    )
    print(
        f"landing error: distance of the first bounce point from scipy solve_ivp DOP853 "
        f"rtol {REFERENCE['rtol']:g} atol {REFERENCE['atol']:g} on the first {k} shots; "
        f"the per-shot rows run on those {k} shots only"
    )
    print(
        "peak memory: ru_maxrss [MB] of the process that ran the row (fresh per row), "
        "+ the largest worker process where there are workers"
    )
    print()
    header = (
        f"{'method':<44} {'N':>9} {'shots/s':>11} {'worst mm':>9} {'p99 mm':>9} "
        f"{'peak RSS MB':>14}  runs (median)"
    )
    print(header)
    print("-" * len(header))

    (ref_rate, ref_land, ref_outcome), ref_peaks = _in_fresh_process(_per_shot, k, 1, REFERENCE)
    (rk_rate, rk_land, rk_outcome), rk_peaks = _in_fresh_process(
        _per_shot, k, args.repeat, BASELINE_PLAIN
    )
    _row(
        f"per-shot RK45 rtol {BASELINE['rtol']:g}, plain-float rhs",
        k,
        rk_rate,
        _errors(rk_land, ref_land),
        rk_peaks,
        args.repeat,
    )
    (np_rate, np_land, _), np_peaks = _in_fresh_process(_per_shot, k, args.repeat, BASELINE)
    _row(
        f"per-shot RK45 rtol {BASELINE['rtol']:g}, numpy on one ball",
        k,
        np_rate,
        _errors(np_land, ref_land),
        np_peaks,
        args.repeat,
    )
    _row(
        f"reference solve_ivp DOP853 rtol {REFERENCE['rtol']:g}",
        k,
        ref_rate,
        (np.nan, np.nan, -1),
        ref_peaks,
        1,
    )
    best = {}
    multi = max(args.workers, 1)
    for workers in sorted({1, multi}):
        for n in args.sizes:
            (rate, land, _), peaks = _in_fresh_process(
                _batch_rows, n, workers, args.chunk, args.repeat, k
            )
            label = f"batch engine, {workers} process{'es' if workers > 1 else ''}"
            err = _errors(land, ref_land[: min(k, n)])
            _row(label, n, rate, err, peaks, args.repeat)
            best[workers, n] = (rate, err)
    if args.big:
        (rate, land, _), peaks = _in_fresh_process(
            _batch_rows, args.big_n, multi, args.chunk, 1, k, COMPACT_COLUMNS, np.float32
        )
        label = f"batch, {multi} proc., float32, {len(COMPACT_COLUMNS)} columns"
        _row(label, args.big_n, rate, _errors(land, ref_land), peaks, 1)

    n_top = max(args.sizes)
    rate, err = best[multi, n_top]
    print()
    print(f"load average at the end {os.getloadavg()[0]:.2f}")
    print(
        f"outcomes of the {k} reference shots: "
        + ", ".join(f"{o} {int((ref_outcome == o).sum())}" for o in np.unique(ref_outcome))
        + f"; per-shot RK45 disagrees on {int((rk_outcome != ref_outcome).sum())}"
    )
    one, _ = best[1, n_top]
    print(
        f"(against the numpy-on-one-ball per-shot row the same ratio would read "
        f"{rate / np_rate:.0f}x; that baseline is slower than a careful per-shot script)"
    )
    print(
        f"batch engine ({multi} process{'es' if multi > 1 else ''}, N={n_top}, worst landing "
        f"error {err[0]:.4f} mm; 1 process {one / rk_rate:.0f}x) / per-shot solve_ivp RK45 "
        f"with a plain-float right-hand side (the fair baseline): {rate / rk_rate:.0f}x"
    )


if __name__ == "__main__":
    main()
