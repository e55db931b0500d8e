"""The study's dataset folder: one Parquet partition per chunk and a manifest of what is done.

``part-000012.parquet`` holds chunk 12; ``manifest.json`` names the study, its fingerprint (what
its results depend on), the number of chunks and the finished ones as ranges. A partition is
written atomically before the manifest lists it, so after a crash every listed partition is
whole; one written but not yet listed is played again. A folder with the same study's manifest
is resumed; any other non-empty folder is refused unless ``force``.
"""

from __future__ import annotations

import json
from pathlib import Path

from rallyarc.errors import InputError
from rallyarc.output.export import atomic_write, check_writable, write_json

MANIFEST = "manifest.json"
FORMAT = "rallyarc-study-dataset-1"


def partition_name(k):
    return f"part-{k:06d}.parquet"


def _ranges(done):
    out = []
    for k in sorted(done):
        if out and out[-1][1] == k:
            out[-1][1] = k + 1
        else:
            out.append([k, k + 1])
    return out


def read_manifest(folder):
    """The manifest of a study folder, with ``done`` as a set of chunk indices; an error
    naming the folder when it is not one."""
    path = Path(folder) / MANIFEST
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
        if data.get("format") != FORMAT:
            raise ValueError
        data["done"] = {k for a, b in data["done"] for k in range(int(a), int(b))}
    except (OSError, ValueError, TypeError, KeyError):
        raise InputError(f"{folder}: not a study dataset (no readable {MANIFEST})") from None
    return data


class Store:
    """Partitions and manifest of one study in one folder."""

    def __init__(self, folder, study, done, rows):
        self.folder, self.study = Path(folder), study
        self.done, self.rows = set(done), int(rows)

    @classmethod
    def open(cls, folder, study, force=False, option="--out"):
        """Resume the same study's folder, start an empty or new one, or refuse."""
        folder = Path(folder)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"{option}: {folder} is a file, not a folder")
        check_writable(folder, option)
        entries = sorted(folder.iterdir()) if folder.is_dir() else []
        if (folder / MANIFEST).is_file():
            try:
                data = read_manifest(folder)
            except InputError:
                data = None
            if data is not None and data["fingerprint"] == study.fingerprint:
                done = {k for k in data["done"] if (folder / partition_name(k)).is_file()}
                return cls(folder, study, done, data.get("rows", 0))
        if entries and not force:
            what = "another study's results" if (folder / MANIFEST).exists() else "other files"
            raise InputError(
                f"{option}: {folder} holds {what}; add --force to replace them, or give a new "
                "folder (the same study file resumes in its own folder)"
            )
        for entry in entries:  # only what a study writes; anything else is left alone
            if entry.name == MANIFEST or (
                entry.name.startswith("part-") and entry.suffix == ".parquet"
            ):
                entry.unlink()
        store = cls(folder, study, set(), 0)
        folder.mkdir(parents=True, exist_ok=True)
        store._write_manifest()
        return store

    def write(self, k, data, rows):
        """Chunk ``k``'s Parquet bytes, then the manifest listing it."""

        def put(tmp):
            with open(tmp, "wb") as fh:
                fh.write(data)

        atomic_write(self.folder / partition_name(k), put)
        self.done.add(int(k))
        self.rows += int(rows)
        self._write_manifest()

    def _write_manifest(self):
        s = self.study
        write_json(
            self.folder / MANIFEST,
            {
                "format": FORMAT,
                "study": s.name,
                "study_file": s.where,
                "kind": s.kind,
                "design": s.design,
                "seed": s.seed,
                "fingerprint": s.fingerprint,
                "modes": list(s.modes),
                "chunks": s.n_chunks,
                "chunk": s.chunk,
                "parameters": [
                    {
                        "name": p.name,
                        "column": p.column,
                        "unit": p.unit,
                        "low": p.low,
                        "high": p.high,
                        "steps": p.steps,
                        "distribution": p.distribution,
                    }
                    for p in s.parameters
                ],
                "rows": self.rows,
                "done": _ranges(self.done),
                "complete": len(self.done) == s.n_chunks,
            },
        )
