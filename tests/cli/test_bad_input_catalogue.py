"""A catalogue of bad input, as a new user meets it: every command and every kind of config file.

Each case gives the arguments, the exit code and the words the one-line error must contain.
Every refused case must print exactly one ``rallyarc: error:`` line (warnings aside), no
traceback, and write nothing. ``{d}`` in an argument is the folder of the case files.
"""

import os

import pytest
from click.testing import CliRunner

from rallyarc.cli import main

# ----------------------------------------------------------------------------- case files


def _files(toml, preset):
    """File name -> bytes of every bad (or odd but good) file the cases use."""
    out = {}

    def put(name, kind, base, change=None, drop=()):
        data = preset(kind, base)
        for key in drop:
            data.pop(key)
        for key, value in (change or {}).items():
            data[key] = value
        out[name] = toml(data).encode("utf-8")

    ball = toml(preset("balls", "itf_type2"))
    out["ball_bom.toml"] = b"\xef\xbb\xbf" + ball.encode("utf-8")
    out["ball_latin1.toml"] = ball.replace('name = "', 'name = "Caf\u00e9 ').encode("latin-1")
    out["binary.toml"] = bytes(range(256)) * 4
    out["nul.toml"] = b'name = "x"\x00\n'
    out["syntax.toml"] = b"name = \n"
    out["empty.toml"] = b""
    put("ball_unknown.toml", "balls", "itf_type2", {"colour": "yellow"})
    put("ball_no_mass.toml", "balls", "itf_type2", drop=("mass_kg",))
    put("ball_heavy.toml", "balls", "itf_type2", {"mass_kg": 5.0})
    put("ball_mass_text.toml", "balls", "itf_type2", {"mass_kg": "heavy"})
    put("ball_rebound.toml", "balls", "itf_type2", {"rebound_cm": 60.0})
    put("ball_aero.toml", "balls", "itf_type2", {"aero_model": "none"})
    put("surface_mu.toml", "surfaces", "clay", {"friction": 3.0})
    put("surface_no_e.toml", "surfaces", "clay", drop=("restitution",))
    put("surface_bool.toml", "surfaces", "clay", {"restitution": True})
    put(
        "racket_sw.toml",
        "rackets",
        "standard",
        {"mass_kg": 0.5, "balance_m": 0.45, "swingweight_kgm2": 0.02},
    )
    put("racket_balance.toml", "rackets", "standard", {"length_m": 0.45, "balance_m": 0.45})
    put("racket_short.toml", "rackets", "standard", {"length_m": 0.5, "balance_m": 0.3,
                                                      "swingweight_kgm2": 0.03})  # fmt: skip
    put("air_hot.toml", "air", "sea_level", {"temperature_c": 80.0})
    put("air_wind.toml", "air", "sea_level", {"wind_mps": [1.0, 2.0]})
    serve = preset("strokes", "flat_serve")
    for name, z in (("stroke_toss_low.toml", -0.5), ("stroke_toss_high.toml", 12.0)):
        serve["toss"]["contact_m"] = [-11.6, -0.3, z]
        out[name] = toml(serve).encode("utf-8")
    put("stroke_no_toss.toml", "strokes", "flat_serve", drop=("toss",))
    put("stroke_kind.toml", "strokes", "topspin_drive", {"kind": "volley"})
    put("stroke_fast.toml", "strokes", "topspin_drive", {"head_speed_kmh": 500.0})
    put("machine_order.toml", "machines", "club_feeder",
        {"speed_min_kmh": 150.0, "speed_max_kmh": 40.0})  # fmt: skip
    put("machine_release.toml", "machines", "club_feeder", {"release_height_m": 9.0})
    drill = preset("drills", "demo_drill")
    drill["balls"][0]["speed_kmh"] = 60.0
    out["drill_both.toml"] = toml(drill).encode("utf-8")
    put("drill_machine.toml", "drills", "demo_drill", {"machine": "no_such_machine"})
    put("drill_no_balls.toml", "drills", "demo_drill", drop=("balls",))
    sc = preset("scenarios", "demo")
    sc["incoming"]["position_m"] = [-12.3, -0.4, -1.0]
    out["scenario_low.toml"] = toml(sc).encode("utf-8")
    sc["incoming"]["position_m"] = [-12.3, -0.4, 15.0]
    out["scenario_high.toml"] = toml(sc).encode("utf-8")
    put("scenario_stroke.toml", "scenarios", "demo", {"strokes": ["tweener"]})
    put("scenario_no_incoming.toml", "scenarios", "demo", drop=("incoming",))
    put("scenario_racket.toml", "scenarios", "demo", {"racket": "no_such_racket"})
    pat = preset("patterns", "demo_match")
    pat["near"]["height_m"] = 1.2
    pat["near"]["highest_contact_m"] = 3.4
    out["patterns_reach.toml"] = toml(pat).encode("utf-8")
    pat = preset("patterns", "demo_match")
    pat["near"]["contact_height_m"] = [1.3, 0.8]
    out["patterns_band.toml"] = toml(pat).encode("utf-8")
    put("patterns_shots.toml", "patterns", "demo_match", {"max_shots": 0})
    put("patterns_server.toml", "patterns", "demo_match", {"server": "both"})
    out["plain.txt"] = b"a user's file\n"
    out["traj.csv"] = b"a user's table\n"
    out["sweep.png"] = b"a user's figure\n"
    out["page.html"] = b"a user's page\n"
    return out


@pytest.fixture(scope="module")
def case_dir(tmp_path_factory, toml, preset):
    d = tmp_path_factory.mktemp("bad_input")
    for name, data in _files(toml, preset).items():
        (d / name).write_bytes(data)
    (d / "results").mkdir()
    (d / "results" / "shots.csv").write_bytes(b"a user's results\n")
    return d


# ----------------------------------------------------------------------------- the catalogue

E = 2  # exit code of every refused input

CASES = [
    # feed: numbers, points, directions, presets and the release point
    ("feed", "--speed abc", E, ["--speed", "expected a speed"]),
    ("feed", "--speed 500", E, ["--speed", "0.1", "80"]),
    ("feed", "--speed nan", E, ["--speed"]),
    ("feed", "--speed -5", E, ["--speed"]),
    ("feed", "--elevation 90", E, ["--elevation", "-60", "85"]),
    ("feed", "--elevation inf", E, ["--elevation", "finite"]),
    ("feed", "--azimuth 400", E, ["--azimuth", "-180", "180"]),
    ("feed", "--spin 1e9", E, ["--spin", "-8000", "8000"]),
    ("feed", "--spin-axis 0,0,0", E, ["--spin-axis", "zero vector"]),
    ("feed", "--spin-axis 1,2", E, ["--spin-axis", "X,Y,Z"]),
    ("feed", "--spin-axis 0,1e300,0", E, ["--spin-axis", "1000"]),
    ("feed", "--from 0,0,0.5", E, ["--from", "inside the net"]),
    ("feed", "--from -11,0,-1", E, ["--from", "below the court", "radius"]),
    ("feed", "--from -11,0,12", E, ["--from", "reach", "4 m"]),
    ("feed", "--from 100,0,1", E, ["--from", "-30", "30"]),
    ("feed", "--aero nosuch", E, ["--aero", "choose one of"]),
    ("feed", "--air-density -1", E, ["--air-density", "0", "5"]),
    ("feed", "--altitude 20000", E, ["--altitude", "11000"]),
    ("feed", "--temperature 100", E, ["--temperature"]),
    ("feed", "--pressure 1", E, ["--pressure"]),
    ("feed", "--humidity 2", E, ["--humidity", "0", "1"]),
    ("feed", "--ball itf_type", E, ["--ball", "did you mean", "itf_type2"]),
    ("feed", "--ball {d}/ball_latin1.toml", E, ["ball_latin1.toml", "not UTF-8"]),
    ("feed", "--ball {d}/binary.toml", E, ["binary.toml", "not UTF-8"]),
    ("feed", "--ball {d}/nul.toml", E, ["nul.toml", "binary"]),
    ("feed", "--bogus 1", E, ["--bogus"]),
    # surface
    ("surface", "--friction 3 --restitution 0.5", E, ["--friction", "0", "2"]),
    ("surface", "--friction 0.5", E, ["--friction/--restitution", "both"]),
    ("surface", "--preset clay --friction 0.5", E, ["--preset", "either"]),
    ("surface", "--preset clya", E, ["--preset", "did you mean", "clay"]),
    ("surface", "--preset {d}/surface_mu.toml", E, ["surface_mu.toml", "'friction'", "0 to 2"]),
    ("surface", "--preset {d}/surface_no_e.toml", E, ["missing key 'restitution'"]),
    ("surface", "--preset {d}/surface_bool.toml", E, ["'restitution'", "got True"]),
    ("surface", "--preset {d}/syntax.toml", E, ["syntax.toml", "TOML syntax"]),
    ("surface", "--preset {d}/empty.toml", E, ["empty.toml", "missing key"]),
    ("surface", "--preset {d}", E, ["is a folder"]),
    ("surface", "--preset {d}/none.toml", E, ["none.toml", "no such file"]),
    ("surface", "--temperature 100", E, ["--temperature", "-10", "50"]),
    # bounce
    ("bounce", "--speed 0 --angle 10", E, ["--speed", "0.1"]),
    ("bounce", "--speed fast --angle 10", E, ["--speed", "expected a speed"]),
    ("bounce", "--speed 20 --angle 0", E, ["--angle", "0.1", "90"]),
    ("bounce", "--speed 20 --angle 95", E, ["--angle"]),
    ("bounce", "--speed 20 --angle 16 --spin 9000", E, ["--spin", "8000"]),
    ("bounce", "--speed 20 --angle 16 --surface clay --friction 0.5", E, ["--surface", "either"]),
    ("bounce", "--speed 20 --angle 16 --restitution 2", E, ["--friction/--restitution"]),
    ("bounce", "--speed 20 --angle 16 --ball nosuch", E, ["--ball", "unknown ball preset"]),
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_unknown.toml", E, ["unknown key 'colour'"]),
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_no_mass.toml", E, ["missing key 'mass_kg'"]),
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_heavy.toml", E, ["'mass_kg'", "0.01", "0.2"]),
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_mass_text.toml", E, ["'mass_kg'", "heavy"]),
    (
        "bounce",
        "--speed 20 --angle 16 --ball {d}/ball_rebound.toml",
        E,
        ["rebound_cm", "rebound_min_cm"],
    ),  # noqa: E501
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_aero.toml", E, ["'aero_model'", "one of"]),
    ("bounce", "--speed 20 --angle 16 --surface {d}/surface_mu.toml", E, ["--surface", "friction"]),
    ("bounce", "--angle 16", E, ["--speed"]),
    ("bounce", "--speed 20 --angle 16 --ball {d}/ball_bom.toml", 0, []),
    # shot
    ("shot", "--stroke tweener", E, ["--stroke", "unknown stroke preset", "choose one of"]),
    ("shot", "--stroke topspin_driv", E, ["--stroke", "did you mean", "topspin_drive"]),
    ("shot", "--contact -12,0,-1", E, ["--contact", "below the court", "radius"]),
    ("shot", "--contact 0,0,0.5", E, ["--contact", "inside the net"]),
    ("shot", "--contact -11,0,6", E, ["--contact", "reach", "4 m"]),
    ("shot", "--contact -11,0,40", E, ["--contact", "-20", "20"]),
    ("shot", "--contact 1,2", E, ["--contact", "X,Y,Z"]),
    ("shot", "--stroke flat_serve --contact -11.9,0.2,12", E, ["--contact", "reach"]),
    ("shot", "--stroke flat_serve --contact -11.9,0.2,-0.5", E, ["--contact", "below the court"]),
    ("shot", "--stroke {d}/stroke_toss_low.toml", E, ["--stroke", "toss.contact_m", "0.02"]),
    ("shot", "--stroke {d}/stroke_toss_high.toml", E, ["--stroke", "toss.contact_m", "4"]),
    ("shot", "--stroke {d}/stroke_no_toss.toml", E, ["--stroke", "[toss]"]),
    ("shot", "--stroke {d}/stroke_kind.toml", E, ["--stroke", "'kind'", "groundstroke"]),
    ("shot", "--stroke {d}/stroke_fast.toml", E, ["'head_speed_kmh'", "250"]),
    ("shot", "--stroke flat_serve --incoming-speed 20", E, ["--incoming-speed", "serve"]),
    ("shot", "--head-speed 500", E, ["--head-speed", "70"]),
    ("shot", "--swing-path 90", E, ["--swing-path", "-60", "80"]),
    ("shot", "--face-tilt 70", E, ["--face-tilt", "60"]),
    ("shot", "--swing-direction 70", E, ["--swing-direction", "60"]),
    ("shot", "--incoming-speed 500", E, ["--incoming-speed", "70"]),
    ("shot", "--incoming-spin 9000", E, ["--incoming-spin", "6000"]),
    ("shot", "--dt 0", E, ["--dt", "0.0005", "0.1"]),
    ("shot", "--dt 1", E, ["--dt"]),
    ("shot", "--receiver-plane 20", E, ["--receiver-plane", "0", "10"]),
    ("shot", "--csv {d}/plain.txt", E, ["--csv", ".csv"]),
    ("shot", "--csv {d}/plain.txt/traj.csv", E, ["--csv", "plain.txt", "is a file"]),
    ("shot", "--csv {d}/traj.csv", E, ["--csv", "exists", "--force"]),
    ("shot", "--csv /proc/rallyarc/traj.csv", E, ["--csv", "cannot write"]),
    ("shot", "--csv {d}", E, ["--csv", ".csv"]),
    ("shot", "--scenario nodemo", E, ["--scenario", "did you mean", "demo"]),
    ("shot", "--scenario {d}/scenario_low.toml", E, ["incoming.position_m", "0.02"]),
    ("shot", "--scenario {d}/scenario_high.toml", E, ["incoming.position_m", "4"]),
    ("shot", "--scenario {d}/scenario_stroke.toml", E, ["--scenario", "'strokes'", "tweener"]),
    (
        "shot",
        "--scenario {d}/scenario_racket.toml",
        E,
        ["--scenario", "'racket'", "no_such_racket"],
    ),  # noqa: E501
    ("shot", "--ball nosuch", E, ["--ball", "unknown ball preset"]),
    (
        "shot",
        "--racket {d}/racket_sw.toml",
        E,
        ["--racket", "swingweight_kgm2", "mass_kg", "balance_m", "must exceed"],
    ),  # noqa: E501
    ("shot", "--racket {d}/racket_balance.toml", E, ["--racket", "balance_m", "length_m"]),
    ("shot", "--racket {d}/racket_short.toml", E, ["impact_from_butt_m", "length_m", "0.5"]),
    ("shot", "--air {d}/air_hot.toml", E, ["--air", "'temperature_c'", "-20", "50"]),
    ("shot", "--air {d}/air_wind.toml", E, ["--air", "'wind_mps'", "3 numbers"]),
    ("shot", "--air mars", E, ["--air", "unknown air preset"]),
    ("shot", "--surface grass_court", E, ["--surface", "unknown surface preset"]),
    # compare
    ("compare", "nodemo", E, ["SCENARIO", "did you mean", "demo"]),
    ("compare", "{d}/scenario_no_incoming.toml", E, ["incoming"]),
    ("compare", "--out {d}/plain.txt", E, ["--out", "is a file"]),
    ("compare", "--out /proc/rallyarc", E, ["--out", "cannot write"]),
    ("compare", "--out {d}/results", E, ["--out", "shots.csv", "exists", "--force"]),
    ("compare", "--dt 5", E, ["--dt"]),
    ("compare", "--racket {d}/racket_sw.toml", E, ["--racket", "swingweight_kgm2"]),
    # presets
    ("presets", "racquets", E, ["KIND", "unknown preset kind"]),
    # aim stroke
    ("aim stroke", "--target 30,0", E, ["--target", "-15", "15"]),
    ("aim stroke", "--target 1", E, ["--target", "X,Y"]),
    (
        "aim stroke",
        "--target 8,0 --clearance 1 --receiver-height 1",
        E,
        ["--clearance/--receiver-height"],
    ),  # noqa: E501
    ("aim stroke", "--target 8,0 --clearance 20", E, ["--clearance", "0", "10"]),
    ("aim stroke", "--target 8,0 --receiver-height 9", E, ["--receiver-height", "5"]),
    ("aim stroke", "--target 8,0 --solve spin", E, ["--solve"]),
    ("aim stroke", "", E, ["--target"]),
    ("aim stroke", "--target 8,0 --stroke tweener", E, ["unknown stroke preset"]),
    ("aim stroke", "--target 8,0 --csv {d}/traj.csv", E, ["--csv", "exists"]),
    # aim feed
    ("aim feed", "--target -8,0 --at 0.5,0 --speed 60km/h", E, ["--at", "1 m"]),
    ("aim feed", "--target 5,0 --speed 60km/h", E, ["--target", "other side"]),
    ("aim feed", "--target -8,0 --speed 60km/h --height 1", E, ["--speed/--height"]),
    ("aim feed", "--target -8,0", E, ["--speed/--height"]),
    ("aim feed", "--target -8,0 --height 1.2 --friction-only", E, ["--friction-only", "racket"]),
    ("aim feed", "--target -8,0 --speed 60km/h --spin 9000", E, ["--spin", "8000"]),
    ("aim feed", "--target -8,0 --height 9", E, ["--height", "0.1", "4"]),
    ("aim feed", "--target -8,0 --speed 60km/h --machine nosuch", E, ["machine preset"]),
    (
        "aim feed",
        "--target -8,0 --speed 60km/h --machine {d}/machine_order.toml",
        E,
        ["speed_min_kmh", "speed_max_kmh"],
    ),  # noqa: E501
    (
        "aim feed",
        "--target -8,0 --speed 60km/h --machine {d}/machine_release.toml",
        E,
        ["release_height_m", "3"],
    ),  # noqa: E501
    # drill
    ("drill", "nosuch", E, ["DRILL_FILE", "unknown drill preset"]),
    ("drill", "{d}/drill_both.toml", E, ["balls[1]", "speed_kmh", "height_at_player_m"]),
    ("drill", "{d}/drill_machine.toml", E, ["machine", "no_such_machine"]),
    ("drill", "{d}/drill_no_balls.toml", E, ["missing key 'balls'"]),
    ("drill", "{d}/ball_latin1.toml", E, ["not UTF-8"]),
    ("drill", "--out {d}/plain.txt", E, ["--out", "is a file"]),
    ("drill", "--units furlongs", E, ["--units"]),
    ("drill", "--dt 0", E, ["--dt"]),
    # plot side / top
    ("plot side", "--scatter 2001", E, ["--scatter", "0", "2000"]),
    ("plot side", "--scatter 2.5", E, ["--scatter", "whole number"]),
    ("plot side", "--scatter -1", E, ["--scatter"]),
    ("plot side", "--out {d}/side.txt", E, ["--out", ".png"]),
    ("plot side", "--out {d}/results", E, ["--out", "must end in"]),
    ("plot side", "--stroke tweener", E, ["--stroke", "tweener", "choose from"]),
    ("plot side", "nodemo", E, ["SCENARIO", "demo"]),
    ("plot top", "--scatter 2001", E, ["--scatter", "2000"]),
    ("plot top", "--out /proc/rallyarc/top.png", E, ["--out", "cannot write"]),
    ("plot top", "--out {d}/plain.txt/top.png", E, ["--out", "is a file"]),
    ("plot top", "--scatter 5 --seed -1", E, ["--seed"]),
    # plot sweep / window
    ("plot sweep", "--steps 2.5", E, ["--steps", "whole number"]),
    ("plot sweep", "--steps 1", E, ["--steps", "2", "500"]),
    ("plot sweep", "--steps 501", E, ["--steps"]),
    ("plot sweep", "--param spin", E, ["--param", "unknown parameter", "choose one of"]),
    ("plot sweep", "--range 1", E, ["--range", "LO,HI"]),
    ("plot sweep", "--range 3000,1000", E, ["--range", "LO must be below HI"]),
    ("plot sweep", "--metrics nosuch", E, ["--metrics", "unknown metric"]),
    ("plot sweep", "--csv {d}/plain.txt", E, ["--csv", ".csv"]),
    ("plot sweep", "--csv {d}/traj.csv", E, ["--csv", "exists"]),
    ("plot sweep", "--out {d}/sweep.png", E, ["--out", "exists"]),
    ("plot sweep", "serve_demo --param incoming_speed", E, ["--param", "groundstroke"]),
    ("plot window", "--axes head_speed", E, ["--axes", "X,Y"]),
    ("plot window", "--axes head_speed,launch_speed", E, ["--axes", "two"]),
    ("plot window", "--steps 2", E, ["--steps", "3", "201"]),
    ("plot window", "--steps 3.5", E, ["--steps", "whole number"]),
    ("plot window", "--x-range 40,10", E, ["--x-range", "LO must be below HI"]),
    # scene
    ("scene", "--camera drone", E, ["--camera"]),
    ("scene", "--out {d}/scene.jpg", E, ["--out", ".png"]),
    ("scene", "--export {d}/scene.obj", E, ["--export", ".html"]),
    ("scene", "--out {d}/new.png --export {d}/page.html", E, ["--export", "exists"]),
    ("scene", "--scatter 2001", E, ["--scatter", "2000"]),
    # rally
    ("rally", "--rallies 0", E, ["--rallies", "1", "200000"]),
    ("rally", "--rallies 200001", E, ["--rallies"]),
    ("rally", "--rallies 2.5", E, ["--rallies", "whole number"]),
    ("rally", "--seed -1", E, ["--seed"]),
    ("rally", "--max-shots 0", E, ["--max-shots", "1", "200"]),
    ("rally", "--workers 0", E, ["--workers", "1", "64"]),
    ("rally", "--workers many", E, ["--workers", "whole number"]),
    ("rally", "nosuch", E, ["PATTERNS", "unknown pattern preset"]),
    ("rally", "--out {d}/plain.txt", E, ["--out", "is a file"]),
    ("rally", "--out {d}/results --rallies 5", E, ["--out", "exists"]),
    (
        "rally",
        "{d}/patterns_reach.toml",
        E,
        ["near.highest_contact_m", "near.height_m", "reaches at most"],
    ),  # noqa: E501
    ("rally", "{d}/patterns_band.toml", E, ["near.contact_height_m", "low end first"]),
    ("rally", "{d}/patterns_shots.toml", E, ["'max_shots'", "1", "200"]),
    ("rally", "{d}/patterns_server.toml", E, ["'server'", "alternate"]),
    # report, study, scout
    ("report", "nodemo", E, ["SCENARIO", "did you mean", "demo"]),
    ("report", "--scatter 2001", E, ["--scatter", "2000"]),
    ("report", "-o {d}/page.txt", E, ["--out", ".html"]),
    ("report", "-o {d}/page.html", E, ["--out", "exists", "--force"]),
    ("report", "-o /proc/rallyarc/page.html", E, ["--out", "cannot write"]),
    ("study run", "nosuch --out {d}/study", E, ["STUDY_FILE", "unknown study preset"]),
    ("study run", "demo_study --out /proc/rallyarc", E, ["--out", "cannot write"]),
    ("study run", "{d}/syntax.toml --out {d}/study", E, ["syntax.toml", "TOML syntax"]),
    ("study summary", "{d}/none", E, ["none", "not a study dataset"]),
    ("scout compare", "nosuch other", E, ["BASE", "unknown pattern preset"]),
    ("scout compare", "demo_match", E, ["VARIANTS"]),
    # the group itself
    ("", "nosuchcommand", E, ["nosuchcommand"]),
]


def _id(case):
    command, args, _, _ = case
    return f"{command} {args}".strip()


def _written(folder):
    return sorted(str(p.relative_to(folder)) for p in folder.rglob("*"))


@pytest.mark.parametrize("case", CASES, ids=[_id(c) for c in CASES])
def test_bad_input(case, case_dir):
    command, args, code, words = case
    argv = command.split() + [a.replace("{d}", str(case_dir)) for a in args.split()]
    before = _written(case_dir)
    result = CliRunner().invoke(main, argv)
    assert result.exit_code == code, (argv, result.output)
    assert "Traceback" not in result.output
    if code == 0:
        return
    assert not isinstance(result.exception, Exception | None) or isinstance(
        result.exception, SystemExit
    ), result.exception
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    errors = [line for line in lines if line.startswith("rallyarc: error:")]
    assert len(errors) == 1, lines
    assert all(line.startswith("rallyarc: ") for line in lines), lines
    message = errors[0].lower()
    for word in words:
        assert word.lower() in message, (word, errors[0])
    assert _written(case_dir) == before  # nothing written, nothing left behind


def test_the_catalogue_covers_every_command_and_config_kind():
    from rallyarc import config

    assert len(CASES) >= 100
    commands = {c[0] for c in CASES}
    for name in ("feed", "surface", "bounce", "shot", "compare", "presets", "aim stroke",
                 "aim feed", "drill", "plot side", "plot top", "plot sweep", "plot window",
                 "scene", "rally", "report", "study run", "study summary",
                 "scout compare"):  # fmt: skip
        assert name in commands, name
    files = " ".join(c[1] for c in CASES)
    prefixes = {"balls": "ball_", "surfaces": "surface_", "rackets": "racket_", "air": "air_",
                "strokes": "stroke_", "machines": "machine_", "drills": "drill_",
                "scenarios": "scenario_", "patterns": "patterns_"}  # fmt: skip
    for kind, prefix in prefixes.items():
        assert kind in config.SCHEMAS
        assert "{d}/" + prefix in files, kind


def test_a_warning_is_one_line_and_the_run_goes_on(case_dir):
    result = CliRunner().invoke(main, ["shot", "--contact", "-11,0,3.5", "--json"])
    assert result.exit_code == 0, result.output
    warnings = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(warnings) == 1 and warnings[0].startswith("rallyarc: warning: --contact")
    assert "3 m" in warnings[0]


def test_a_file_with_a_byte_order_mark_reads(case_dir):
    from rallyarc import config

    data = config.load("balls", case_dir / "ball_bom.toml")
    assert data["name"] == config.load("balls", "itf_type2")["name"]


def test_no_case_leaves_a_hidden_file(case_dir):
    assert not [n for n in os.listdir(case_dir) if n.startswith(".")]
