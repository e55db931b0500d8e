"""Court geometry in the court frame (origin at the centre of the net line, x toward the far
baseline, y to the left seen from the near baseline, z up).

Dimensions from the ITF Rules of Tennis, Rule 1.
"""

from __future__ import annotations

import numpy as np

LENGTH = 23.77
HALF_LENGTH = LENGTH / 2.0
SINGLES_WIDTH = 8.23
DOUBLES_WIDTH = 10.97
SERVICE_LINE = 6.40
NET_HEIGHT_CENTRE = 0.914
NET_HEIGHT_POST = 1.07
#: Net posts and singles sticks stand 0.914 m outside the doubles and singles sidelines.
POST_Y = DOUBLES_WIDTH / 2.0 + 0.914
SINGLES_STICK_Y = SINGLES_WIDTH / 2.0 + 0.914


def net_height(y, singles=True):
    """Height of the top of the net at lateral position ``y`` [m].

    The cord sags from 1.07 m at the supports (singles sticks for singles, posts for doubles) to
    0.914 m at the centre; between them it is taken as a parabola in ``y`` (common practice: a
    cord under tension with a centre strap). Beyond the supports the height is that at the
    support.
    """
    support = SINGLES_STICK_Y if singles else POST_Y
    frac = np.minimum(np.abs(np.asarray(y, dtype=float)) / support, 1.0)
    return NET_HEIGHT_CENTRE + (NET_HEIGHT_POST - NET_HEIGHT_CENTRE) * frac**2


#: Width of the lines drawn [m] (ITF Rules of Tennis, Rule 1: 2.5 to 5 cm; the baselines up to
#: 10 cm), and the length of the centre mark into the court [m] (10 cm, same rule).
LINE_WIDTH = 0.05
CENTRE_MARK = 0.10


def line_segments():
    """The court's lines as ``(x0, y0, x1, y1)`` along their centres [m]: the doubles and
    singles sidelines, both baselines, both service lines, the centre service line and the two
    centre marks (which reach ``CENTRE_MARK`` into the court from each baseline)."""
    hl, hw, sw = HALF_LENGTH, DOUBLES_WIDTH / 2.0, SINGLES_WIDTH / 2.0
    out = [(-hl, y, hl, y) for y in (-hw, -sw, sw, hw)]
    out += [(x, -hw, x, hw) for x in (-hl, hl)]
    out += [(x, -sw, x, sw) for x in (-SERVICE_LINE, SERVICE_LINE)]
    out.append((-SERVICE_LINE, 0.0, SERVICE_LINE, 0.0))
    out += [(-hl, 0.0, -hl + CENTRE_MARK, 0.0), (hl - CENTRE_MARK, 0.0, hl, 0.0)]
    return out
