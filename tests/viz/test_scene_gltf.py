"""A glTF export alone writes only the glTF; its meshes and materials carry the scene's names and
the net's transparency is exported as blend."""

import json

from click.testing import CliRunner

from rallyarc.cli import main


def test_a_gltf_export_alone_writes_only_the_gltf_with_names_and_blend(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    for name in ("x.gltf", "y.gltf"):  # a second export does not trip over a PNG
        result = CliRunner().invoke(main, ["scene", "--stroke", "topspin_drive", "--export", name])
        assert result.exit_code == 0, result.output
    assert sorted(p.name for p in tmp_path.iterdir()) == ["x.gltf", "y.gltf"]
    gltf = json.loads((tmp_path / "x.gltf").read_text())
    names = [m["name"] for m in gltf["meshes"]]
    assert {"ground", "surface", "lines", "net", "net_band"} <= set(names)
    assert any(n.startswith("path_topspin_drive") for n in names)
    assert all(m.get("name") for m in gltf["materials"])
    net = next(m for m in gltf["materials"] if m["name"] == "net_material")
    assert net["alphaMode"] == "BLEND"
    assert net["pbrMetallicRoughness"]["baseColorFactor"][3] < 1.0
    ground = next(m for m in gltf["materials"] if m["name"] == "ground_material")
    assert ground.get("alphaMode", "OPAQUE") == "OPAQUE"


def test_with_out_and_export_both_are_written(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    args = ["scene", "--stroke", "lob", "--out", "lob.png", "--export", "lob.gltf"]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    assert sorted(p.name for p in tmp_path.iterdir()) == ["lob.gltf", "lob.png"]
