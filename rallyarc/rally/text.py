"""The text of a rally summary for the terminal: points, endings, the match statistics with
their 95 % intervals, shot types, contact heights, depth, replies and the spin exchange.

Percentages are printed with one decimal everywhere (:func:`pct`), the rounding the figures
use too.
"""

from __future__ import annotations


def pct(value):
    """A share as a percentage with one decimal ("-" for none)."""
    return "-" if value is None else f"{value * 100:.1f}"


def with_interval(s):
    """A :func:`rallyarc.rally.stats.share` as "55.1 % (52.3-57.9)"."""
    if s["share"] is None:
        return "-"
    return f"{pct(s['share'])} % ({pct(s['low'])}-{pct(s['high'])})"


def _statistics_lines(summary, names):
    st = summary["statistics"]
    labels = {
        "first_serve_in": "first serves in",
        "second_serve_in": "second serves in",
        "double_faults_per_service_point": "double faults per service point",
        "aces_per_service_point": "aces per service point",
        "rally_ball_errors": "rally-ball errors per rally ball",
    }
    lines = ["match statistics, share (95 % interval):"]
    for n in names:
        p = st["players"][n]
        lines.append(
            f"  {n}: " + "; ".join(f"{lab} {with_interval(p[k])}" for k, lab in labels.items())
        )
    ends = st["points_ending_in"]
    lines.append(
        "  points ending in: "
        + "; ".join(f"{k.replace('_', ' ')} {with_interval(v)}" for k, v in ends.items())
    )
    length = st["rally_length_strokes"]
    bands = "; ".join(f"{b} {with_interval(v)}" for b, v in length.items() if b != "mean")
    lines.append(f"  rally length in strokes: mean {length['mean']:.1f}; {bands}")
    pr = summary["precision"]
    needed = ", ".join(f"+/-{k} {v}" for k, v in pr["needed"].items())
    lines.append(
        f"  precision: this run's 95 % interval on a share near 50 % is +/-"
        f"{pct(pr['this_run_half_width'])} points; rallies needed for {needed}"
    )
    return lines


def modes_text(data):
    """The physics modes a run played that are not the defaults (``data["modes"]``), as the
    suffix of a heading: ``"; rigid ball at the bounce"``, empty for the defaults."""
    return "".join(f"; {mode}" for mode in data.get("modes", ()))


def modes_line(data):
    """The same modes as a line of their own for a figure's title (``"\nplayed with: ..."``),
    empty for the defaults."""
    modes = data.get("modes", ())
    return f"\nplayed with: {'; '.join(modes)}" if modes else ""


def _head_lines(summary, names):
    length = summary["rally_length_shots"]
    ci = summary["points_share_interval"]
    return [
        f"{summary['patterns']} ({summary['club']}): {summary['rallies']} rallies, seed "
        f"{summary['seed']}, at most {summary['max_shots']} shots{modes_text(summary)}",
        "points: "
        + ", ".join(
            f"{n} {summary['points'][n]} ({pct(summary['points_share'][n])} %, 95 % interval "
            f"{pct(ci[n][0])}-{pct(ci[n][1])})"
            for n in names
        )
        + f"; unfinished {summary['unfinished']}",
        "endings: "
        + ", ".join(f"{k.replace('_', ' ')} {v}" for k, v in summary["endings"].items()),
        f"rally length: mean {length['mean']:.1f} shots, median {length['p50']:.0f}, "
        f"longest {length['max']}",
    ]


def _shot_type_lines(summary):
    lines = [
        f"{'player':<18} {'shot type':<24} {'shots':>6} {'net':>5} {'long':>5} {'wide':>5} "
        f"{'out':>4} {'error %':>7} {'95 % interval':>13} {'winners':>7}",
    ]
    for r in summary["by_shot_type"]:
        lines.append(
            f"{r['player']:<18} {r['shot_type']:<24} {r['shots']:>6} {r['net']:>5} {r['long']:>5} "
            f"{r['wide']:>5} {r['out']:>4} {r['error_rate'] * 100:>7.1f} "
            f"{_band(r['error_rate_interval']):>13} {r['winners']:>7}"
        )
    return lines


def _band(interval):
    return f"{pct(interval[0])}-{pct(interval[1])}"


def _height_and_depth_lines(summary, names):
    lines = []
    for n in names:
        h = summary["contact_height"][n]
        q = h["quantiles_m"]
        share = h["above_shoulder_share"]
        band = summary["players"][n]["preferred_contact_height_m"]
        if share is None:
            continue
        lines.append(
            f"{n}: contact height median {q['p50']:.2f} m "
            f"(10-90 %: {q['p10']:.2f}-{q['p90']:.2f}); "
            f"above the shoulder ({h['shoulder_height_m']:.2f} m) {share * 100:.1f} %; in the "
            f"preferred {band[0]:.2f}-{band[1]:.2f} m {h['in_preferred_range_share'] * 100:.1f} %"
        )
    for n in names:
        d = summary["depth"][n]
        if not d["landed"]:
            continue
        z = d["zones"]
        side = summary["width"][n]["side_margin_quantiles_m"]["p50"]
        lines.append(
            f"{n}: rally balls landing deep (last 2.5 m) {z['deep'] / d['landed'] * 100:.1f} %, "
            f"short of the service line {z['short'] / d['landed'] * 100:.1f} %, long "
            f"{z['long'] / d['landed'] * 100:.1f} %; median depth {d['quantiles_m']['p50']:.2f} m "
            f"inside the baseline, median {side:.2f} m inside the sideline"
        )
    return lines


def _against_lines(summary):
    lines = [
        f"{'player':<18} {'replying to':<26} {'shots':>6} {'contact':>8} {'above':>9} "
        f"{'error %':>7}",
        f"{'':<18} {'':<26} {'':>6} {'median m':>8} {'shoulder':>9} {'':>7}",
    ]
    for r in summary["against"]:
        lines.append(
            f"{r['player']:<18} {r['replying_to']:<26} {r['shots']:>6} "
            f"{r['contact_height_median_m']:>8.2f} {r['above_shoulder_share'] * 100:>8.1f}% "
            f"{r['error_rate'] * 100:>7.1f}"
        )
    return lines


def _spin_lines(summary, names):
    sx = summary["spin_exchange"]
    lines = []
    for n in names:
        s = sx["players"][n]
        if not s["shots"]:
            continue
        lines.append(
            f"{n}: topspin in {s['incoming_topspin_rpm']['mean']:+.0f} rpm, out "
            f"{s['outgoing_topspin_rpm']['mean']:+.0f} rpm (mean; - is backspin), spin sense "
            f"reversed on {s['reversed_share'] * 100:.1f} % of shots"
        )
    if sx["dominant"]:
        lines.append(
            f"spin exchange: {sx['dominant']} dominates (their balls reach the opponent with more "
            "topspin)"
        )
    return lines


def summary_lines(summary):
    """The summary as text lines for the terminal."""
    names = list(summary["players"])
    return [
        *_head_lines(summary, names),
        *_statistics_lines(summary, names),
        "",
        *_shot_type_lines(summary),
        "",
        *_height_and_depth_lines(summary, names),
        "",
        *_against_lines(summary),
        "",
        *_spin_lines(summary, names),
    ]
