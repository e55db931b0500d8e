"""Every command's --json output validates against the shipped JSON Schema, which is the one the
metrics registry builds; no NaN or Infinity reaches an output."""

import json

import jsonschema
import pytest
from click.testing import CliRunner

from rallyarc.cli import main
from rallyarc.output.schema import build_schema, load_schema, schema_for

COMMANDS = {
    "shot": ["shot"],
    "shot_serve": ["shot", "--stroke", "kick_serve", "--scenario", "serve_demo"],
    "feed": ["feed", "--from", "-11,0,1", "--speed", "90km/h", "--elevation", "8"],
    "feed_net": ["feed", "--elevation", "2", "--spin", "0"],
    "feed_far": ["feed", "--from", "11,0,1", "--azimuth", "180", "--speed", "60km/h"],
    "compare": ["compare"],
    "compare_serves": ["compare", "serve_demo"],
    "aim_stroke": ["aim", "stroke", "--stroke", "topspin_drive", "--target", "10,2"],
    "aim_feed": ["aim", "feed", "--target", "-9,2", "--spin", "1500", "--height", "1.2"],
    "bounce": ["bounce", "--speed", "30", "--angle", "16", "--spin", "1200"],
    "surface": ["surface", "--preset", "grass"],
    "drill": ["drill"],
    "rally": ["rally", "demo_match", "--rallies", "5", "--seed", "1", "--quiet"],
    "presets": ["presets", "strokes"],
}


def _no_constant(name):
    raise ValueError(f"{name} in a JSON output")


def run_json(args):
    result = CliRunner().invoke(main, [*args, "--json"])
    assert result.exit_code == 0, result.output
    return json.loads(result.output, parse_constant=_no_constant)


def test_the_shipped_schema_is_the_registry_built_one():
    assert load_schema() == build_schema()
    jsonschema.Draft202012Validator.check_schema(load_schema())


@pytest.mark.parametrize("case", sorted(COMMANDS))
def test_command_json_validates_against_the_schema(case):
    command = case.split("_")[0] if case not in ("aim_stroke", "aim_feed") else case
    jsonschema.validate(run_json(COMMANDS[case]), schema_for(command))


def test_the_schema_refuses_a_field_outside_the_registry_and_radians():
    data = run_json(COMMANDS["shot"])
    data["bounce"]["kick_deg"] = 1.0
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(data, schema_for("shot"))
    data = run_json(COMMANDS["bounce"])
    data["inputs"]["elevation_rad"] = 0.1
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(data, schema_for("bounce"))
