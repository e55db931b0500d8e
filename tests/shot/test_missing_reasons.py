"""Every null of a shot record comes with its reason, and only nulls do."""

import numpy as np

from rallyarc import domain
from rallyarc.shot import BallState, launch, play


def _nulls(record):
    out = set()
    for name, values in record.items():
        if name in ("inputs", "outcome", "missing"):
            continue
        if values is None:
            out.add(name)
        else:
            out |= {f"{name}.{k}" for k, v in values.items() if v is None}
    return out


def test_each_null_has_a_reason_and_each_reason_a_null():
    sc = domain.load_scenario("demo")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    result = play(sc.strokes, sc.conditions, incoming)
    for i in range(len(result)):
        record = result.record(i)
        assert set(record["missing"]) == _nulls(record)
        assert all(isinstance(r, str) and r for r in record["missing"].values())


def test_a_ball_into_the_net_says_why_it_has_no_landing():
    sc = domain.load_scenario("demo")
    # low and flat from the baseline: into the net (a machine-like launch, no racket)
    start = BallState.of([-11.0, 0.0, 0.5], [25.0, 0.0, 2.5], np.zeros(3))
    record = launch(start, sc.conditions).record(0)
    assert record["outcome"] == "net" and record["landing"] is None
    assert "net" in record["missing"]["landing"]
    assert set(record["missing"]) == _nulls(record)
