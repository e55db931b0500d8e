"""Fuzzing of the edge of the program: the numeric options of feed, bounce, surface and shot,
and the config loader with random TOML documents built from the schemas.

Whatever comes in, a command either prints strict, finite JSON (exit 0) or refuses with one
line (exit 2); a config file either loads or is refused with one InputError line naming it.
"""

import json
import math
import os

from click.testing import CliRunner
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from rallyarc import config, domain
from rallyarc.cli import main
from rallyarc.errors import InputError

#: Examples per fuzzed test; set RALLYARC_FUZZ_SCALE (default 1) to run more of them.
SCALE = float(os.environ.get("RALLYARC_FUZZ_SCALE", "1"))
FUZZ = settings(
    max_examples=int(20 * SCALE),
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)

# ----------------------------------------------------------------------------- numbers as typed

_odd = st.sampled_from(
    ["", "abc", "nan", "-nan", "inf", "-inf", "1e400", "-0", " 3 ", "1,2", "0x10", "1_000", "+"]
)
number_text = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.floats(-1e4, 1e4).map(lambda v: f"{v:g}"),
    st.integers(-(10**6), 10**6).map(str),
    _odd,
    st.text(max_size=6),
)
speed_text = st.one_of(
    number_text,
    st.tuples(st.floats(-50, 300), st.sampled_from(["", "m/s", "km/h", "kmh", "mph", "kn"])).map(
        lambda t: f"{t[0]:g}{t[1]}"
    ),
)
point_text = st.one_of(
    st.tuples(*[st.floats(-40, 40)] * 3).map(lambda p: ",".join(f"{c:g}" for c in p)),
    st.lists(number_text, min_size=1, max_size=4).map(",".join),
)


def _no_nul(text):
    return "\x00" not in text


def _strict(text):
    def refuse(name):
        raise ValueError(f"non-strict JSON constant {name}")

    return json.loads(text, parse_constant=refuse)


def _finite(value):
    if isinstance(value, dict):
        return all(_finite(v) for v in value.values())
    if isinstance(value, list):
        return all(_finite(v) for v in value)
    if isinstance(value, float):
        return math.isfinite(value)
    return True


def _check(argv):
    argv = [a for a in argv if _no_nul(a)]
    result = CliRunner().invoke(main, argv)
    assert result.exit_code in (0, 2), (argv, result.output, result.exception)
    assert "Traceback" not in result.output
    if result.exit_code == 0:
        data = _strict(result.stdout)
        assert _finite(data), argv
    else:
        errors = [ln for ln in result.stderr.splitlines() if ln.startswith("rallyarc: error:")]
        assert len(errors) == 1, (argv, result.stderr)


def _options(values):
    """``--name=value`` for each option given (None: left out)."""
    return [f"--{k}={v}" for k, v in values.items() if v is not None]


@FUZZ
@given(
    speed=speed_text,
    angle=st.one_of(st.none(), number_text),
    spin=st.one_of(st.none(), number_text),
    friction=st.one_of(st.none(), number_text),
    restitution=st.one_of(st.none(), number_text),
)
def test_bounce_numbers(speed, angle, spin, friction, restitution):
    opts = {"speed": speed, "angle": angle or "16", "spin": spin}
    opts.update({"friction": friction, "restitution": restitution})
    _check(["bounce", *_options(opts), "--json"])


@FUZZ
@given(
    friction=st.one_of(st.none(), number_text),
    restitution=st.one_of(st.none(), number_text),
    temperature=st.one_of(st.none(), number_text),
)
def test_surface_numbers(friction, restitution, temperature):
    opts = {"friction": friction, "restitution": restitution, "temperature": temperature}
    _check(["surface", *_options(opts), "--json"])


@FUZZ
@given(
    origin=st.one_of(st.none(), point_text),
    speed=st.one_of(st.none(), speed_text),
    elevation=st.one_of(st.none(), number_text),
    azimuth=st.one_of(st.none(), number_text),
    spin=st.one_of(st.none(), number_text),
    axis=st.one_of(st.none(), point_text, st.sampled_from(["0,1e-200,0", "0,0,1e-300"])),
)
def test_feed_numbers(origin, speed, elevation, azimuth, spin, axis):
    opts = {"from": origin, "speed": speed, "elevation": elevation, "azimuth": azimuth}
    opts.update({"spin": spin, "spin-axis": axis})
    _check(["feed", *_options(opts), "--json"])


@settings(FUZZ, max_examples=int(12 * SCALE))
@given(
    head_speed=st.one_of(st.none(), speed_text),
    swing_path=st.one_of(st.none(), number_text),
    face_tilt=st.one_of(st.none(), number_text),
    contact=st.one_of(st.none(), point_text),
    incoming_speed=st.one_of(st.none(), speed_text),
    incoming_spin=st.one_of(st.none(), number_text),
    stroke=st.sampled_from(["topspin_drive", "slice", "flat_serve"]),
)
def test_shot_numbers(head_speed, swing_path, face_tilt, contact, incoming_speed, incoming_spin,
                      stroke):  # fmt: skip
    opts = {"head-speed": head_speed, "swing-path": swing_path, "face-tilt": face_tilt}
    opts.update({"contact": contact, "stroke": stroke})
    if stroke != "flat_serve":
        opts.update({"incoming-speed": incoming_speed, "incoming-spin": incoming_spin})
    _check(["shot", *_options(opts), "--json"])


# ----------------------------------------------------------------------------- config documents


def _loaders():
    from rallyarc.drill import load_drill
    from rallyarc.rally import load_patterns

    return {
        "balls": domain.load_ball,
        "surfaces": domain.load_surface,
        "rackets": domain.load_racket,
        "air": domain.load_air,
        "strokes": domain.load_stroke,
        "machines": domain.load_machine,
        "scenarios": domain.load_scenario,
        "drills": load_drill,
        "patterns": load_patterns,
    }


def _wrong(draw, rate):
    """True for about ``rate`` per cent of the keys."""
    return draw(st.integers(0, 99)) < rate


def _number_in(spec, draw, rate):
    low, high = spec.low, spec.high
    if _wrong(draw, rate):  # just outside, not finite or of the wrong type
        return draw(
            st.sampled_from([low - 1, high + 1, math.nan, math.inf, "7", True, [1.0], {"a": 1}])
        )
    if spec.kind is int:
        return draw(st.integers(int(math.ceil(low)), int(math.floor(high))))
    return draw(st.floats(low, high, allow_nan=False))


@st.composite
def documents(draw, schema, kind, rate=None):
    """A TOML document of one kind: each key valid, or (for about ``rate`` per cent of them)
    left out, out of range, of the wrong type; sometimes joined by an unknown key. Documents
    with no mistake at all reach the checks between keys and the references to presets."""
    if rate is None:
        rate = draw(st.sampled_from([0, 0, 1, 3, 10]))
    doc = {}
    for key, spec in schema.items():
        if _wrong(draw, rate) or (not spec.required and draw(st.booleans())):
            continue  # left out
        if spec.kind == "table":
            doc[key] = draw(documents(spec.table, kind, rate))
        elif spec.kind == "tables":
            doc[key] = draw(st.lists(documents(spec.table, kind, rate), min_size=1,
                                     max_size=2))  # fmt: skip
        elif spec.kind == "names":
            names = config.preset_names("strokes") + (["tweener"] if rate else [])
            doc[key] = draw(st.lists(st.sampled_from(names), min_size=0 if rate else 1, max_size=3))
        elif spec.kind is str:
            options = st.sampled_from(list(spec.choices) or _string_choices(key, kind))
            doc[key] = draw(st.text(max_size=8) if _wrong(draw, rate) else options)
        elif spec.kind is bool:
            doc[key] = 1 if _wrong(draw, rate) else draw(st.booleans())
        elif spec.kind == "vector":
            doc[key] = sorted(_number_in(spec, draw, 0) for _ in range(spec.length))
            if _wrong(draw, rate):
                doc[key] = [_number_in(spec, draw, 100)] + doc[key][1:]
        else:
            doc[key] = _number_in(spec, draw, rate)
    if _wrong(draw, rate):
        doc["unknown_key"] = 1.0
    return doc


def _string_choices(key, kind):
    """Preset names a string key may refer to, so that documents reach the deeper checks."""
    kinds = {"ball": "balls", "racket": "rackets", "air": "air", "surface": "surfaces",
             "machine": "machines", "stroke": "strokes"}  # fmt: skip
    if key in kinds:
        return config.preset_names(kinds[key])
    return ["text of our own"]


_FUZZED_KINDS = ["balls", "surfaces", "rackets", "air", "strokes", "machines", "scenarios",
                 "drills", "patterns"]  # fmt: skip


@st.composite
def kind_and_document(draw):
    kind = draw(st.sampled_from(_FUZZED_KINDS))
    return kind, draw(documents(config.SCHEMAS[kind], kind))


@settings(FUZZ, max_examples=int(120 * SCALE))
@given(case=kind_and_document())
def test_config_loader_loads_or_refuses_in_one_line(case, tmp_path_factory, toml):
    kind, doc = case
    path = tmp_path_factory.getbasetemp() / f"fuzzed_{kind}.toml"
    path.write_text(toml(doc), encoding="utf-8")
    try:
        _loaders()[kind](str(path))
    except InputError as exc:
        message = str(exc)
        assert "\n" not in message
        assert str(path) in message
