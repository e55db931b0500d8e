"""3D scenes of shots (pyvista): the court, the net, each variant's path as a tube, event markers.

:func:`build_scene` assembles a :class:`pyvista.Plotter`; :func:`render_scene` renders it off
screen to a PNG (no display needed: VTK renders through EGL or OSMesa), exports it as a glTF
2.0 file (one file, buffers embedded, which any glTF viewer or web browser viewer opens without
Python) or as one self-contained HTML page (the three.js view of :mod:`viz.webview`, the same
as the coach's report), or opens an interactive window where a display exists.

Like :mod:`viz.plots`, nothing here computes physics: paths are the recorded trajectories
sampled, markers are the metrics of the result. The court frame is the project's (x toward the
far baseline, y to the hitter's left, z up, metres).
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from rallyarc import court
from rallyarc.output.export import atomic_write
from rallyarc.viz import palette
from rallyarc.viz.common import display_label, drawn, variant_groups

#: Camera presets: (position, focal point, view up) in the court frame [m].
CAMERAS = {
    "hitter": ((-court.HALF_LENGTH - 7.0, -1.5, 3.4), (4.0, 0.0, 0.6), (0.0, 0.0, 1.0)),
    "side": ((1.0, -26.0, 3.2), (1.0, 0.0, 1.9), (0.0, 0.0, 1.0)),
    "receiver": ((court.HALF_LENGTH + 7.5, 1.2, 2.8), (-4.0, 0.0, 0.9), (0.0, 0.0, 1.0)),
    "overhead": ((3.2, 1.4, 44.0), (3.2, 1.4, 0.0), (0.0, 1.0, 0.0)),
}
CAMERA_WORDS = {
    "hitter": "behind the hitter",
    "side": "side-on",
    "receiver": "the receiver's view",
    "overhead": "overhead",
}
#: Marker shapes of the events along a path.
MARKER_WORDS = {
    "contact": "sphere: contact with the racket",
    "net": "cube: net crossing",
    "land": "disc: bounce",
    "apex": "cone: apex after the bounce",
}
_MANY = 12  # more shots than this: thin tubes, no event markers, at most 60 paths
_TUBE_RADIUS = 0.045  # about the ball's radius, enlarged a little to read at court scale


def _quiet_vtk():
    """Keep VTK's own log lines (e.g. that no X server is there) off the user's terminal."""
    try:
        from vtkmodules.vtkCommonCore import vtkLogger, vtkObject

        vtkLogger.SetStderrVerbosity(vtkLogger.VERBOSITY_OFF)
        vtkObject.GlobalWarningDisplayOff()
    except ImportError:  # pragma: no cover - older VTK
        pass


def has_display():
    """True when an interactive window can open (an X or Wayland display, or not Linux)."""
    if os.name != "posix" or os.uname().sysname == "Darwin":
        return True
    return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))


def _flat_box(pv, x0, x1, y0, y1, z0, z1):
    return pv.Box(bounds=(x0, x1, y0, y1, z0, z1))


def _court(pv, plotter, singles):
    hexes = palette.COURT_HEX
    hl, hw = court.HALF_LENGTH, court.DOUBLES_WIDTH / 2
    plotter.add_mesh(
        pv.Plane(center=(0, 0, -0.006), i_size=2 * hl + 60.0, j_size=2 * hw + 60.0),
        color=hexes["ground"],
        name="ground",
    )
    plotter.add_mesh(  # the run-off around the court (ITF recommended: 6.4 m and 3.66 m)
        pv.Plane(center=(0, 0, -0.004), i_size=2 * hl + 12.8, j_size=2 * hw + 7.3),
        color=hexes["surround"],
        name="surround",
    )
    plotter.add_mesh(
        pv.Plane(center=(0, 0, -0.002), i_size=2 * hl, j_size=2 * hw),
        color=hexes["surface"],
        name="surface",
    )
    w, z0, z1 = court.LINE_WIDTH, 0.0, 0.004
    lines = []
    for xa, ya, xb, yb in court.line_segments():
        if xa == xb:
            lines.append(_flat_box(pv, xa - w / 2, xa + w / 2, ya, yb, z0, z1))
        else:
            lines.append(_flat_box(pv, xa, xb, ya - w / 2, ya + w / 2, z0, z1))
    merged = lines[0].merge(lines[1:])
    plotter.add_mesh(merged, color=hexes["line"], name="lines")


def _net(pv, plotter, singles):
    """Net surface with its sag, the white band along the cord, posts and singles sticks."""
    hexes = palette.COURT_HEX
    support = court.SINGLES_STICK_Y if singles else court.POST_Y
    ys = np.linspace(-support, support, 81)
    top = court.net_height(ys, singles=singles)
    plotter.add_mesh(_sheet(pv, ys, top), color=hexes["net"], opacity=0.55, name="net")
    cord = np.column_stack([np.zeros_like(ys), ys, top - 0.025])
    plotter.add_mesh(
        pv.lines_from_points(cord).tube(radius=0.03), color=hexes["net_band"], name="net_band"
    )
    posts = [court.POST_Y, -court.POST_Y]
    for y, side in zip(posts, ("left", "right"), strict=True):
        plotter.add_mesh(
            pv.Cylinder(center=(0, y, court.NET_HEIGHT_POST / 2), direction=(0, 0, 1),
                        radius=0.05, height=court.NET_HEIGHT_POST),
            color=hexes["net"], name=f"net_post_{side}",
        )  # fmt: skip
    if singles:
        for y, side in zip((court.SINGLES_STICK_Y, -court.SINGLES_STICK_Y), ("left", "right"),
                           strict=True):  # fmt: skip
            plotter.add_mesh(
                pv.Cylinder(center=(0, y, court.NET_HEIGHT_POST / 2), direction=(0, 0, 1),
                            radius=0.03, height=court.NET_HEIGHT_POST),
                color=hexes["net_band"], name=f"singles_stick_{side}",
            )  # fmt: skip
        # the net beyond the singles sticks hangs at the sticks' height to the posts
        for sign, side in ((1.0, "left"), (-1.0, "right")):
            yy = sign * np.array([court.SINGLES_STICK_Y, court.POST_Y])
            sheet = _sheet(pv, yy, np.full(2, court.NET_HEIGHT_POST))
            plotter.add_mesh(sheet, color=hexes["net"], opacity=0.35, name=f"net_outer_{side}")


def _sheet(pv, ys, top):
    """A vertical sheet in the plane x = 0 from the ground up to ``top`` (one quad per step)."""
    n = len(ys)
    points = np.concatenate(
        [np.column_stack([np.zeros(n), ys, np.zeros(n)]), np.column_stack([np.zeros(n), ys, top])]
    )
    k = np.arange(n - 1)
    faces = np.column_stack([np.full(n - 1, 4), k, k + 1, n + k + 1, n + k]).ravel()
    return pv.PolyData(points, faces=faces)


def _events(result, i):
    """Event points of shot i: contact, net crossing, bounce, apex (court frame)."""
    m = result.metrics
    out = {"contact": result.incoming.position[i]}
    if np.isfinite(m["net_t_s"][i]):
        out["net"] = (0.0, m["net_y_m"][i], m["net_height_m"][i])
    if np.isfinite(m["land_x_m"][i]):
        out["land"] = (m["land_x_m"][i], m["land_y_m"][i], 0.0)
    if np.isfinite(m["bounce_apex_m"][i]) and np.isfinite(m["bounce_apex_x_m"][i]):
        # the apex's lateral position: on the path at the apex's x
        _, pos, _ = result.path(i, dt=0.004)
        after = pos[pos[:, 0] >= m["land_x_m"][i] - 1e-9] if "land" in out else pos
        if after.size:
            k = int(np.argmin(np.abs(after[:, 0] - m["bounce_apex_x_m"][i])))
            if abs(after[k, 0] - m["bounce_apex_x_m"][i]) < 0.2:
                out["apex"] = (m["bounce_apex_x_m"][i], after[k, 1], m["bounce_apex_m"][i])
    return {k: np.asarray(v, float) for k, v in out.items()}


def _marker(pv, kind, point, r):
    x, y, z = point
    if kind == "contact":
        return pv.Sphere(radius=2.2 * r, center=point)
    if kind == "net":
        return pv.Cube(center=point, x_length=3 * r, y_length=3 * r, z_length=3 * r)
    if kind == "land":
        return pv.Cylinder(center=(x, y, 0.01), direction=(0, 0, 1), radius=5 * r, height=0.02)
    return pv.Cone(center=(x, y, z + 2 * r), direction=(0, 0, -1), height=4 * r, radius=2 * r)


@dataclass(frozen=True)
class ScenePage:
    """What a scene shows beside its meshes: the title, the legend (label and colour of each
    stroke), the line that explains the markers, and the camera it opens with; the PNG draws
    them as text and the HTML page takes its title from here."""

    title: str
    legend: list
    markers: str
    start: str


def scene_page(result, camera="hitter"):
    """The :class:`ScenePage` of the scene of ``result`` seen from ``camera``."""
    c = result.conditions
    groups = variant_groups(result)
    order = [label for label, _, _ in groups]
    legend = [[display_label(label), palette.variant_colour(k)] for label, _, k in groups]
    markers = (
        " | ".join(MARKER_WORDS.values())
        if len(result) <= _MANY
        else f"thin tubes: {len(result)} scattered shots (up to {max(1, 60 // len(order))} drawn "
        "per stroke)"
    )
    title = f"{', '.join(display_label(x) for x in order)} on {c.surface_name}"
    title += "".join(f"; {m}" for m in c.modes)
    return ScenePage(title, legend, markers, camera)


def build_scene(result, camera="hitter", window_size=(1400, 860), off_screen=True, dt=0.004):
    """A pyvista Plotter showing the shots of ``result`` on the court.

    Parameters
    ----------
    result : rallyarc.shot.ShotResult
        Recorded shots (``record=True``).
    camera : str
        A key of :data:`CAMERAS`: ``hitter``, ``side``, ``receiver`` or ``overhead``.
    window_size : (width, height) in pixels.
    off_screen : bool
        Render without a window (for files); False for an interactive window.

    Returns
    -------
    pyvista.Plotter
    """
    if camera not in CAMERAS:
        raise ValueError(f"unknown camera {camera!r}; choose one of {', '.join(CAMERAS)}")
    _quiet_vtk()
    import pyvista as pv

    c = result.conditions
    r = c.ball.radius
    plotter = pv.Plotter(off_screen=off_screen, window_size=list(window_size))
    plotter.set_background("white")
    _court(pv, plotter, c.singles)
    _net(pv, plotter, c.singles)

    groups = variant_groups(result)
    many = len(result) > _MANY
    for label, idx, k in groups:
        colour = palette.variant_colour(k)
        for i in drawn(idx, many, limit=max(1, 60 // len(groups))):
            _, pos, _ = result.path(i, dt=dt)
            pos = pos[np.all(np.isfinite(pos), axis=1)]
            if len(pos) < 2:
                continue
            tube = pv.lines_from_points(pos).tube(
                radius=_TUBE_RADIUS * (0.45 if many else 1.0), n_sides=12
            )
            plotter.add_mesh(tube, color=colour, smooth_shading=True, ambient=0.25,
                             opacity=0.6 if many else 1, name=f"path_{label}_{i}")  # fmt: skip
            if many:
                continue
            for kind, point in _events(result, i).items():
                plotter.add_mesh(_marker(pv, kind, point, r), color=colour, smooth_shading=True,
                                 name=f"{kind}_{label}_{i}")  # fmt: skip
    page = scene_page(result, camera)
    height = min(0.4, 0.01 + 0.026 * len(page.legend))
    box = plotter.add_legend(labels=page.legend, bcolor="white", border=True,
                             size=(0.18, height), loc="upper right", face="rectangle")  # fmt: skip
    box.SetPosition(0.80, 0.975 - height)  # fixed corner: the box no longer shrinks to few rows
    box.SetPosition2(0.18, height)
    plotter.add_text(
        f"{c.surface_name}, ball {c.ball.name} - camera: {CAMERA_WORDS[camera]}",
        position="upper_left", font_size=11, color=palette.COURT_HEX["ink"],
    )  # fmt: skip
    plotter.add_text(
        page.markers, position="lower_left", font_size=10, color=palette.COURT_HEX["ink"]
    )
    position, focal, up = CAMERAS[camera]
    plotter.camera_position = [position, focal, up]
    plotter.camera.view_angle = 38.0 if camera != "overhead" else 34.0
    return plotter


_EXPORTS = {".gltf", ".html"}


def render_scene(
    result, png_path=None, export_path=None, camera="hitter", show=False, window_size=(1400, 860)
):
    """Render the scene to a PNG (off screen), export it as glTF, and/or open a window.

    Files are written atomically. Returns the PNG path if one was written, else the export's.
    """
    if export_path is not None and Path(export_path).suffix.lower() not in _EXPORTS:
        raise ValueError(f"{export_path}: scene exports are .gltf or .html files")
    if show and not has_display():
        raise ValueError("--show needs a display (none found: DISPLAY is not set)")
    written = None
    html = export_path is not None and Path(export_path).suffix.lower() == ".html"
    if html:
        # the page is the three.js view of the coach's report; it needs no pyvista scene
        from rallyarc.viz import webview

        text = webview.scene_page(result, scene_page(result, camera).title, camera)
        written = atomic_write(export_path, lambda tmp: Path(tmp).write_text(text, "utf-8"))
        export_path = None
    if png_path is not None or export_path is not None:
        plotter = build_scene(result, camera=camera, window_size=window_size)
        try:
            if png_path is not None:
                written = atomic_write(png_path, lambda tmp: plotter.screenshot(tmp))
            if export_path is not None:
                out = atomic_write(export_path, lambda tmp: _export_gltf(plotter, tmp))
                written = written or out
        finally:
            plotter.close()
    if show:
        plotter = build_scene(result, camera=camera, window_size=window_size, off_screen=False)
        plotter.show()
    return written


def _export_gltf(plotter, path):
    """glTF 2.0 with its buffers inline (.gltf)."""
    plotter.export_gltf(str(path), inline_data=True, save_normals=True)
    _tidy_gltf(path, _mesh_names(plotter))


def _mesh_names(plotter):
    """Names of the plotter's visible 3D actors, in the order the glTF exporter writes them."""
    from vtkmodules.vtkRenderingCore import vtkActor

    return [
        name
        for name, actor in plotter.renderer.actors.items()
        if isinstance(actor, vtkActor) and actor.GetVisibility()
    ]


def _tidy_gltf(path, names):
    """Name the glTF's meshes, nodes and materials after the scene's actors, and mark
    translucent materials (the net) as blended: the exporter leaves them opaque."""
    import json

    with open(path, encoding="utf-8") as fh:
        gltf = json.load(fh)
    meshes = gltf.get("meshes", [])
    if len(names) != len(meshes):  # not the actors we know: keep the order's own names
        names = [f"mesh_{k}" for k in range(len(meshes))]
    for mesh, name in zip(meshes, names, strict=True):
        mesh["name"] = name
        for prim in mesh.get("primitives", []):
            if "material" in prim:
                material = gltf["materials"][prim["material"]]
                material["name"] = f"{name}_material"
    for node in gltf.get("nodes", []):
        if "mesh" in node:
            node["name"] = meshes[node["mesh"]]["name"]
    for material in gltf.get("materials", []):
        colour = material.get("pbrMetallicRoughness", {}).get("baseColorFactor", [1, 1, 1, 1])
        if len(colour) == 4 and colour[3] < 1.0:
            material["alphaMode"] = "BLEND"
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(gltf, fh, allow_nan=False)  # strict JSON: glTF has no NaN
