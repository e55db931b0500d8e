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
