"""Writing results to files: atomically, and never over a user's file without ``force``.

Every file is first written to a temporary file in the same folder and then moved into place
with :func:`os.replace`, so an error or Ctrl-C leaves either the old file or none, never half
of a new one.
"""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path

from rallyarc.errors import InputError


def check_targets(paths, force, option="--out"):
    """Refuse (one line naming the file) if any target exists and ``force`` is not given."""
    for path in paths:
        path = Path(path)
        if path.exists() and not force:
            raise InputError(f"{option}: {path} exists; add --force to overwrite it")
        if path.exists() and path.is_dir():
            raise InputError(f"{option}: {path} is a folder, not a file")


def atomic_write(path, write):
    """Call ``write(tmp_path)`` to produce the file, then move it to ``path``."""
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    folder.mkdir(parents=True, exist_ok=True)
    # the temporary file keeps the real suffix, for writers that choose the format by it
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=f".part{path.suffix}", dir=folder)
    os.close(fd)
    try:
        write(tmp)
        # mkstemp makes the file private (0600); give it the mode a plain new file would get
        os.chmod(tmp, _existing_mode(path))
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return path


def _existing_mode(path):
    """The mode of the file being replaced, or what the process's umask gives a new file."""
    try:
        return os.stat(path).st_mode & 0o7777
    except FileNotFoundError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def write_text(path, text):
    def write(tmp):
        with open(tmp, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)

    return atomic_write(path, write)


def write_json(path, data):
    return write_text(path, json.dumps(data, indent=2) + "\n")


def write_frame(path, frame):
    """A pandas DataFrame as CSV or Parquet (pyarrow), chosen by the file's suffix."""
    suffix = Path(path).suffix.lower()
    if suffix == ".csv":
        return atomic_write(path, lambda tmp: frame.to_csv(tmp, index=False))
    if suffix == ".parquet":
        return atomic_write(path, lambda tmp: frame.to_parquet(tmp, index=False, engine="pyarrow"))
    raise InputError(f"{path}: unknown table format {suffix!r}; use .csv or .parquet")
