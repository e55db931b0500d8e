"""Drills: a sequence of machine-fed balls, each solved for its machine settings.

A drill file (TOML, ``configs/drills/`` or a path) names the machine, where it stands, the ball,
air and surface, and lists the balls: a target landing point, a spin setting and either a speed
or the height the ball must have at the player's contact plane. :func:`solve_drill` solves every
ball with :func:`rallyarc.aim.aim_feed` and returns the drill sheet as a table.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from rallyarc import config, domain
from rallyarc.aim import aim_feed, load_machine
from rallyarc.errors import InputError
from rallyarc.units import KMH, MPH, RPM

SAFETY = (
    "Safety: a ball machine can injure. Nobody stands in the machine's line of fire while it is "
    "loaded or running; the coach starts and stops it and begins at low feed speeds; wear eye "
    "protection where the coach judges it right; keep spare balls off the court. Follow the "
    "venue's rules and qualified coaching practice; these settings are a model's estimate, "
    "check them with slow feeds first."
)


@dataclass(frozen=True)
class Drill:
    name: str
    description: str
    coach: str
    club: str
    machine: object
    position: tuple
    conditions: object
    balls: tuple
    where: str = ""


def load_drill(name):
    data = config.load("drills", name)
    where = data["where"]

    def sub(loader, key):
        return config.referenced(data, key, loader)

    machine = sub(load_machine, "machine")
    conditions = domain.Conditions(
        ball=sub(domain.load_ball, "ball"),
        racket=domain.load_racket("standard"),  # unused by feeds; kept for a complete setup
        air=sub(domain.load_air, "air"),
        surface=sub(domain.load_surface, "surface"),
        surface_name=data["surface"],
        receiver_plane_m=data.get("player_plane_m", 1.0),
    )
    x, y = data["machine_position_m"]
    if abs(x) < 1.0:
        raise InputError(f"{where}: key 'machine_position_m' must stand at least 1 m from the net")
    for i, ball in enumerate(data["balls"]):
        tx = ball["target_m"][0]
        if tx * x >= 0:
            raise InputError(
                f"{where}: key 'balls[{i + 1}].target_m' must lie on the other side of the net "
                "from the machine"
            )
    return Drill(
        data["name"],
        data["description"],
        data["coach"],
        data["club"],
        machine,
        (x, y),
        conditions,
        tuple(data["balls"]),
        where,
    )


def solve_drill(drill):
    """Solve every ball of a drill; returns ``(sheet, results)``: the drill sheet as a pandas
    DataFrame (one row per ball, feed settings in coach units) and the AimResult of each ball
    mode ("speed" and "height") with the row numbers it covers."""
    import pandas as pd

    balls = drill.balls
    rows = [None] * len(balls)
    results = []
    for mode in ("speed_kmh", "height_at_player_m"):
        idx = [i for i, b in enumerate(balls) if mode in b]
        if not idx:
            continue
        tx = np.array([balls[i]["target_m"][0] for i in idx])
        ty = np.array([balls[i]["target_m"][1] for i in idx])
        spin = np.array([balls[i]["spin_rpm"] for i in idx])
        value = np.array([balls[i][mode] for i in idx])
        kwargs = {"speed": value * KMH} if mode == "speed_kmh" else {"player_height": value}
        aim = aim_feed(drill.machine, drill.position, drill.conditions, tx, ty, spin, **kwargs)
        results.append((idx, aim))
        land = aim.landing()
        m = aim.result.metrics
        s = aim.settings
        aim_left = s["azimuth"] - (math.pi if aim.mirrored else 0.0)
        aim_left = (aim_left + math.pi) % (2 * math.pi) - math.pi
        for j, i in enumerate(idx):
            rows[i] = {
                "ball": i + 1,
                "label": balls[i]["label"],
                "repeat": balls[i].get("repeat", 1),
                "speed_mps": s["speed"][j],
                "speed_kmh": s["speed"][j] / KMH,
                "speed_mph": s["speed"][j] / MPH,
                "elevation_deg": math.degrees(s["elevation"][j]),
                "aim_left_deg": math.degrees(aim_left[j]),
                "spin_rpm": s["topspin"][j] / RPM,
                "spin_kind": "topspin" if s["topspin"][j] >= 0 else "backspin",
                "target_x_m": tx[j],
                "target_y_m": ty[j],
                "land_x_m": land[j, 0],
                "land_y_m": land[j, 1],
                "miss_m": aim.miss_distance()[j],
                "net_clearance_m": m["net_clearance_m"][j],
                "bounce_apex_m": m["bounce_apex_m"][j],
                "height_at_player_m": m["receiver_height_m"][j],
                "time_to_player_s": m["receiver_t_s"][j],
                "player_before_bounce": bool(m["receiver_before_bounce"][j]),
                "outcome": str(m["outcome"][j]),
                "reachable": bool(aim.reachable[j]),
                "note": aim.reason[j],
            }
    return pd.DataFrame(rows), results


def sheet_lines(drill, sheet, units="kmh"):
    """The drill sheet as text lines for the terminal."""
    speed_col, speed_unit = ("speed_kmh", "km/h") if units == "kmh" else ("speed_mph", "mph")
    lines = [
        f"{drill.name}: {drill.coach}, {drill.club}",
        drill.description,
        f"machine {drill.machine.name} at x {drill.position[0]:+.1f} m, "
        f"y {drill.position[1]:+.1f} m, release {drill.machine.release_height:.2f} m; "
        f"surface {drill.conditions.surface_name}",
        "aim: horizontal angle from straight down the court, + to the machine's left; "
        "player: ball height at the player's contact plane (- where it bounces twice first); "
        "call: where the ball landed (in, net, long, wide, out)",
        "",
        f"{'#':>2} {'reps':>4} {'speed':>6} {'elev':>5} {'aim':>6} {'spin':>6} {'lands at':>13}"
        f" {'apex':>5} {'player':>6} {'time':>5} {'call':>4}  ball",
        f"{'':>2} {'':>4} {speed_unit:>6} {'deg':>5} {'L deg':>6} {'rpm':>6} {'x, y [m]':>13}"
        f" {'m':>5} {'m':>6} {'s':>5}",
    ]

    def num(value, fmt):
        return fmt.format(value) if np.isfinite(value) else "-"

    for row in sheet.itertuples():
        flag = "" if row.reachable else f"  NOT REACHABLE: {row.note}"
        landing = f"{row.land_x_m:+6.2f},{row.land_y_m:+6.2f}"
        lines.append(
            f"{row.ball:>2} {row.repeat:>4} {getattr(row, speed_col):6.1f} "
            f"{row.elevation_deg:5.1f} {row.aim_left_deg:+6.1f} {row.spin_rpm:+6.0f} "
            f"{landing:>13} {num(row.bounce_apex_m, '{:5.2f}'):>5} "
            f"{num(row.height_at_player_m, '{:6.2f}'):>6} {num(row.time_to_player_s, '{:5.2f}'):>5}"
            f" {row.outcome:>4}  {row.label}{flag}"
        )
    lines += ["", SAFETY]
    return lines


def drill_trajectories(results, step):
    """The trajectories of all balls of a drill in one table (a ``ball`` column from 1, in ball
    and time order), and each ball's path on the court (x, y) by ball number."""
    import numpy as np
    import pandas as pd

    frames, paths = [], {}
    for idx, aim_result in results:
        frame = aim_result.trajectory_frame(step)
        frame["ball"] = np.asarray(idx)[frame["shot"].to_numpy()] + 1
        frames.append(frame.drop(columns=["shot", "label"]))
        for i in idx:
            part = frame[frame["ball"] == i + 1]
            paths[i + 1] = part[["x_m", "y_m"]].to_numpy()
    table = pd.concat(frames).sort_values(["ball", "t_s"], kind="stable")
    table = table[["ball"] + [c for c in table.columns if c != "ball"]].reset_index(drop=True)
    return table, paths
