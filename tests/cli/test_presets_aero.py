"""``rallyarc presets`` lists each aerodynamic model with its source and range of validity."""

import json

from click.testing import CliRunner

from rallyarc.cli import main
from rallyarc.flight.aero import AERO_MODELS


def run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_every_aero_model_names_its_source_and_range():
    result = run("presets", "aero")
    assert result.exit_code == 0
    for name, model in AERO_MODELS.items():
        assert name in result.output
        assert model.source in result.output
        assert f"range of validity: {model.validity}" in result.output


def test_aero_models_in_json_and_in_the_full_listing():
    data = json.loads(run("presets", "aero", "--json").output)
    assert set(data["aero"]) == set(AERO_MODELS)
    assert all(item["source"] and item["validity"] for item in data["aero"].values())
    assert "aero:" in run("presets").output
