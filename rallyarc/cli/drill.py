"""``rallyarc drill``: every ball of a drill file solved, and its drill sheet printed or written."""

from __future__ import annotations

import click

from rallyarc.cli.options import (
    dt_option,
    emit,
    force_option,
    json_option,
    loaded,
    output_folder,
    time_step,
    write_folder,
)

#: Files ``drill --out`` writes.
DRILL_OUTPUTS = (
    "drill_sheet.csv",
    "drill_sheet.json",
    "drill_sheet.parquet",
    "drill_sheet.png",
    "drill_sheet.pdf",
    "trajectories.csv",
    "trajectories.parquet",
)


@click.command()
@click.argument("drill_file", default="demo_drill")
@click.option("--out", "out_dir", default=None, help="Write the drill sheet and trajectories here.")
@click.option(
    "--units",
    "speed_units",
    type=click.Choice(["kmh", "mph"]),
    default="kmh",
    show_default=True,
    help="Speed units on the sheet.",
)
@dt_option
@force_option("Overwrite existing files in --out.")
@json_option("Print the sheet as JSON.")
def drill(drill_file, out_dir, speed_units, dt, force, as_json):
    """Solve every ball of a drill file and print (or write) its drill sheet."""
    from rallyarc.drill import SAFETY, load_drill, sheet_lines, solve_drill

    d = loaded("DRILL_FILE", load_drill, drill_file)
    step = time_step(dt)
    folder = output_folder(out_dir, DRILL_OUTPUTS, force)
    sheet, results = solve_drill(d)
    lines = sheet_lines(d, sheet, speed_units)
    records = sheet.astype(object).where(sheet.notna(), None).to_dict(orient="records")
    data = {"drill": d.name, "coach": d.coach, "club": d.club, "safety": SAFETY, "balls": records}
    if folder is not None:
        written = write_folder(
            folder, lambda f: _write_drill(d, sheet, results, data, f, step, speed_units)
        )
        lines.append("written: " + ", ".join(str(p) for p in written))
    emit(data, as_json, lines)


def _write_drill(d, sheet, results, data, folder, step, speed_units):
    from rallyarc.drill import SAFETY, drill_trajectories
    from rallyarc.output import export
    from rallyarc.viz.drill_sheet import drill_sheet

    table, paths = drill_trajectories(results, step)
    fig = drill_sheet(d, sheet, paths, SAFETY, speed_units)
    written = [
        export.write_frame(folder / "drill_sheet.csv", sheet),
        export.write_json(folder / "drill_sheet.json", data),
        export.write_frame(folder / "drill_sheet.parquet", sheet),
        export.atomic_write(
            folder / "drill_sheet.png", lambda tmp: fig.savefig(tmp, format="png", dpi=110)
        ),
        export.atomic_write(folder / "drill_sheet.pdf", lambda tmp: fig.savefig(tmp, format="pdf")),
        export.write_frame(folder / "trajectories.csv", table),
        export.write_frame(folder / "trajectories.parquet", table),
    ]
    return written
