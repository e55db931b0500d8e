"""Rally engine throughput beside the batch engine's, measured in the same run on one core.

The rally rows play the demo pattern pair (``demo_match``) with one process, 10,000 rallies by
default (two blocks of rallyarc.rally.BLOCK, as a 10,000-rally run plays them); the batch row plays
seeded random whole shots (rallyarc.batch.RandomShots) in the demo scenario's conditions with one
process. A last rally row plays ``--many`` rallies (10,000 by default) over every core, as
``rallyarc rally`` does by default. The last line is rally shots/s over batch shots/s, one core.

Rallies fly the aim solver's first flights with the compiled kernel (rallyarc.flight.compiled);
a warm-up of a few rallies before the timed rows loads it (or compiles it, the first time after
an install), so no row pays for the compile.

Run: python benchmarks/rally.py [--rallies 10000] [--shots 100000] [--many 10000] [--seed 1]
"""

from __future__ import annotations

import argparse
import os
import sys
import time

from rallyarc import domain
from rallyarc.batch import RandomShots, run_batch
from rallyarc.rally import load_patterns, play_rallies


def _parse(argv):
    p = argparse.ArgumentParser(description="Rally shots/s beside batch shots/s, one core.")
    p.add_argument("--rallies", type=int, default=10_000, help="rallies, one process (10000)")
    p.add_argument("--shots", type=int, default=100_000, help="batch shots (default 100000)")
    p.add_argument("--many", type=int, default=10_000, help="rallies over every core (0: skip)")
    p.add_argument("--seed", type=int, default=1)
    args = p.parse_args(argv)
    if args.rallies < 1 or args.shots < 1 or args.many < 0:
        sys.stderr.write("rally.py: error: --rallies, --shots at least 1; --many 0 or more\n")
        sys.exit(2)
    return args


def main(argv=None):
    args = _parse(sys.argv[1:] if argv is None else argv)
    print(
        f"rallyarc rally throughput: demo_match, seed {args.seed}, one process; load average "
        f"at start {os.getloadavg()[0]:.2f} (other work on the machine slows every row)"
    )
    patterns = load_patterns("demo_match")
    start = time.perf_counter()
    play_rallies(patterns, n=20, seed=args.seed + 1, workers=1)  # loads the compiled kernel
    warm_s = time.perf_counter() - start
    start = time.perf_counter()
    run = play_rallies(patterns, n=args.rallies, seed=args.seed, workers=1)
    rally_s = time.perf_counter() - start
    shots = len(run.shots)
    conditions = domain.load_scenario("demo").conditions
    start = time.perf_counter()
    run_batch(RandomShots(args.shots, seed=7), conditions, workers=1)
    batch_s = time.perf_counter() - start
    rally_rate, batch_rate = shots / rally_s, args.shots / batch_s
    print(f"{'engine':<28} {'N':>9} {'seconds':>9} {'per second':>12}")
    rallies_rate = args.rallies / rally_s
    print(f"{'rally engine: rallies':<28} {args.rallies:>9d} {rally_s:>9.2f} {rallies_rate:>12.0f}")
    print(f"{'rally engine: shots':<28} {shots:>9d} {rally_s:>9.2f} {rally_rate:>12.0f}")
    print(f"{'batch engine: whole shots':<28} {args.shots:>9d} {batch_s:>9.2f} {batch_rate:>12.0f}")
    if args.many:
        cores = os.cpu_count() or 1
        start = time.perf_counter()
        many = play_rallies(patterns, n=args.many, seed=args.seed, workers=cores)
        many_s = time.perf_counter() - start
        label = f"rally engine: rallies, {cores} proc."
        print(f"{label:<28} {args.many:>9d} {many_s:>9.2f} {args.many / many_s:>12.0f}")
        label = f"rally engine: shots, {cores} proc."
        print(f"{label:<28} {len(many.shots):>9d} {many_s:>9.2f} {len(many.shots) / many_s:>12.0f}")
    print(f"warm-up (20 rallies, loading or compiling the kernel): {warm_s:.2f} s")
    print(f"load average at the end {os.getloadavg()[0]:.2f}")
    print(f"rally shots/s / batch shots/s (one core): {rally_rate / batch_rate:.3f}")


if __name__ == "__main__":
    main()
