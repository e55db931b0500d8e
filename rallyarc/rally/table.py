"""The tables of a rally run: one row per shot and one row per rally.

Units are in the column names; positions are in the court frame (the far player's shots are
turned back from their chain frame, :func:`rallyarc.rally.frames.court_factor`). Each shot row
also keeps the exact chain inputs in the hitter's own frame (``chain_pos_x`` ...), so that
:func:`incoming_of` and :func:`swing_of` replay any shot through :func:`rallyarc.shot.simulate`.
"""

from __future__ import annotations

import numpy as np

from rallyarc import court
from rallyarc.rally.frames import contact_side, court_factor
from rallyarc.shot import BallState, Swing, topspin_sidespin
from rallyarc.units import KMH, RPM


def _who(turn, played):
    """Rally, shot, hitter, serve and shot type."""
    n = turn.rallies.size
    serve = turn.kind != ""
    return {
        "rally": turn.rallies,
        "shot": turn.shot,
        "player": np.full(n, turn.player.name, dtype=object),
        "end": np.full(n, turn.player.end, dtype=object),
        "serve": turn.kind.astype(str),
        "serve_side": np.where(serve, turn.side, ""),
        "shot_type": played.result.labels.astype(object),
        "stroke": np.array([s.stroke_name for s in turn.entries], dtype=object)[turn.entry_of],
    }


def _contact(turn, flip):
    """Where and how the hitter met the ball, and the incoming ball."""
    pl, ball = turn.player, turn.ball
    serve = turn.kind != ""
    p_c = ball.position * flip
    body = turn.body * flip[:2]
    z = ball.position[:, 2]
    top_in, side_in = topspin_sidespin(ball.velocity, ball.spin)
    return {
        "contact_x_m": p_c[:, 0],
        "contact_y_m": p_c[:, 1],
        "contact_height_m": z,
        "contact_behind_baseline_m": -ball.position[:, 0] - court.HALF_LENGTH,
        "contact_phase": turn.phase.astype(str),
        "hitter_x_m": body[:, 0],
        "hitter_y_m": body[:, 1],
        "contact_stretch": turn.stretch,
        "under_pressure": turn.pressed,
        "contact_side": np.where(serve, "", contact_side(ball.position[:, 1], pl)),
        "above_shoulder": ~serve & (z > pl.shoulder_height),
        "in_preferred_band": ~serve & (z >= pl.contact_band[0]) & (z <= pl.contact_band[1]),
        "incoming_speed_mps": np.linalg.norm(ball.velocity, axis=1),
        "incoming_speed_kmh": np.linalg.norm(ball.velocity, axis=1) / KMH,
        "incoming_topspin_rpm": top_in / RPM,
        "incoming_sidespin_rpm": side_in / RPM,
        "incoming_spin_rpm": np.linalg.norm(ball.spin, axis=1) / RPM,
    }


def _outgoing_and_aim(turn, played, flip):
    """The ball off the racket, and the intended and scattered aim points."""
    m = played.result.metrics
    intended = turn.intended * flip[:2]
    aimed = turn.aimed * flip[:2]
    return {
        "outgoing_speed_mps": m["impact_speed_mps"],
        "outgoing_speed_kmh": m["impact_speed_mps"] / KMH,
        "outgoing_topspin_rpm": m["impact_topspin_rpm"],
        "outgoing_sidespin_rpm": m["impact_sidespin_rpm"],
        "outgoing_spin_rpm": m["impact_spin_rpm"],
        "launch_deg": m["impact_launch_deg"],
        "intended_x_m": intended[:, 0],
        "intended_y_m": intended[:, 1],
        "aim_x_m": aimed[:, 0],
        "aim_y_m": aimed[:, 1],
        "aim_solved": turn.reachable,
    }


def _landing_and_result(played, flip):
    """The flight over the net, the landing, the result and where the receiver met the ball."""
    m, contact = played.result.metrics, played.contact
    # the table gives a landing only to a ball that passes the net: none for one stopped by
    # it, or one that touches down on the hitter's own side (the chain keeps that touch)
    stopped = np.isin(m["outcome"], ("net", "miss"))
    land = np.stack([m["land_x_m"], m["land_y_m"]], axis=1) * flip[:2]
    land[stopped] = np.nan
    n = stopped.size
    next_h = np.full(n, np.nan)
    next_t = np.full(n, np.nan)
    li = np.flatnonzero(played.landed_in)
    next_h[li] = np.where(contact.found, contact.position[:, 2], np.nan)
    next_t[li] = np.where(contact.found, contact.t, np.nan)
    return {
        "net_clearance_m": m["net_clearance_m"],
        "land_x_m": land[:, 0],
        "land_y_m": land[:, 1],
        "land_depth_m": np.where(stopped, np.nan, m["land_depth_m"]),
        "land_side_margin_m": np.where(stopped, np.nan, m["land_side_margin_m"]),
        "bounce_apex_m": m["bounce_apex_m"],
        "outcome": m["outcome"].astype(str),
        "result": played.outcome.astype(str),
        "unreached_reason": played.unreached_reason.astype(str),
        "reply_height_m": next_h,
        "reply_t_s": next_t,
    }


def _swing(swing):
    """The swing as played (after the execution scatter)."""
    return {
        "head_speed_mps": swing.head_speed,
        "head_speed_kmh": swing.head_speed / KMH,
        "swing_path_deg": np.degrees(swing.swing_path),
        "swing_direction_deg": np.degrees(swing.swing_direction),
        "face_tilt_deg": np.degrees(swing.face_tilt),
        "face_azimuth_deg": np.degrees(swing.face_azimuth),
        "racket_roll_deg": np.degrees(swing.racket_roll),
        "impact_from_butt_m": swing.impact_from_butt,
        "impact_offaxis_m": swing.impact_offaxis,
    }


def _chain_inputs(ball):
    """The exact chain inputs in the hitter's own frame (SI), for replaying a shot."""
    row = {}
    for name, arr in (("pos", ball.position), ("vel", ball.velocity), ("spin", ball.spin)):
        for c, axis in enumerate("xyz"):
            row[f"chain_{name}_{axis}"] = arr[:, c]
    return row


def shot_rows(turn, played):
    """One round's rows for one hitter (columns of arrays); positions in the court frame.

    ``turn`` is the hitter's plan of the round and ``played`` its shots as played
    (:class:`rallyarc.rally.state.Turn` and :class:`rallyarc.rally.state.Played`).
    """
    flip = court_factor(turn.end)
    return (
        _who(turn, played)
        | _contact(turn, flip)
        | _outgoing_and_aim(turn, played, flip)
        | _landing_and_result(played, flip)
        | _swing(played.swing)
        | _chain_inputs(turn.ball)
    )


def shot_table(rows, start):
    """The per-shot table of a block from its rounds' rows: sorted by rally and shot, rallies
    numbered from ``start``, each rally ball's ``replying_to`` the shot type it answers."""
    import pandas as pd

    # one frame from each column's arrays joined (rounds hold the same columns, in order),
    # sorted by rally and shot before the frame is made (a stable sort, as the frame's own)
    columns = {key: np.concatenate([r[key] for r in rows]) for key in rows[0]}
    order = np.lexsort((columns["shot"], columns["rally"]))
    columns = {key: value[order] for key, value in columns.items()}
    columns["rally"] = columns["rally"] + start
    # each rally ball answers the shot before it in its rally
    kind, rally = columns["shot_type"], columns["rally"]
    previous = np.where(np.r_[False, rally[1:] == rally[:-1]], np.r_[kind[:1], kind[:-1]], "")
    replying = np.where(columns["serve"] == "", previous, "").astype(object)
    keys = list(columns)
    first, rest = keys[:7], keys[7:]
    columns = (
        {k: columns[k] for k in first} | {"replying_to": replying} | {k: columns[k] for k in rest}
    )
    return pd.DataFrame(columns)


def rally_table(state, players, shots):
    """The per-rally table of a block: server, side, length in shots, ending and winner."""
    import pandas as pd

    names = np.array([p.name for p in players], dtype=object)
    length = shots.groupby("rally")["shot"].max().reindex(state.rally).to_numpy()
    return pd.DataFrame(
        {
            "rally": state.rally,
            "server": names[state.server],
            "side": state.side,
            "shots": length,
            "ending": state.ending.astype(str),
            "winner": np.where(state.winner >= 0, names[np.maximum(state.winner, 0)], ""),
        }
    )


def swing_of(frame):
    """The swings of rows of a shot table (SI), to replay shots through the chain."""
    return Swing(
        head_speed=frame["head_speed_kmh"].to_numpy() * KMH,
        swing_path=np.radians(frame["swing_path_deg"].to_numpy()),
        swing_direction=np.radians(frame["swing_direction_deg"].to_numpy()),
        face_tilt=np.radians(frame["face_tilt_deg"].to_numpy()),
        face_azimuth=np.radians(frame["face_azimuth_deg"].to_numpy()),
        racket_roll=np.radians(frame["racket_roll_deg"].to_numpy()),
        impact_from_butt=frame["impact_from_butt_m"].to_numpy(),
        impact_offaxis=frame["impact_offaxis_m"].to_numpy(),
    )


def incoming_of(frame):
    """The incoming balls of rows of a shot table in their hitters' chain frames (SI)."""
    cols = {n: frame[[f"chain_{n}_{a}" for a in "xyz"]].to_numpy() for n in ("pos", "vel", "spin")}
    return BallState(cols["pos"], cols["vel"], cols["spin"])
