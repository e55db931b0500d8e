"""Small study files and a two-worker Dask cluster on 127.0.0.1, started by the tests."""

from __future__ import annotations

import pytest

SHOTS = """
name = "Tiny window"
source = "test study of our own"
description = "a few shots"
kind = "shots"
scenario = "demo"
stroke = "topspin_drive"
design = "{design}"
seed = 5
chunk = {chunk}
{samples}

[[parameters]]
name = "head_speed"
low = 90.0
high = 140.0
steps = 4

[[parameters]]
name = "incoming_spin"
low = 0.0
high = 3000.0
steps = 3
distribution = "normal"
"""

RALLIES = """
name = "Tiny ladder"
source = "test study of our own"
description = "a few rallies"
kind = "rallies"
patterns = "demo_match"
rallies = 100
max_shots = 4
design = "grid"
seed = 3
chunk = 100

[[parameters]]
name = "scatter"
low = 0.5
high = 1.5
steps = 2
"""


@pytest.fixture
def shots_text():
    """The text of a small shot study (grid of 12 points by default)."""

    def text(design="grid", chunk=3, samples=""):
        return SHOTS.format(design=design, chunk=chunk, samples=samples)

    return text


@pytest.fixture
def rallies_text():
    """The text of a rally study: 2 variants of 100 rallies of at most 4 shots, one chunk each."""
    return RALLIES


@pytest.fixture
def study_file(tmp_path):
    def write(text, name="study.toml"):
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path

    return write


@pytest.fixture(scope="session")
def cluster():
    """A LocalCluster of two worker processes on 127.0.0.1, one thread each."""
    distributed = pytest.importorskip("distributed")
    with distributed.LocalCluster(
        n_workers=2,
        threads_per_worker=1,
        processes=True,
        host="127.0.0.1",
        # a free port of the loopback interface for the dashboard: never a fixed port that
        # another process may hold
        dashboard_address="127.0.0.1:0",
    ) as local:
        yield local


@pytest.fixture
def client(cluster):
    import distributed

    with distributed.Client(cluster) as c:
        yield c
