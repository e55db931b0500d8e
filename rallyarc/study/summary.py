"""Per-parameter marginal summaries of a study, read from its dataset batch by batch.

For each parameter, the design's values are grouped (a grid's own values; otherwise
:data:`BINS` equal bins of its range) and, over every shot in the dataset, each group gets its
shares of the outcomes (in, net, long, wide, out, miss), and quantiles of the depth inside the
baseline of the balls that landed in and of the apex after the bounce. The reader takes a few
columns of one record batch at a time (:mod:`pyarrow.dataset`), and quantiles come from fixed
1 cm histograms, so memory stays flat however large the dataset; quantiles are exact to 1 cm.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from rallyarc.rally.text import modes_text
from rallyarc.study.store import partition_name, read_manifest

#: Groups of a sampled (random or Latin hypercube) parameter's range.
BINS = 10
#: Quantiles of depth and apex.
QUANTILES = (0.1, 0.5, 0.9)
OUTCOMES = ("in", "net", "long", "wide", "out", "miss")
#: Histogram ranges [m] and bin width of the quantiles.
DEPTH_RANGE_M, APEX_RANGE_M, RESOLUTION_M = (-1.0, 25.0), (0.0, 20.0), 0.01


def _groups(p):
    """(centres, function from values to group index) of one manifest parameter."""
    low, high = p["low"], p["high"]
    if p.get("steps") and p["steps"] >= 1 and p.get("grid"):
        steps = p["steps"]
        centres = np.linspace(low, high, steps)
        span = (high - low) or 1.0
        return centres, lambda v: np.rint((v - low) / span * (steps - 1)).astype(int)
    n = BINS if high > low else 1
    edges = np.linspace(low, high, n + 1)
    centres = 0.5 * (edges[:-1] + edges[1:]) if n > 1 else np.array([low])
    span = (high - low) or 1.0
    return centres, lambda v: np.clip(((v - low) / span * n).astype(int), 0, n - 1)


def _hist_index(values, lo_hi):
    lo, hi = lo_hi
    bins = int(round((hi - lo) / RESOLUTION_M))
    return np.clip(((values - lo) / RESOLUTION_M).astype(int), 0, bins - 1), bins


def _quantiles(hist, lo):
    total = hist.sum()
    if total == 0:
        return [None] * len(QUANTILES)
    cum = np.cumsum(hist)
    return [
        round(lo + (int(np.searchsorted(cum, q * total)) + 0.5) * RESOLUTION_M, 3)
        for q in QUANTILES
    ]


def summarize_study(folder, batch_size=65_536):
    """Marginal summaries of the study in ``folder``: a dict with the study's name, the shots
    read, and for each parameter its group values with outcome shares and depth and apex
    quantiles (None where a group has no shots)."""
    import pyarrow.dataset as ds

    manifest = read_manifest(folder)
    files = [str(Path(folder) / partition_name(k)) for k in sorted(manifest["done"])]
    params = manifest["parameters"]
    for p in params:
        p["grid"] = manifest["design"] == "grid"
    groups = [_groups(p) for p in params]
    _, depth_bins = _hist_index(np.zeros(0), DEPTH_RANGE_M)
    _, apex_bins = _hist_index(np.zeros(0), APEX_RANGE_M)
    acc = [
        {
            "outcomes": np.zeros((len(c), len(OUTCOMES)), np.int64),
            "depth": np.zeros((len(c), depth_bins), np.int64),
            "apex": np.zeros((len(c), apex_bins), np.int64),
        }
        for c, _ in groups
    ]
    columns = [p["column"] for p in params] + ["outcome", "land_depth_m", "bounce_apex_m"]
    shots = 0
    data = ds.dataset(files, format="parquet") if files else None
    for batch in data.to_batches(columns=columns, batch_size=batch_size) if data else ():
        shots += batch.num_rows
        _add(batch, params, groups, acc)
    return {
        "study": manifest["study"],
        "kind": manifest["kind"],
        "design": manifest["design"],
        "modes": manifest.get("modes", []),
        "complete": manifest["complete"],
        "shots": shots,
        "parameters": [_finish(p, c, a) for p, (c, _), a in zip(params, groups, acc, strict=True)],
    }


def _add(batch, params, groups, acc):
    outcome = batch.column("outcome").to_numpy(zero_copy_only=False).astype(str)
    code = np.full(len(outcome), -1)
    for j, name in enumerate(OUTCOMES):
        code[outcome == name] = j
    depth = batch.column("land_depth_m").to_numpy(zero_copy_only=False)
    apex = batch.column("bounce_apex_m").to_numpy(zero_copy_only=False)
    depth = np.asarray(depth, float)
    apex = np.asarray(apex, float)
    in_ok = (code == 0) & np.isfinite(depth)
    apex_ok = np.isfinite(apex)
    d_idx, d_bins = _hist_index(np.where(in_ok, depth, 0.0), DEPTH_RANGE_M)
    a_idx, a_bins = _hist_index(np.where(apex_ok, apex, 0.0), APEX_RANGE_M)
    for p, (_, group_of), a in zip(params, groups, acc, strict=True):
        g = group_of(batch.column(p["column"]).to_numpy())
        known = code >= 0
        np.add.at(a["outcomes"], (g[known], code[known]), 1)
        np.add.at(a["depth"], (g[in_ok], d_idx[in_ok]), 1)
        np.add.at(a["apex"], (g[apex_ok], a_idx[apex_ok]), 1)


def _finish(p, centres, a):
    counts = a["outcomes"]
    totals = counts.sum(axis=1)
    shares = {
        f"{name}_share": [
            round(float(c) / t, 4) if t else None for c, t in zip(counts[:, j], totals, strict=True)
        ]
        for j, name in enumerate(OUTCOMES)
    }
    depth = [_quantiles(h, DEPTH_RANGE_M[0]) for h in a["depth"]]
    apex = [_quantiles(h, APEX_RANGE_M[0]) for h in a["apex"]]
    labels = [f"q{round(q * 100):d}" for q in QUANTILES]
    return {
        "name": p["name"],
        "column": p["column"],
        "unit": p["unit"],
        "values": [round(float(v), 6) for v in centres],
        "shots": [int(t) for t in totals],
        **shares,
        "depth_m": {lab: [row[i] for row in depth] for i, lab in enumerate(labels)},
        "apex_m": {lab: [row[i] for row in apex] for i, lab in enumerate(labels)},
    }


def summary_lines(summary):
    """The summary as text: per parameter, one line per group."""
    lines = [
        f"{summary['study']}: {summary['shots']} shots ({summary['design']} design)"
        + modes_text(summary)
    ]
    for p in summary["parameters"]:
        lines.append(f"{p['name']} [{p['unit']}]     shots   in%  net%  long%  depth q50  apex q50")
        for i, v in enumerate(p["values"]):
            in_, net, long_ = (_pct(p[k][i]) for k in ("in_share", "net_share", "long_share"))
            d, a = p["depth_m"]["q50"][i], p["apex_m"]["q50"][i]
            lines.append(
                f"  {v:10.4g} {p['shots'][i]:9d} {in_} {net} {long_}  "
                f"{'n/a' if d is None else f'{d:6.2f} m':>9}  "
                f"{'n/a' if a is None else f'{a:5.2f} m':>8}"
            )
    return lines


def _pct(share):
    return "  n/a" if share is None else f"{100 * share:5.1f}"
