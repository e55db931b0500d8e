"""The text table takes its row names and units from the metrics registry."""

from rallyarc.output import tables
from rallyarc.shot.metrics import METRICS


def test_every_table_row_is_a_registry_metric_named_by_the_registry():
    for _, rows in tables.SECTIONS:
        for key, unit, _ in rows:
            for k in key if isinstance(key, tuple) else (key,):
                if not k.startswith("swing:"):
                    assert k in METRICS
            if isinstance(key, str) and key in METRICS:
                assert tables.row_label(key, unit).startswith(METRICS[key].row)


def test_row_labels_carry_the_unit_shown():
    assert tables.row_label("impact_speed_mps", "km/h") == "ball speed [km/h]"
    assert tables.row_label("impact_slip_ratio") == "slip ratio"  # a pure number: no unit
    assert tables.row_label("outcome") == "outcome"
    pair = ("bounce_speed_in_mps", "bounce_speed_out_mps")
    assert tables.row_label(pair, "km/h") == "speed in/out [km/h]"
    assert tables.row_label("swing:face_tilt", "deg") == "face tilt [deg]"
