"""A coach's page: one self-contained HTML file per scenario.

:func:`report_page` lays out what the command line computed: the scenario's story (player,
incoming ball, court, ball and air), the comparison table with one row per stroke, the side and
top views and a sweep and a success window of the main stroke as inline SVG, the 3D view
(:mod:`viz.webview`) and, when a drill is given, its drill sheet with the safety caution. The
page fetches nothing: figures, styles, scripts and three.js are all inside it. It reads on a
phone (one column, the table scrolls sideways) and prints on A4 or letter paper.

Nothing here computes physics; the numbers are the results' own, formatted as the text tables
format them (:mod:`rallyarc.output.tables`); a missing value is shown ``-``.
"""

from __future__ import annotations

import html
import io
import re
from dataclasses import dataclass

from rallyarc.output import tables
from rallyarc.viz import palette, webview
from rallyarc.viz.common import display_label, variant_groups


@dataclass(frozen=True)
class SweepPart:
    """A sweep of the main stroke: its result, the swept values (display units), the axis
    label and the stroke's own value (or None)."""

    result: object
    values: object
    label: str
    nominal: float | None


@dataclass(frozen=True)
class DrillPart:
    """A drill with its solved sheet, each ball's court path and the safety caution."""

    drill: object
    sheet: object
    paths: dict
    safety: str


def svg(fig, name):
    """A matplotlib figure as inline SVG text (text kept as text, ids unique to ``name``); the
    figure is freed afterwards."""
    import matplotlib

    buf = io.StringIO()
    try:
        with matplotlib.rc_context({"svg.fonttype": "none", "svg.hashsalt": name}):
            fig.savefig(buf, format="svg", metadata={"Date": None})
    finally:
        fig.clear()
    text = buf.getvalue()
    text = text[text.index("<svg") :]
    # scale with the page: drop the fixed size, keep the viewBox
    text = re.sub(r'<svg([^>]*?) width="[^"]*" height="[^"]*"', r"<svg\1", text, count=1)
    return text.replace("<svg", f'<svg role="img" aria-label="{html.escape(name)}"', 1)


def _row(label, value):
    return f"<tr><th>{html.escape(label)}</th><td>{html.escape(str(value))}</td></tr>"


def _incoming_rows(incoming):
    if not incoming:
        return [_row("incoming ball", "none: serves, each from its own toss")]
    words = {
        "position_m": ("contact point x, y, z [m]", lambda v: ", ".join(f"{c:g}" for c in v)),
        "speed_kmh": ("speed [km/h]", "{:g}".format),
        "descent_deg": ("descending at [deg]", "{:g}".format),
        "azimuth_deg": ("heading [deg]", "{:g}".format),
        "spin_rpm": ("topspin [rpm]", "{:g}".format),
    }
    out = []
    for key, value in incoming.items():
        label, fmt = words.get(key, (key.replace("_", " "), str))
        try:
            out.append(_row(label, fmt(value)))
        except (TypeError, ValueError):
            out.append(_row(label, value))
    return out


def story_html(sc):
    """The scenario's story: who plays, the incoming ball, the court, the ball and the air."""
    c = sc.conditions
    court_rows = [
        _row("surface", c.surface_name),
        _row("court", "singles" if c.singles else "doubles"),
        _row("receiver's plane behind the far baseline [m]", f"{c.receiver_plane_m:g}"),
        _row("bounce", "deforming ball" if c.deforming_ball else "rigid ball"),
    ]
    ball_rows = [
        _row("ball", c.ball.name),
        _row("diameter [mm]", f"{2000 * c.ball.radius:.1f}"),
        _row("mass [g]", f"{1000 * c.ball.mass:.1f}"),
        _row("racket", c.racket.name),
        _row("strings", "friction alone" if c.friction_only else "friction and spring-back"),
        _row("air", c.air.name),
        _row("air density [kg/m^3]", f"{c.air.density:.3f}"),
    ]
    strokes = ", ".join(display_label(s.name) for s in sc.strokes)
    blocks = [
        ("Player", [_row("player", sc.player), _row("club", sc.club), _row("strokes", strokes)]),
        ("Incoming ball", _incoming_rows(sc.incoming)),
        ("Court", court_rows),
        ("Ball and air", ball_rows),
    ]
    cards = "".join(
        f'<div class="card"><h3>{html.escape(h)}</h3>'
        f'<table class="facts">{"".join(r)}</table></div>'
        for h, r in blocks
    )
    return f'<p class="lede">{html.escape(sc.description)}</p><div class="cards">{cards}</div>'


def table_html(result):
    """The comparison table, one row per stroke and one column per quantity, grouped by the
    text table's sections."""
    n = len(result)
    colours = {lab: palette.variant_colour(k) for lab, _, k in variant_groups(result)}
    top = ['<th rowspan="2" class="stroke">stroke</th>']
    names = []
    for heading, rows in tables.SECTIONS:
        top.append(f'<th colspan="{len(rows)}" class="section">{html.escape(heading)}</th>')
        names += [f"<th>{html.escape(tables.row_label(k, u))}</th>" for k, u, _ in rows]
    body = []
    for i in range(n):
        label = str(result.labels[i])
        cells = []
        for _, rows in tables.SECTIONS:
            for key, unit, fmt in rows:
                scale = tables.display_scale(key, unit)
                cells.append(f"<td>{html.escape(tables.cell(result, key, i, scale, fmt))}</td>")
        swatch = f'<span class="swatch" style="background:{colours[label]}"></span>'
        body.append(
            f'<tr data-stroke="{html.escape(label)}"><th class="stroke">{swatch}'
            f"{html.escape(display_label(label))}</th>{''.join(cells)}</tr>"
        )
    return (
        '<div class="scroll"><table class="compare">'
        f"<thead><tr>{''.join(top)}</tr><tr>{''.join(names)}</tr></thead>"
        f"<tbody>{''.join(body)}</tbody></table></div>"
    )


def _figure(svg_text, caption, wide=False):
    caption = html.escape(caption)
    kind = "plot wide" if wide else "plot"
    return (
        f'<figure class="{kind}"><div class="art">{svg_text}</div>'
        f"<figcaption>{caption}</figcaption></figure>"
    )


def _section(ident, title, body):
    return f'<section id="{ident}"><h2>{html.escape(title)}</h2>{body}</section>'


def _parts(sc, result, scene_result, sweep, window, drill, caution):
    from rallyarc.viz import plots

    main = display_label(result.labels[0])
    parts = [_section("story", "The scenario", story_html(sc))]
    if sc.incoming and caution:
        parts.append(f'<p class="caution"><b>Feeding this ball.</b> {html.escape(caution)}</p>')
    parts.append(_section("table", "The strokes side by side", table_html(result)))
    views = _figure(
        svg(plots.side_view(result), "side view"),
        "Side view: height against distance down the court.",
        wide=True,
    ) + _figure(
        svg(plots.top_view(result), "top view"),
        "Top view: paths and landings from above.",
        wide=True,
    )
    parts.append(_section("views", "Side and top views", f'<div class="pair">{views}</div>'))
    if sweep is not None or window is not None:
        body = ""
        if sweep is not None:
            fig = plots.sweep_plot(sweep.result, sweep.values, sweep.label, nominal=sweep.nominal)
            body += _figure(svg(fig, "sweep"), f"{main}: what {sweep.label} changes.")
        if window is not None:
            share = f"{100 * window.fraction_in():.0f} % of the grid lands in."
            body += _figure(svg(plots.window_plot(window), "window"), f"{main}: {share}")
        body = f'<div class="pair">{body}</div>'
        parts.append(_section("main", f"The main stroke: {main}", body))
    view = webview.viewer_html(webview.scene_data(scene_result or result))
    parts.append(_section("scene", "In 3D", view))
    if drill is not None:
        from rallyarc.viz.drill_sheet import drill_sheet

        fig = drill_sheet(drill.drill, drill.sheet, drill.paths, drill.safety)
        body = (
            f'<p class="caution">{html.escape(drill.safety)}</p>'
            f'<figure class="plot sheet">{svg(fig, "drill sheet")}</figure>'
        )
        parts.append(_section("drill", f"Drill: {drill.drill.name}", body))
    return parts


def report_page(sc, result, scene_result=None, sweep=None, window=None, drill=None,
                caution=None):  # fmt: skip
    """The HTML text of the report.

    Parameters
    ----------
    sc : rallyarc.domain.Scenario
    result : rallyarc.shot.ShotResult, one shot per stroke (the table and the 2D views).
    scene_result : ShotResult shown in 3D (e.g. scattered shots); default ``result``.
    sweep : SweepPart or None
    window : rallyarc.window.Window of the main stroke, or None.
    drill : DrillPart or None
    caution : the safety caution shown by the incoming ball, for whoever feeds it.
    """
    parts = _parts(sc, result, scene_result, sweep, window, drill, caution)
    css = webview.asset("web", "report.css") + webview.viewer_css()
    title = f"{sc.name}: {sc.player}"
    nav = "".join(
        f'<a href="#{a}">{w}</a>'
        for a, w in (("story", "scenario"), ("table", "table"), ("views", "views"),
                     ("main", "main stroke"), ("scene", "3D"))
    )  # fmt: skip
    if drill is not None:
        nav += '<a href="#drill">drill</a>'
    return f"""<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>{html.escape(title)}</title>
<style>{css}</style>
</head>
<body class="report">
<header><h1>{html.escape(sc.name)}</h1>
<p class="who">{html.escape(sc.player)}, {html.escape(sc.club)}</p>
<nav>{nav}</nav></header>
<main>
{"".join(parts)}
</main>
<footer>Made by rallyarc from the physics of impact, flight and bounce: a model's estimate for
coaching, not a measurement. Invented names in the demo data.</footer>
</body>
</html>
"""
