"""Atomic writes: a new file gets the mode the umask gives any new file, a replaced file keeps its
mode, the umask is never flipped to learn it, and Ctrl-C leaves the old file and nothing else."""

import os
import signal
import stat
import subprocess
import sys
import tempfile

import pytest

from rallyarc.output import export


def mode(path):
    return stat.S_IMODE(os.stat(path).st_mode)


NEW_FILE = r"""
import os, stat, sys
os.umask(int(sys.argv[2], 8))
from rallyarc.output import export
path = export.write_text(sys.argv[1], "new\n")
umask = os.umask(0)
print(oct(stat.S_IMODE(os.stat(path).st_mode)), oct(umask))
"""


@pytest.mark.parametrize("umask", [0o022, 0o027, 0o002, 0o077])
def test_a_new_file_gets_the_mode_of_any_new_file_under_the_umask(tmp_path, umask):
    target = tmp_path / "out" / "shots.csv"
    out = subprocess.run(
        [sys.executable, "-P", "-c", NEW_FILE, str(target), oct(umask)],
        capture_output=True, text=True, check=True,
    )  # fmt: skip
    got, umask_after = out.stdout.split()
    assert int(got, 8) == 0o666 & ~umask
    assert int(umask_after, 8) == umask  # left as it was
    assert os.listdir(target.parent) == ["shots.csv"]


@pytest.mark.parametrize("kept", [0o640, 0o600, 0o664])
def test_a_replaced_file_keeps_its_mode(tmp_path, kept):
    target = tmp_path / "sheet.json"
    target.write_text("old\n")
    os.chmod(target, kept)
    export.write_json(target, {"a": 1})
    assert mode(target) == kept
    assert target.read_text() == '{\n  "a": 1\n}\n'
    assert os.listdir(tmp_path) == ["sheet.json"]


def test_the_umask_is_never_flipped(tmp_path, monkeypatch):
    def no_umask(_mask):
        raise AssertionError("os.umask called")

    monkeypatch.setattr(os, "umask", no_umask)
    export.write_text(tmp_path / "a.txt", "a\n")
    export.write_text(tmp_path / "a.txt", "b\n")
    assert (tmp_path / "a.txt").read_text() == "b\n"


def test_a_writer_that_replaces_the_temporary_file_still_gives_a_new_files_mode(tmp_path):
    """Some writers put their own file in place of the one they are given (mkstemp makes it
    private); the result still has the mode of the temporary file the kernel created."""
    probe = tmp_path / "probe"
    export.write_text(probe, "x")
    expected = mode(probe)

    def private_then_replace(tmp):
        fd, own = tempfile.mkstemp(dir=tmp_path)
        os.write(fd, b"data")
        os.close(fd)
        os.replace(own, tmp)

    target = tmp_path / "scene.gltf"
    export.atomic_write(target, private_then_replace)
    assert mode(target) == expected and target.read_bytes() == b"data"
    assert sorted(os.listdir(tmp_path)) == ["probe", "scene.gltf"]


def test_the_temporary_file_keeps_the_real_suffix_and_is_a_hidden_sibling(tmp_path):
    seen = []

    def write(tmp):
        seen.append(tmp)
        with open(tmp, "w") as fh:
            fh.write("x")

    export.atomic_write(tmp_path / "side_view.png", write)
    export.atomic_write(tmp_path / "side_view.png", write)
    assert len(set(seen)) == 2  # a new name each time
    for tmp in seen:
        name = os.path.basename(tmp)
        assert os.path.dirname(os.path.abspath(tmp)) == str(tmp_path)
        assert name.startswith(".side_view.png.") and name.endswith(".part.png")


INTERRUPTED = r"""
import sys, time
from rallyarc.output import export

def slow(tmp):
    with open(tmp, "w") as fh:
        fh.write("half a ta")
        fh.flush()
        print("writing", flush=True)
        time.sleep(60)

export.atomic_write(sys.argv[1], slow)
"""


def test_sigint_while_writing_leaves_the_old_file_and_no_partial_file(tmp_path):
    target = tmp_path / "drill_sheet.csv"
    target.write_text("the coach's own file\n")
    proc = subprocess.Popen(
        [sys.executable, "-P", "-c", INTERRUPTED, str(target)],
        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
    )  # fmt: skip
    try:
        assert proc.stdout.readline().strip() == "writing"
        assert len(os.listdir(tmp_path)) == 2  # the partial file is there while it writes
        proc.send_signal(signal.SIGINT)
        _, err = proc.communicate(timeout=60)
    finally:
        proc.kill()
    assert "KeyboardInterrupt" in err
    assert target.read_text() == "the coach's own file\n"
    assert os.listdir(tmp_path) == ["drill_sheet.csv"]
