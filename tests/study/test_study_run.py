"""A study run in this process and on a two-worker cluster writes the same partitions; a lost
worker loses no chunk; a resumed run plays only what was not done."""

from __future__ import annotations

import os
import signal

import pyarrow.parquet as pq
import pytest

from rallyarc.study import MANIFEST, load_study, partition_name, read_manifest, run_study


def _tables(folder, study):
    return [pq.read_table(folder / partition_name(k)) for k in range(study.n_chunks)]


def _same(a, b, study):
    ta, tb = _tables(a, study), _tables(b, study)
    assert all(x.equals(y) for x, y in zip(ta, tb, strict=True))
    # the files themselves, byte for byte
    for k in range(study.n_chunks):
        assert (a / partition_name(k)).read_bytes() == (b / partition_name(k)).read_bytes()


def test_local_and_cluster_give_identical_partitions_for_shots(
    study_file, shots_text, tmp_path, client
):
    study = load_study(study_file(shots_text(chunk=5)))
    assert study.n_chunks == 3 and study.total == 12
    local = run_study(study, tmp_path / "local", workers=1)
    assert sorted(local.played) == [0, 1, 2] and local.rows == 12
    dist = run_study(study, tmp_path / "dist", client=client)
    assert sorted(dist.played) == [0, 1, 2]
    _same(tmp_path / "local", tmp_path / "dist", study)
    manifest = read_manifest(tmp_path / "dist")
    assert manifest["done"] == {0, 1, 2} and manifest["rows"] == 12
    text = (tmp_path / "dist" / MANIFEST).read_text()
    assert "NaN" not in text and "Infinity" not in text


def test_local_and_cluster_give_identical_partitions_for_200_rallies(
    study_file, rallies_text, tmp_path, client
):
    study = load_study(study_file(rallies_text))
    assert study.total == 200 and study.n_chunks == 2
    run_study(study, tmp_path / "local", workers=1)
    run_study(study, tmp_path / "dist", client=client)
    _same(tmp_path / "local", tmp_path / "dist", study)
    table = pq.read_table(tmp_path / "local" / partition_name(1)).to_pandas()
    assert set(table["scatter_factor"]) == {1.5} and table["rally_shots"].max() <= 4


@pytest.mark.parametrize("design", ["random", "latin"])
def test_sampled_designs_do_not_depend_on_the_chunk(study_file, shots_text, tmp_path, design):
    a = load_study(study_file(shots_text(design, 3, "samples = 7"), "a.toml"))
    b = load_study(study_file(shots_text(design, 7, "samples = 7"), "b.toml"))
    run_study(a, tmp_path / "a", workers=1)
    run_study(b, tmp_path / "b", workers=1)
    ta = pq.read_table(sorted((tmp_path / "a").glob("part-*"))).drop(["chunk"])
    tb = pq.read_table(sorted((tmp_path / "b").glob("part-*"))).drop(["chunk"])
    assert ta.equals(tb)
    if design == "latin":  # one point in each of the 7 strata of every parameter
        u = (ta.column("head_speed_kmh").to_numpy() - 90.0) / 50.0
        assert sorted((u * 7).astype(int)) == list(range(7))


def test_a_killed_worker_loses_no_chunk(study_file, shots_text, tmp_path, client):
    study = load_study(study_file(shots_text(chunk=1)))
    pids = list(client.run(os.getpid).values())
    killed = []

    def kill_one(k):
        if not killed:
            killed.append(pids[0])
            os.kill(pids[0], signal.SIGKILL)

    run = run_study(study, tmp_path / "dist", client=client, on_chunk=kill_one)
    assert killed and sorted(run.played) == list(range(12))
    run_study(study, tmp_path / "local", workers=1)
    _same(tmp_path / "local", tmp_path / "dist", study)


class _Stop(Exception):
    pass


def test_a_resumed_run_plays_only_what_was_not_done(study_file, shots_text, tmp_path):
    study = load_study(study_file(shots_text(chunk=2)))
    folder = tmp_path / "out"

    def crash(k):
        if k == 2:
            raise _Stop

    with pytest.raises(_Stop):
        run_study(study, folder, workers=1, on_chunk=crash)
    assert read_manifest(folder)["done"] == {0, 1, 2}
    (folder / partition_name(4)).write_bytes(b"half")  # written, never listed
    again = run_study(study, folder, workers=1)
    assert again.skipped == 3 and sorted(again.played) == [3, 4, 5]
    full = run_study(study, tmp_path / "full", workers=1)
    assert len(full.played) == 6
    _same(folder, tmp_path / "full", study)
    assert run_study(study, folder, workers=1).played == []
