"""Writing results to files: atomically, and never over a user's file without ``force``.

Every file is first written to a temporary file in the same folder and then moved into place
with :func:`os.replace`, so an error or Ctrl-C leaves either the old file or none, never half
of a new one.
"""

from __future__ import annotations

import json
import os
import secrets
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
    """Call ``write(tmp_path)`` to produce the file, then move it to ``path``.

    The temporary file is a new sibling of ``path``, created with mode 0666 so that the kernel
    applies the process's umask, as for any new file; a file being replaced keeps its mode.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    folder.mkdir(parents=True, exist_ok=True)
    tmp = None
    try:
        tmp, mode = _new_sibling(folder, path)
        write(tmp)
        # the writer may have replaced the file; give it back the mode it is meant to have
        os.chmod(tmp, _existing_mode(path, mode))
        os.replace(tmp, path)
    except BaseException:
        if tmp is not None and os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return path


def _new_sibling(folder, path):
    """A new empty file beside ``path`` and the mode the umask gave it. The name keeps the real
    suffix, for writers that choose the format by it."""
    flags = os.O_CREAT | os.O_EXCL | os.O_WRONLY | getattr(os, "O_CLOEXEC", 0)
    while True:
        tmp = folder / f".{path.name}.{secrets.token_hex(4)}.part{path.suffix}"
        try:
            fd = os.open(tmp, flags, 0o666)
        except FileExistsError:  # another writer's name: draw again
            continue
        try:
            return str(tmp), os.fstat(fd).st_mode & 0o7777
        finally:
            os.close(fd)


def _existing_mode(path, new_mode):
    """The mode of the file being replaced, or ``new_mode`` when there is none."""
    try:
        return os.stat(path).st_mode & 0o7777
    except FileNotFoundError:
        return new_mode


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
