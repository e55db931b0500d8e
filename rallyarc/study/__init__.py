"""Large studies: a stroke's parameters or a pattern pair's variants over ranges, in chunks on a
Dask cluster or the local cores, streamed to a partitioned Parquet dataset.

- :mod:`.spec`: study files and their design points (:func:`load_study`).
- :mod:`.chunks`: one chunk played into the bytes of one Parquet partition.
- :mod:`.store`: the dataset folder, its manifest, resuming.
- :mod:`.engine`: the run over ``dask.distributed`` (:func:`run_study`).
- :mod:`.summary`: per-parameter marginal summaries read from the dataset
  (:func:`summarize_study`).

A chunk's results depend on the study file only (its seed, design and chunk size), so a run on
one process, the local cores or a cluster of many machines writes the same partitions.
"""

from rallyarc.study.chunks import play_chunk
from rallyarc.study.engine import StudyRun, run_study
from rallyarc.study.spec import DEFAULT_CHUNK, Study, StudyParameter, design_values, load_study
from rallyarc.study.store import MANIFEST, partition_name, read_manifest

__all__ = [
    "DEFAULT_CHUNK",
    "MANIFEST",
    "Study",
    "StudyParameter",
    "StudyRun",
    "design_values",
    "load_study",
    "partition_name",
    "play_chunk",
    "read_manifest",
    "run_study",
]
