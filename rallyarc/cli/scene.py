"""``rallyarc scene``: a scenario's shots in 3D (pyvista), rendered off screen, exported as a
self-contained HTML page or glTF, or shown in a window."""

from __future__ import annotations

import click

from rallyarc.cli.conditions import (
    load_strokes,
    scenario_options,
)
from rallyarc.cli.options import (
    figure_path,
    play_shots,
    spread_options,
)
from rallyarc.errors import InputError


@click.command("scene")
@scenario_options
@spread_options
@click.option(
    "--camera",
    type=click.Choice(["hitter", "side", "receiver", "overhead", "all"]),
    default="hitter",
    show_default=True,
    help="Camera preset; 'all' writes one PNG per preset (NAME_hitter.png, ...).",
)
@click.option(
    "--out",
    default=None,
    help="PNG rendered off screen [default: scene.png; with --export, only when given].",
)
@click.option(
    "--export",
    "export_path",
    default=None,
    help="Also export the scene: .html (opens in a web browser) or .gltf.",
)
@click.option("--show", is_flag=True, help="Open an interactive window (needs a display).")
@click.option("--force", is_flag=True, help="Overwrite existing files.")
def scene(scenario, stroke_names, overrides, scatter, seed, camera, out, export_path, show,
          force):  # fmt: skip
    """The shots of SCENARIO in 3D: court, net, paths as tubes, markers at contact, net crossing,
    bounce and apex. Rendered off screen to PNG; --export writes a self-contained HTML page (any
    web browser, no Python) or a glTF file; --show opens a window."""
    from rallyarc.output import export
    from rallyarc.viz import scene as scenes

    cameras = list(scenes.CAMERAS) if camera == "all" else [camera]
    pngs = []  # an export alone writes only the export
    if out is not None or export_path is None:
        png = figure_path(out or "scene.png", "--out", (".png",))
        pngs = (
            [png.with_name(f"{png.stem}_{c}{png.suffix}") for c in cameras]
            if camera == "all"
            else [png]
        )
    export.check_targets(pngs, force, "--out")
    if export_path is not None:
        export_path = figure_path(export_path, "--export", (".html", ".gltf"))
        export.check_targets([export_path], force, "--export")
    if show and not scenes.has_display():
        raise InputError("--show: no display found (DISPLAY is not set); the PNG is still written "
                         "without --show")  # fmt: skip
    sc, strokes, incoming = load_strokes(scenario, stroke_names, overrides)
    result = play_shots(sc, strokes, incoming, scatter, seed)
    written = []
    for c, p in zip(cameras[: len(pngs)], pngs, strict=True):
        written.append(scenes.render_scene(result, png_path=p, camera=c))
    if export_path is not None and export_path.suffix.lower() == ".html":
        from rallyarc.viz import webview  # the page shares the report's three.js view

        page = webview.scene_page(result, scenes.scene_page(result).title, cameras[0])
        written.append(export.write_text(export_path, page))
    elif export_path is not None:
        written.append(scenes.render_scene(result, export_path=export_path, camera=cameras[0]))
    click.echo("written: " + ", ".join(str(w) for w in written))
    if show:
        scenes.render_scene(result, camera=cameras[0], show=True)
