"""Figures and scenes, made headless: size, not blank, each variant's colour where its path runs;
sweeps and windows agree with separate runs of the same shots; the palette stays apart under
simulated colour-vision deficiencies; the plot and scene commands."""

import json
import re

import numpy as np
import pytest
from click.testing import CliRunner
from PIL import Image

from rallyarc import domain, sweep, window
from rallyarc.cli import main
from rallyarc.shot import BallState, launch, play
from rallyarc.viz import palette, plots, scene

RPM = np.pi / 30


@pytest.fixture(scope="module")
def demo():
    sc = domain.load_scenario("demo")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    return sc, incoming, play(sc.strokes, sc.conditions, incoming)


def pixels(path):
    return np.asarray(Image.open(path).convert("RGB")).astype(int)


def colour_count(img, hex_colour, tol=18):
    """Pixels within ``tol`` (per channel) of a colour."""
    rgb = palette.hex_to_rgb255(hex_colour)
    return int(np.sum(np.all(np.abs(img - rgb) <= tol, axis=-1)))


def has_figure_size(img, fig, dpi=110):
    """The PNG is the figure's size at the dpi it is saved with (matplotlib rounds down)."""
    w, h = fig.get_size_inches() * dpi
    return abs(img.shape[1] - w) <= 1 and abs(img.shape[0] - h) <= 1


def not_blank(img):
    # a blank or single-colour image has (almost) no spread of values
    return img.std() > 8 and len(np.unique(img.reshape(-1, 3), axis=0)) > 50


# ----------------------------------------------------------------------------- 2D figures


def test_plots_gathers_the_figures_of_their_own_modules():
    """``rallyarc.viz.plots`` is the one import for the 2D figures; each lives in a module of
    its own (side, top, sweeps, window, common)."""
    from rallyarc.viz import common, side, sweeps, top, window

    assert plots.side_view is side.side_view and plots.top_view is top.top_view
    assert plots.sweep_plot is sweeps.sweep_plot and plots.window_plot is window.window_plot
    assert plots.save_figure is common.save_figure and plots.METRICS is sweeps.METRICS
    for name in plots.__all__:
        assert getattr(plots, name) is not None, name


def test_side_view_png_has_its_size_and_each_variant_colour(demo, tmp_path):
    sc, _, result = demo
    fig = plots.side_view(result)
    path = plots.save_figure(fig, tmp_path / "side.png")
    img = pixels(path)
    assert has_figure_size(img, fig)
    assert not_blank(img)
    for k in range(len(sc.strokes)):
        assert colour_count(img, palette.variant_colour(k)) > 300, sc.strokes[k].name


def test_side_view_draws_a_variant_where_its_path_runs(demo, tmp_path):
    """The colour of the lob is found at the pixel of its own path's highest point."""
    sc, _, result = demo
    fig = plots.side_view(result)
    ax = fig.axes[0]
    k = [s.name for s in sc.strokes].index("lob")
    _, pos, _ = result.path(k, dt=0.004)
    top = pos[np.argmax(pos[:, 2])]
    path = plots.save_figure(fig, tmp_path / "side.png")
    img = pixels(path)
    x, y = ax.transData.transform((top[0], top[2])) * 110 / fig.dpi  # saved at 110 dpi
    row, col = img.shape[0] - int(round(y)), int(round(x))
    patch = img[row - 3 : row + 4, col - 3 : col + 4].reshape(-1, 3)
    target = palette.hex_to_rgb255(palette.variant_colour(k))
    assert np.min(np.abs(patch - target).max(axis=1)) <= 25


def test_top_view_with_scatter_draws_ellipses_of_the_landings(demo, tmp_path):
    sc, incoming, _ = demo
    result = sweep.dispersion(sc.strokes[:2], sc.conditions, incoming, 30, seed=3)
    fig = plots.top_view(result)
    ellipses = [p for p in fig.axes[0].patches if type(p).__name__ == "Ellipse"]
    assert len(ellipses) == 2
    # the ellipse centre is the mean landing of its stroke's balls that landed in
    landed_in = result.metrics["outcome"][:30] == "in"
    first = result.metrics["land_x_m"][:30][landed_in]
    assert ellipses[0].center[0] == pytest.approx(np.mean(first))
    img = pixels(plots.save_figure(fig, tmp_path / "top.png"))
    assert has_figure_size(img, fig) and not_blank(img)
    assert colour_count(img, palette.variant_colour(0)) > 200
    assert colour_count(img, palette.variant_colour(1)) > 200


def test_sweep_matches_separate_runs_of_the_same_shots(demo):
    """Each value of a swing sweep equals a play of the stroke with that one value set."""
    sc, incoming, _ = demo
    stroke = sc.strokes[1]
    values = np.radians([1.0, 4.0, 7.0])
    result = sweep.sweep(stroke, sc.conditions, incoming, "face_tilt", values, record=False)
    for j, v in enumerate(values):
        single = play([sweep.with_value(stroke, "face_tilt", v)], sc.conditions, incoming)
        for key in ("net_clearance_m", "land_x_m", "bounce_apex_m", "receiver_height_m"):
            assert result.metrics[key][j] == pytest.approx(
                single.metrics[key][0], abs=1e-9, nan_ok=True
            )


def test_launch_spin_sweep_changes_only_the_spin(demo):
    sc, incoming, _ = demo
    stroke = sc.strokes[1]
    spec = sweep.Launch.from_stroke(stroke, sc.conditions, incoming)
    spins = np.array([500.0, 2500.0]) * RPM
    result = sweep.sweep(stroke, sc.conditions, incoming, "launch_spin", spins, record=False)
    for j, s in enumerate(spins):
        alone = launch(spec.states(topspin=[s]), sc.conditions, record=False)
        assert result.metrics["land_x_m"][j] == pytest.approx(alone.metrics["land_x_m"][0])
    # more topspin: the ball dips sooner and lands shorter (Magnus lift downward; common
    # practice and the lift model's sign)
    assert result.metrics["land_x_m"][1] < result.metrics["land_x_m"][0]


def test_sweep_plot_png_and_its_panels(demo, tmp_path):
    sc, incoming, _ = demo
    p = sweep.PARAMETERS["launch_spin"]
    values = np.linspace(0, 4000, 9)
    result = sweep.sweep(sc.strokes[1], sc.conditions, incoming, p.name, p.to_si(values))
    fig = plots.sweep_plot(result, values, p.axis_label)
    assert len(fig.axes) == 4
    line = fig.axes[1].lines[0]
    assert np.asarray(line.get_ydata()) == pytest.approx(result.metrics["land_depth_m"])
    img = pixels(plots.save_figure(fig, tmp_path / "sweep.png"))
    assert (
        has_figure_size(img, fig) and img.shape[0] > img.shape[1]
    )  # four panels, one above another
    assert not_blank(img) and colour_count(img, palette.variant_colour(0)) > 300


def test_window_cells_match_separate_runs(demo, tmp_path):
    sc, incoming, _ = demo
    stroke = sc.strokes[1]
    xs, ys = np.radians(np.linspace(0, 8, 5)), np.radians(np.linspace(20, 40, 3))
    w = window.window(stroke, sc.conditions, incoming, "face_tilt", xs, "swing_path", ys)
    assert w.outcome.shape == (3, 5)
    for j, i in ((0, 0), (1, 2), (2, 4)):
        single = play([stroke], sc.conditions, incoming, face_tilt=[xs[i]], swing_path=[ys[j]])
        assert w.outcome[j, i] == single.metrics["outcome"][0]
        assert w.net_clearance_m[j, i] == pytest.approx(single.metrics["net_clearance_m"][0])
    assert 0.0 < w.fraction_in() < 1.0
    fig = plots.window_plot(w)
    img = pixels(plots.save_figure(fig, tmp_path / "window.png"))
    assert has_figure_size(img, fig) and not_blank(img)
    assert colour_count(img, palette.OUTCOME_HEX["in"], tol=6) > 1000
    assert colour_count(img, palette.OUTCOME_HEX["net"], tol=6) > 1000


def test_window_room_is_the_distance_to_the_first_cell_out():
    xs = np.arange(5.0)
    outcomes = np.array(["net", "in", "in", "in", "long"])
    assert window._edges(xs, outcomes, 2, 2.0) == ((1.5, "net"), (1.5, "long"))


def test_palette_stays_apart_in_simulated_colour_vision_deficiencies():
    """Delta E*ab (CIE 1976) of every pair of variant colours, in normal vision and as simulated
    with the full-severity matrices of Machado, Oliveira and Fernandes (2009, Table 1)."""
    assert palette.min_difference(palette.VARIANT_HEX) > 30
    for vision in ("protanopia", "deuteranopia", "tritanopia"):
        assert palette.min_difference(palette.VARIANT_HEX, vision) > 15, vision
    # the check can fail: two reds are told apart in normal vision but not by deutans
    assert palette.min_difference(["#cc3333", "#669900"], "deuteranopia") < 15


def test_lab_of_white_and_black():
    """CIE L*a*b* of sRGB white is (100, 0, 0) and of black (0, 0, 0) (CIE 15:2004, D65)."""
    lab = palette.lab(np.array([[1.0, 1.0, 1.0], [0.0, 0.0, 0.0]]))
    assert lab[0] == pytest.approx([100.0, 0.0, 0.0], abs=0.05)
    assert lab[1] == pytest.approx([0.0, 0.0, 0.0], abs=1e-9)


# ----------------------------------------------------------------------------- 3D scenes


def test_scene_png_off_screen_has_its_size_and_the_variant_colours(demo, tmp_path):
    sc, _, result = demo
    path = scene.render_scene(result, png_path=tmp_path / "scene.png", window_size=(800, 500))
    img = pixels(path)
    assert img.shape[:2] == (500, 800)
    assert not_blank(img)
    for k in range(len(sc.strokes)):  # shaded tubes: some pixels near the flat colour
        assert colour_count(img, palette.variant_colour(k), tol=40) > 30, sc.strokes[k].name


@pytest.mark.parametrize("camera", sorted(scene.CAMERAS))
def test_every_camera_preset_renders_the_court(demo, tmp_path, camera):
    _, _, result = demo
    img = pixels(
        scene.render_scene(
            result, png_path=tmp_path / f"{camera}.png", camera=camera, window_size=(480, 300)
        )
    )
    assert not_blank(img)


def test_overhead_scene_puts_the_net_across_the_middle(demo, tmp_path):
    """Seen from overhead the net (dark) runs across the image near its centre column."""
    _, _, result = demo
    img = pixels(
        scene.render_scene(
            result, png_path=tmp_path / "o.png", camera="overhead", window_size=(700, 430)
        )
    )
    dark = np.all(img < 90, axis=-1)
    cols = np.flatnonzero(dark[100:330].sum(axis=0) > 60)
    assert cols.size and 250 < cols.mean() < 450


def test_scene_exports_gltf_with_a_material_per_variant_colour(demo, tmp_path):
    sc, _, result = demo
    path = scene.render_scene(result, export_path=tmp_path / "scene.gltf")
    data = json.loads(path.read_text())
    assert data["asset"]["version"] == "2.0"
    assert len(data["meshes"]) > len(sc.strokes)
    assert all(b["uri"].startswith("data:") for b in data["buffers"])  # one self-contained file
    colours = [m["pbrMetallicRoughness"]["baseColorFactor"][:3] for m in data["materials"]]
    for k in range(len(sc.strokes)):
        srgb = palette.hex_to_rgb(palette.variant_colour(k))
        assert any(np.allclose(c, srgb, atol=0.01) for c in colours), sc.strokes[k].name


def test_scene_rejects_an_unknown_camera(demo):
    with pytest.raises(ValueError, match="unknown camera"):
        scene.build_scene(demo[2], camera="blimp")


def test_scene_page_is_data_of_its_own_not_stored_on_the_plotter(demo, tmp_path):
    """The HTML page's title, legend and marker words come from :func:`scene.scene_page`, passed
    to the export; the pyvista plotter carries no attribute of ours."""
    sc, _, result = demo
    page = scene.scene_page(result, camera="side")
    assert page.start == "side"
    assert [label for label, _ in page.legend] == [plots.display_label(s.name) for s in sc.strokes]
    assert page.legend[0][1] == palette.variant_colour(0)
    assert page.markers == " | ".join(scene.MARKER_WORDS.values())
    plotter = scene.build_scene(result, camera="side", window_size=(320, 200))
    try:
        assert not [a for a in vars(plotter) if "rallyarc" in a]
    finally:
        plotter.close()
    text = scene.render_scene(result, export_path=tmp_path / "s.html", camera="side").read_text()
    assert page.title in text


# ----------------------------------------------------------------------------- commands


def run(*args, env=None):
    return CliRunner(env=env).invoke(main, [str(a) for a in args])


def test_plot_commands_write_their_figures(tmp_path):
    for kind, extra in (
        ("side", ()),
        ("top", ("--scatter", "12", "--stroke", "topspin_drive")),
        ("sweep", ("--stroke", "topspin_drive", "--steps", "6", "--csv", tmp_path / "s.csv")),
        ("window", ("--stroke", "topspin_drive", "--steps", "7")),
    ):
        out = tmp_path / f"{kind}.png"
        result = run("plot", kind, *extra, "--out", out)
        assert result.exit_code == 0, result.output
        assert not_blank(pixels(out))
        again = run("plot", kind, *extra, "--out", out)
        assert again.exit_code == 2 and "exists" in again.output
    table = np.genfromtxt(tmp_path / "s.csv", delimiter=",", names=True, dtype=None)
    assert len(table) == 6


def test_plot_sweep_table_matches_the_figure_values(tmp_path):
    import pandas as pd

    out, csv = tmp_path / "s.png", tmp_path / "s.csv"
    args = ("--stroke", "slice", "--param", "head_speed", "--range", "80,120", "--steps", "3")
    assert run("plot", "sweep", *args, "--out", out, "--csv", csv).exit_code == 0
    table = pd.read_csv(csv)
    assert list(table["head_speed_kmh"]) == pytest.approx([80.0, 100.0, 120.0])
    sc = domain.load_scenario("demo")
    stroke = next(s for s in sc.strokes if s.name == "slice")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    single = play([stroke], sc.conditions, incoming, head_speed=[100.0 / 3.6])
    assert table["land_x_m"][1] == pytest.approx(single.metrics["land_x_m"][0])


def test_scene_command_writes_png_per_camera_and_gltf(tmp_path):
    out = tmp_path / "sc.png"
    result = run("scene", "--camera", "all", "--out", out, "--export", tmp_path / "sc.gltf")
    assert result.exit_code == 0, result.output
    for cam in scene.CAMERAS:
        assert not_blank(pixels(tmp_path / f"sc_{cam}.png"))
    assert (tmp_path / "sc.gltf").stat().st_size > 1000


@pytest.mark.parametrize(
    "args, words",
    [
        (("plot", "sweep", "--param", "elbow"), "--param: unknown parameter"),
        (("plot", "sweep", "--range", "5"), "--range: expected LO,HI"),
        (("plot", "sweep", "--steps", "1"), "--steps: must be"),
        (("plot", "sweep", "--metrics", "fun"), "--metrics: unknown metric"),
        (("plot", "window", "--axes", "face_tilt,launch_speed"), "--axes: two different"),
        (("plot", "side", "--out", "x.jpg"), "--out: x.jpg must end in"),
        (("plot", "side", "--stroke", "tweener"), "--stroke: 'tweener' is not a stroke"),
        (("plot", "top", "--scatter", "5000"), "--scatter: must be"),
        (("scene", "--export", "s.obj"), "--export: s.obj must end in .html, .gltf"),
    ],
)
def test_bad_figure_options_give_one_line_errors(tmp_path, monkeypatch, args, words):
    monkeypatch.chdir(tmp_path)
    result = run(*args)
    assert result.exit_code == 2
    assert words in result.output and "Traceback" not in result.output
    assert len(result.output.strip().splitlines()) == 1
    assert not list(tmp_path.iterdir())  # nothing written


def test_scene_show_without_a_display_says_so(tmp_path, monkeypatch):
    monkeypatch.delenv("DISPLAY", raising=False)
    monkeypatch.delenv("WAYLAND_DISPLAY", raising=False)
    result = run("scene", "--show", "--out", tmp_path / "s.png")
    assert result.exit_code == 2 and "--show: no display" in result.output
    assert not (tmp_path / "s.png").exists()


def test_scene_html_page_is_the_self_contained_three_js_view(demo, tmp_path):
    # the library's HTML export is the page `scene --export x.html` writes: the three.js view
    # (browser tests in tests/report), with every stroke in its palette colour and no fetch
    from rallyarc.viz import webview

    sc, _, result = demo
    path = scene.render_scene(result, export_path=tmp_path / "scene.html")
    text = path.read_text()
    assert text == webview.scene_page(result, scene.scene_page(result).title, "hitter")
    # nothing loaded from elsewhere (the inlined library's source may name URLs in comments)
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:)?//""", text)
    data = webview.scene_data(result)
    assert set(data["cameras"]) == set(scene.CAMERAS)
    for k, stroke in enumerate(sc.strokes):
        assert plots.display_label(stroke.name) in text
        assert palette.variant_colour(k) in text
    assert not (tmp_path / "scene.png").exists()
