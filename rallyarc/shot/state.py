"""What enters the chain: N balls (:class:`BallState`) and N swings (:class:`Swing`), in SI."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc.units import RPM


@dataclass(frozen=True)
class BallState:
    """N balls: centre position [m], velocity [m/s] and spin [rad/s], each ``(N, 3)``."""

    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray

    @classmethod
    def of(cls, position, velocity, spin, n=None):
        arrays = [np.atleast_2d(np.asarray(a, float)) for a in (position, velocity, spin)]
        n = n or max(a.shape[0] for a in arrays)
        return cls(*(np.array(np.broadcast_to(a, (n, 3))) for a in arrays))

    def __len__(self):
        return self.position.shape[0]


@dataclass(frozen=True)
class Swing:
    """N swings in SI (see :class:`rallyarc.domain.Stroke`), each field ``(N,)``."""

    head_speed: np.ndarray
    swing_path: np.ndarray
    swing_direction: np.ndarray
    face_tilt: np.ndarray
    face_azimuth: np.ndarray
    racket_roll: np.ndarray
    impact_from_butt: np.ndarray
    impact_offaxis: np.ndarray

    FIELDS = (
        "head_speed",
        "swing_path",
        "swing_direction",
        "face_tilt",
        "face_azimuth",
        "racket_roll",
        "impact_from_butt",
        "impact_offaxis",
    )

    @classmethod
    def from_strokes(cls, strokes, n=None, **overrides):
        """Stack strokes (or repeat one) into a batch; ``overrides`` set fields to arrays."""
        strokes = list(strokes)
        values = {f: np.array([getattr(s, f) for s in strokes], float) for f in cls.FIELDS}
        n = n or max([len(strokes)] + [np.size(v) for v in overrides.values()])
        for key, value in overrides.items():
            if key not in cls.FIELDS:
                raise ValueError(f"unknown swing field {key!r}")
            values[key] = np.asarray(value, float)
        return cls(**{f: np.array(np.broadcast_to(values[f], (n,))) for f in cls.FIELDS})

    def __len__(self):
        return self.head_speed.shape[0]


def serve_states(strokes):
    """The toss of each serve as the incoming ball at contact."""
    pos = np.array([s.toss.contact for s in strokes], float)
    vel = np.array([s.toss.velocity() for s in strokes], float)
    spin = np.array([[0.0, s.toss.spin_rpm * RPM, 0.0] for s in strokes], float)
    return BallState(pos, vel, spin)
