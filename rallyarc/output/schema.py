"""The JSON Schema of every command's ``--json`` output, built from the metrics registry.

A shot's record (``shot``, ``feed``, each of ``compare``'s shots, ``aim stroke``'s shot) has
one block per stage whose fields are the registry's (:mod:`rallyarc.shot.metrics`): no other
field, and each number finite or null. Every key of every output is lower snake case and ends
in its unit (the rule in DEVELOPERS.md, "Output vocabulary").

The schema ships as ``rallyarc/output/schema.json`` (package data); regenerate it with
``python -m rallyarc.output.schema > rallyarc/output/schema.json``. A test keeps the file equal
to :func:`build_schema` and validates every command's output against it.
"""

from __future__ import annotations

import json
from importlib import resources

from rallyarc.shot.metrics import BLOCKS, block_fields

__all__ = ["OUTCOMES", "build_schema", "load_schema", "schema_for", "COMMANDS"]

#: Every outcome a shot can have (as :data:`rallyarc.shot.OUTCOMES`).
OUTCOMES = ("in", "net", "long", "wide", "out", "miss")
#: Units a key must not end in: outputs give angles in degrees and spins in rpm.
FORBIDDEN_SUFFIXES = ("_rad", "_radps", "_kph")
_KEY = {
    "type": "string",
    "pattern": "^[a-z][a-z0-9_]*$",
    "not": {"pattern": "(" + "|".join(FORBIDDEN_SUFFIXES) + ")$"},
}
_NUMBER = {"type": ["number", "null"]}
_POINT = {"type": "array", "items": {"type": "number"}}

#: Extra fields of ``bounce --json``'s bounce block beyond the registry's.
_BOUNCE_COMMAND_EXTRA = {"vx_out_mps": _NUMBER, "vz_out_mps": _NUMBER}


def _value(metric):
    if metric.unit == "yes/no":
        return {"type": "boolean"}
    if metric.unit == "text":
        return {"type": "string"}
    return _NUMBER


def _block(name, extra=None, only=None):
    fields = {m.field: _value(m) for m in block_fields(name) if only is None or m.field in only}
    fields.update(extra or {})
    return {"type": "object", "properties": fields, "additionalProperties": False}


def _nullable(schema):
    return {"anyOf": [schema, {"type": "null"}]}


def _object(required=(), **properties):
    """An object whose keys follow the key rule; ``properties`` constrain some of them."""
    return {
        "type": "object",
        "propertyNames": {"$ref": "#/$defs/key"},
        "required": list(required),
        "properties": properties,
    }


def _shot_record():
    blocks = [b for b in BLOCKS if b != "outcome"]
    props = {"inputs": _object(["label"])}
    for name in blocks:
        props[name] = _block(name)
    for name in ("net_crossing", "landing", "bounce"):
        props[name] = _nullable(props[name])
    props["outcome"] = {"enum": list(OUTCOMES)}
    # the reason for each null: "block" or "block.field" -> a sentence
    props["missing"] = {"type": "object", "additionalProperties": {"type": "string"}}
    return {
        "type": "object",
        "required": ["inputs", *blocks, "outcome"],
        "properties": props,
        "additionalProperties": False,
    }


def _bounce_command():
    only = {"speed_in_mps", "angle_in_deg", "speed_out_mps", "angle_out_deg"}
    only |= {"spin_in_rpm", "spin_out_rpm", "regime"}
    block = _block("bounce", _BOUNCE_COMMAND_EXTRA, only)
    block["required"] = sorted(block["properties"])
    return _object(["inputs", "bounce"], inputs=_object(), bounce=block)


def build_schema():
    """The outputs' JSON Schema (draft 2020-12): one definition per command in ``$defs``."""
    shot = {"$ref": "#/$defs/shot_record"}
    defs = {
        "key": _KEY,
        "shot_record": _shot_record(),
        "shot": shot,
        "feed": shot,
        "compare": _object(
            ["scenario", "shots"], shots={"type": "array", "items": shot}, scenario={}
        ),
        "aim_stroke": _object(["target_m", "reachable", "swing", "shot"], shot=shot),
        "aim_feed": _object(["speed_mps", "reachable", "outcome"], landing_m=_POINT),
        "bounce": _bounce_command(),
        "surface": _object(["surface_friction", "surface_restitution", "court_pace_rating"]),
        "drill": _object(["drill", "balls"], balls={"type": "array", "items": _object(["ball"])}),
        "rally": _object(["rallies", "points"]),
        "presets": {"type": "object"},
    }
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "$id": "https://rallyarc.invalid/schema/outputs.json",
        "title": "rallyarc command outputs (--json)",
        "description": "One definition per command in $defs; keys end in their unit.",
        "$defs": defs,
    }


#: Commands with a definition in the schema.
COMMANDS = ("shot", "feed", "compare", "aim_stroke", "aim_feed", "bounce", "surface", "drill")
COMMANDS += ("rally", "presets")


def load_schema():
    """The shipped schema (``schema.json``, package data)."""
    text = resources.files("rallyarc.output").joinpath("schema.json").read_text()
    return json.loads(text)


def schema_for(command, schema=None):
    """The schema of one command's output (``aim feed`` is ``aim_feed``)."""
    schema = schema or load_schema()
    name = command.replace(" ", "_")
    if name not in schema["$defs"]:
        raise KeyError(f"no output schema for {command!r}; choose one of {', '.join(COMMANDS)}")
    return {"$ref": f"#/$defs/{name}", **{k: v for k, v in schema.items() if k != "title"}}


if __name__ == "__main__":
    print(json.dumps(build_schema(), indent=2, allow_nan=False))
