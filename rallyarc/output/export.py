"""Writing results to files: atomically, and never over a user's file without ``force``.

Every file is first written to a temporary file in the same folder and then moved into place
with :func:`os.replace`, so an error or Ctrl-C leaves either the old file or none, never half
of a new one.
"""

from __future__ import annotations

import os
import secrets
import shutil
import signal
import tempfile
import threading
from pathlib import Path

from rallyarc.errors import InputError
from rallyarc.output.jsonsafe import dumps


def check_targets(paths, force, option="--out"):
    """Refuse (one line naming ``option`` and the file) before any work if a target is a
    folder, exists without ``force``, or cannot be written: its nearest existing parent is a
    file, or no file can be created there."""
    for path in paths:
        path = Path(path)
        if path.is_dir():
            raise InputError(f"{option}: {path} is a folder, not a file")
        if path.exists() and not force:
            raise InputError(f"{option}: {path} exists; add --force to overwrite it")
        check_writable(path.parent if str(path.parent) else Path("."), option)


def check_writable(folder, option="--out"):
    """Refuse (one line naming ``option``) unless files can be written in ``folder``: the
    folder, or the nearest of its parents that exists, is a folder in which a new file can be
    created (missing folders are made when writing)."""
    folder = Path(folder)
    existing = folder
    while not existing.exists() and existing != existing.parent:
        existing = existing.parent
    if not existing.is_dir():
        if existing == folder:
            raise InputError(f"{option}: {folder} is a file, not a folder")
        raise InputError(f"{option}: {existing} is a file, so the folder {folder} cannot be made")
    try:
        fd, probe = tempfile.mkstemp(prefix=".rallyarc-probe-", dir=existing)
    except OSError as exc:
        raise InputError(f"{option}: cannot write in {existing}: {exc.strerror}") from None
    os.close(fd)
    os.unlink(probe)


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
    """``data`` as strict JSON: non-finite numbers are written as null, never NaN."""
    return write_text(path, dumps(data) + "\n")


def write_frame(path, frame):
    """A pandas DataFrame as CSV or Parquet (pyarrow), chosen by the file's suffix."""
    suffix = Path(path).suffix.lower()
    if suffix == ".csv":
        return atomic_write(path, lambda tmp: frame.to_csv(tmp, index=False))
    if suffix == ".parquet":
        return atomic_write(path, lambda tmp: frame.to_parquet(tmp, index=False, engine="pyarrow"))
    raise InputError(f"{path}: unknown table format {suffix!r}; use .csv or .parquet")


def write_folder(folder, write):
    """Produce a whole output folder at once: ``write(staging)`` writes every file into a new
    hidden sibling folder and returns their paths; the files of ``folder`` that the run does not
    write are linked (or copied) in beside them, and the staging folder then takes the place of
    ``folder``. An error, Ctrl-C or SIGTERM before the swap leaves the old folder as it was and
    removes the staging one; the swap itself runs with those signals held back, so the folder is
    either the old one or the new one, never a mix. Returns the paths as they are in ``folder``.

    A folder given through a symbolic link is replaced where the link points. The folder this
    process works in (or one holding it) is not moved away: its files are written in place,
    each atomically, as :func:`atomic_write` does.
    """
    given = Path(folder)
    folder = given.resolve()
    cwd = Path.cwd().resolve()
    if cwd == folder or folder in cwd.parents:
        return [given / Path(p).relative_to(folder) for p in write(folder)]
    folder.parent.mkdir(parents=True, exist_ok=True)
    staging = _new_folder(folder)
    try:
        written = [Path(p) for p in write(staging)]
        if folder.is_dir():
            _keep_others(folder, staging)
        _swap(folder, staging)
    except BaseException:
        shutil.rmtree(staging, ignore_errors=True)
        raise
    return [given / p.relative_to(staging) for p in written]


def _new_folder(folder):
    """A new empty hidden sibling of ``folder`` (mode 0777 less the umask, or the mode of the
    folder it will replace)."""
    while True:
        staging = folder.parent / f".{folder.name}.{secrets.token_hex(4)}.part"
        try:
            os.mkdir(staging, 0o777)
        except FileExistsError:
            continue
        if folder.is_dir():
            shutil.copymode(folder, staging)
        return staging


def _link_or_copy(src, dst):
    try:
        os.link(src, dst)
    except OSError:
        shutil.copy2(src, dst)


def _keep_others(folder, staging):
    """Bring every entry of ``folder`` that the run did not write into ``staging``."""
    for entry in folder.iterdir():
        target = staging / entry.name
        if target.exists() or target.is_symlink():
            continue
        if entry.is_symlink():
            os.symlink(os.readlink(entry), target)
        elif entry.is_dir():
            shutil.copytree(entry, target, symlinks=True, copy_function=_link_or_copy)
        else:
            _link_or_copy(entry, target)


def _swap(folder, staging):
    """Put ``staging`` in the place of ``folder`` with Ctrl-C and SIGTERM held back."""
    held = {signal.SIGINT, signal.SIGTERM}
    main_thread = threading.current_thread() is threading.main_thread()
    if main_thread:
        signal.pthread_sigmask(signal.SIG_BLOCK, held)
    try:
        old = None
        if folder.is_dir():
            old = folder.parent / f".{folder.name}.{secrets.token_hex(4)}.old"
            os.rename(folder, old)
        os.rename(staging, folder)
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)
    finally:
        if main_thread:
            signal.pthread_sigmask(signal.SIG_UNBLOCK, held)
