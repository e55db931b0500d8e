"""The rally figures agree with the summary: one x-scale for the contact heights, serve returns
counted in the rally-ball panels, shares printed as the summary text prints them, one boundary
sideline on the landing heatmaps. Checked on the Figures' axes and texts."""

import numpy as np
import pytest
from matplotlib.colors import to_hex

from rallyarc import court
from rallyarc.rally import load_patterns, play_rallies, summarize, summary_lines
from rallyarc.rally.text import with_interval
from rallyarc.viz import palette, rally_plots


@pytest.fixture()
def run_and_summary(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.4), zone=True)))
    run = play_rallies(pat, n=40, seed=2, max_shots=6)
    return run, summarize(run)


def _texts(fig):
    out = [t.get_text() for t in fig.texts]
    for ax in fig.axes:
        out += [ax.get_title()] + [t.get_text() for t in ax.texts]
    return "\n".join(out)


def _share(value, interval):
    return with_interval({"share": value, "low": interval[0], "high": interval[1]})


def test_contact_height_panels_share_one_x_scale(run_and_summary):
    run, summary = run_and_summary
    fig = rally_plots.contact_height_histograms(run.shots, summary)
    axes = fig.axes[: len(summary["players"])]
    limits = {ax.get_xlim() for ax in axes}
    assert len(limits) == 1
    assert all(axes[0].get_shared_x_axes().joined(axes[0], ax) for ax in axes[1:])
    widest = max(p.get_x() + p.get_width() for ax in axes for p in ax.patches)
    assert widest <= limits.pop()[1]


def test_rally_ball_panels_count_the_serve_returns_they_include(run_and_summary):
    run, summary = run_and_summary
    shots = run.shots
    returns = rally_plots.serve_returns(shots)
    previous = shots.groupby("rally")["serve"].shift(1).fillna("")
    assert np.array_equal(returns, ((previous != "") & (shots["serve"] == "")).to_numpy())
    assert returns.sum() > 0
    fig = rally_plots.contact_height_histograms(shots, summary)
    for ax, name in zip(fig.axes, summary["players"], strict=False):
        n = int(returns[(shots["player"] == name).to_numpy()].sum())
        h = summary["contact_height"][name]
        assert ax.get_title().startswith(
            f"{name}: {h['contacts']} rally-ball contacts, {n} of them serve returns"
        )
    assert "serve returns included" in fig.texts[0].get_text()


def test_figure_shares_use_the_summary_rounding_and_intervals(run_and_summary):
    run, summary = run_and_summary
    text = "\n".join(summary_lines(summary))
    heights = _texts(rally_plots.contact_height_histograms(run.shots, summary))
    landing = _texts(rally_plots.landing_heatmaps(run.shots, summary))
    spin = _texts(rally_plots.spin_exchange(run.shots, summary))
    for name in summary["players"]:
        h = summary["contact_height"][name]
        above = _share(h["above_shoulder_share"], h["above_shoulder_share_interval"])
        assert f"above the shoulder {above}" in heights
        assert f"{h['above_shoulder_share'] * 100:.1f} %" in text
        st = summary["statistics"]["players"][name]
        first = with_interval(st["first_serve_in"])
        assert f"first serves {first}" in landing
        assert f"first serves in {first}" in text
        s = summary["spin_exchange"]["players"][name]
        assert f"reversed on {_share(s['reversed_share'], s['reversed_share_interval'])}" in spin
        assert f"{s['reversed_share'] * 100:.1f} %" in text
        d = summary["depth"][name]
        assert f"deep (last 2.5 m) {d['zones']['deep'] / d['landed'] * 100:.1f} % (" in landing
        assert f"deep (last 2.5 m) {d['zones']['deep'] / d['landed'] * 100:.1f} %" in text


def test_landing_cells_and_lines_give_one_singles_sideline(run_and_summary):
    run, summary = run_and_summary
    x_edges, y_edges = rally_plots.landing_edges()
    sw, hl = court.SINGLES_WIDTH / 2, court.HALF_LENGTH
    for edges, line in ((y_edges, sw), (x_edges, hl)):
        assert np.min(np.abs(edges - line)) < 1e-9
        assert np.min(np.abs(edges + line)) < 1e-9
    fig = rally_plots.landing_heatmaps(run.shots, summary)
    ink = palette.COURT_HEX["ink"]
    for ax in fig.axes[:4]:
        long_lines = [
            p
            for p in ax.patches
            if p.get_width() > 20 and p.get_height() < 0.1 and to_hex(p.get_edgecolor()) == ink
        ]
        centres = sorted(round(p.get_y() + p.get_height() / 2, 3) for p in long_lines)
        assert centres == [round(-sw, 3), round(sw, 3)]


@pytest.mark.parametrize(
    ("d", "label"),
    [
        ({"difference": 0.02, "low": -0.01, "high": 0.05}, "+2.0 (-1.0 to +5.0)"),
        # one finished rally: a difference but no interval (its bounds are written as None)
        ({"difference": 1.0, "low": None, "high": None}, "+100.0 (no interval)"),
    ],
)
def test_whatif_figure_labels_each_difference_with_its_interval(d, label):
    comparison = {
        "base": "plan a",
        "rallies": 100,
        "variants": [{"label": "plan a"}, {"label": "plan b", "difference_from_base": {"x": d}}],
    }
    fig = rally_plots.whatif_differences(comparison)
    assert label in _texts(fig)


def test_figures_of_a_run_in_other_modes_name_them(write_patterns, pattern_text):
    from rallyarc.rally import with_modes
    from rallyarc.viz.rally_landing import landing_heatmaps

    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.4), zone=True)))
    for patterns, named in ((pat, False), (with_modes(pat, deforming_ball=False), True)):
        run = play_rallies(patterns, n=12, seed=2, max_shots=4)
        summary = summarize(run)
        for draw in (rally_plots.contact_height_histograms, rally_plots.spin_exchange):
            text = _texts(draw(run.shots, summary))
            assert ("played with: rigid ball at the bounce" in text) is named
        text = _texts(landing_heatmaps(run.shots, summary))
        assert ("played with: rigid ball at the bounce" in text) is named
