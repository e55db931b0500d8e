"""The metrics registry is the one description of what the chain reports."""

from pathlib import Path

import numpy as np

from rallyarc import domain
from rallyarc.shot import METRICS, BallState, launch, play
from rallyarc.shot.metrics import BLOCKS, glossary_markdown

GUIDE = Path(__file__).resolve().parents[2] / "DEVELOPERS.md"


def _demo():
    sc = domain.load_scenario("demo")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    return sc, play(sc.strokes, sc.conditions, incoming)


def test_the_chain_reports_exactly_the_registered_metrics_in_registry_order():
    _, result = _demo()
    assert list(result.metrics) == list(METRICS)
    for key, values in result.metrics.items():
        assert np.shape(values) == (len(result),), key


def test_a_machine_launch_reports_the_registry_minus_the_racket_contact():
    sc, _ = _demo()
    start = BallState.of([-11.0, 0.0, 1.0], [25.0, 0.0, 4.0], [0.0, 150.0, 0.0])
    result = launch(start, sc.conditions)
    missing = [k for k in METRICS if k not in result.metrics]
    assert missing == [
        "impact_regime",
        "impact_slip_linear_mps",
        "impact_slip_spin_mps",
        "impact_slip_ratio",
        "impact_spin_limit_reached",
        "impact_spin_ratio_out",
    ]
    assert list(result.metrics) == [k for k in METRICS if k in result.metrics]


def test_keys_are_block_prefix_plus_field_and_carry_their_unit():
    suffix = {"m": "_m", "m/s": "_mps", "deg": "_deg", "rpm": "_rpm", "s": "_s"}
    for key, m in METRICS.items():
        assert key == BLOCKS[m.block] + m.field
        if m.unit in suffix:
            assert key.endswith(suffix[m.unit]), key
        assert m.label and m.meaning and "\n" not in m.meaning


def test_json_record_blocks_hold_the_registry_fields():
    _, result = _demo()
    record = result.record(0)
    for block in ("impact", "net_crossing", "landing", "bounce", "flight", "receiver"):
        fields = [m.field for m in METRICS.values() if m.block == block]
        assert list(record[block]) == fields, block
    assert record["outcome"] == result.metrics["outcome"][0]


def test_the_contributor_guide_glossary_is_the_registry():
    text = GUIDE.read_text(encoding="utf-8")
    start = text.index("<!-- metrics glossary: generated")
    body = text[text.index("\n", start) + 1 : text.index("<!-- end of metrics glossary -->")]
    assert body == glossary_markdown()


def test_a_result_has_a_short_repr():
    _, result = _demo()
    text = repr(result)
    assert len(text) < 200 and "6 shots" in text and "in 6" in text
