"""One chunk of a study: its shots or rallies played, as the bytes of one Parquet file.

A chunk depends on the study and its index only (its design points and its random stream come
from the study seed), so any worker, local or remote, gives the same bytes. Non-finite numbers
are stored as nulls, never NaN.
"""

from __future__ import annotations

import numpy as np

from rallyarc.study.spec import chunk_stream, design_values


def chunk_points(study, k):
    """Design points ``(start, stop)`` of chunk ``k`` (a rally chunk plays one point)."""
    if study.kind == "rallies":
        v = k // study.blocks
        return v, v + 1
    return k * study.chunk, min((k + 1) * study.chunk, study.points)


def play_chunk(study, k):
    """Chunk ``k`` of ``study``: ``(k, Parquet bytes, rows)``."""
    columns = _rally_chunk(study, k) if study.kind == "rallies" else _shot_chunk(study, k)
    return k, to_parquet(columns), len(columns["chunk"])


def _shot_chunk(study, k):
    from rallyarc.shot import BallState, play

    start, stop = chunk_points(study, k)
    values = design_values(study, start, stop)
    stroke, conditions, incoming = study.base
    n = stop - start
    swing = {}
    speed = spin = None
    for p in study.parameters:
        si = values[p.column] * p.scale
        if p.family == "swing":
            swing[p.name] = si
        elif p.name == "incoming_speed":
            speed = si
        else:
            spin = si
    state = None
    if incoming is not None:
        state = _incoming(BallState.of(*incoming, n), speed, spin)
    if not swing:
        swing = {"head_speed": np.full(n, stroke.head_speed)}
    res = play([stroke], conditions, state, record=False, **swing)
    out = {"point": np.arange(start, stop, dtype=np.int64), "chunk": np.full(n, k, np.int64)}
    out.update(values)
    for key, value in res.metrics.items():
        out[key] = value.astype(str) if value.dtype.kind == "U" else value
    return out


def _incoming(state, speed, topspin):
    """Incoming balls with their speed (same travel) and topspin (about the horizontal axis
    across their travel, any other spin kept) replaced where given [SI]."""
    vel, spin = state.velocity.copy(), state.spin.copy()
    if speed is not None:
        norm = np.linalg.norm(vel, axis=1, keepdims=True)
        vel = vel / np.where(norm > 0, norm, 1.0) * speed[:, None]
    if topspin is not None:
        h = vel[:, :2]
        norm = np.linalg.norm(h, axis=1, keepdims=True)
        d = np.where(norm > 0, h / np.where(norm > 0, norm, 1.0), [1.0, 0.0])
        axis = np.stack((-d[:, 1], d[:, 0], np.zeros(len(d))), axis=1)
        along = np.einsum("ij,ij->i", spin, axis)
        spin = spin + (topspin - along)[:, None] * axis
    return type(state)(state.position.copy(), vel, spin)


def _rally_chunk(study, k):
    from rallyarc.rally.patterns import with_scatter
    from rallyarc.rally.rounds import play_block

    patterns, limit = study.base
    v = k // study.blocks
    start = (k % study.blocks) * study.chunk
    values = design_values(study, v, v + 1)
    variant = patterns
    for p in study.parameters:
        if p.name == "scatter":
            variant = with_scatter(variant, float(values[p.column][0]))
    shots, rallies = play_block(
        variant, start, study.chunk_size(k), chunk_stream(study, k), limit, _none
    )
    ends = rallies.set_index("rally")[["shots", "ending", "winner"]]
    table = shots.join(ends.rename(columns={"shots": "rally_shots"}), on="rally")
    n = len(table)
    out = {"variant": np.full(n, v, np.int64), "chunk": np.full(n, k, np.int64)}
    out.update({c: np.full(n, values[c][0]) for c in values})
    for col in table.columns:
        out[col] = table[col].to_numpy()
    return out


def _none(_count):
    pass


def to_parquet(columns):
    """Columns as the bytes of a Parquet file; NaN and infinities become nulls."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    arrays = {}
    for key, value in columns.items():
        value = np.asarray(value)
        if value.dtype.kind == "f":
            arrays[key] = pa.array(value, mask=~np.isfinite(value))
        elif value.dtype.kind in "OU":
            arrays[key] = pa.array(value.astype(str).tolist(), type=pa.string())
        else:
            arrays[key] = pa.array(value)
    sink = pa.BufferOutputStream()
    pq.write_table(pa.table(arrays), sink, compression="zstd")
    return sink.getvalue().to_pybytes()
