"""The line call: margins and the call of landings of balls hit from the near end toward +x.

Ball-on-line rule: the ball's first touch of the court is modelled as a point directly below its
centre at the moment the centre is one radius above the court (no footprint, no skid mark). A
ball whose touch point lies on a line or inside it is in; the outer edge of each line is the
court's boundary (ITF Rules of Tennis, Rule 1). Margins are reported so that a shot within a
few centimetres of a line can be judged with that in mind.
"""

from __future__ import annotations

import numpy as np

from rallyarc import court


def judge_landing(land_x, land_y, contact_y, serve, singles=True):
    """Margins and the line call of landings of balls hit from the near end toward +x.

    A ball is in when its touch point (below its centre) lies on or inside the lines, whose
    outer edges bound the court (ITF Rules of Tennis, Rule 1). A serve must land in the
    service box diagonally opposite: the deuce box (y >= 0) from a contact at y < 0, the ad box
    otherwise. Returns ``land_depth_m``, ``land_side_margin_m``, ``land_service_box``,
    ``land_box_depth_m``, ``land_box_side_margin_m`` and ``land_call`` (in, long, wide or out
    for long and wide), each ``(N,)``.
    """
    land_x, land_y = np.asarray(land_x, float), np.asarray(land_y, float)
    serve = np.broadcast_to(np.asarray(serve, bool), land_x.shape)
    half_width = (court.SINGLES_WIDTH if singles else court.DOUBLES_WIDTH) / 2.0
    depth = court.HALF_LENGTH - land_x
    side = half_width - np.abs(land_y)
    box_y = np.where(np.asarray(contact_y) < 0, 1.0, -1.0)  # the target box's side of y
    box_depth = court.SERVICE_LINE - land_x
    box_side = np.minimum(court.SINGLES_WIDTH / 2.0 - box_y * land_y, box_y * land_y)
    depth_ok = np.where(serve, box_depth >= 0, depth >= 0)
    side_ok = np.where(serve, box_side >= 0, side >= 0)
    call = np.select(
        [depth_ok & side_ok, ~depth_ok & side_ok, depth_ok & ~side_ok],
        ["in", "long", "wide"],
        "out",
    )
    return {
        "land_depth_m": depth,
        "land_side_margin_m": side,
        "land_service_box": np.where(serve, np.where(box_y > 0, "deuce", "ad"), ""),
        "land_box_depth_m": np.where(serve, box_depth, np.nan),
        "land_box_side_margin_m": np.where(serve, box_side, np.nan),
        "land_call": call,
    }
