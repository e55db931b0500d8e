"""Running a study: chunks on a Dask cluster (or in this process), streamed into the dataset.

:func:`run_study` hands the chunks not yet done to ``dask.distributed``: an existing scheduler
(``scheduler``, an address), or a local cluster of ``workers`` processes started and stopped
here (default: one per core). At most a few chunks per worker thread are in flight, and each
finished chunk is written and listed in the manifest at once, so the client's memory stays flat
however large the study. A worker lost mid-run costs only its chunks in flight: the scheduler
plays them again elsewhere (``retries`` more times if a chunk raises). ``workers=1`` without a
scheduler plays every chunk in this process, with the same results.
"""

from __future__ import annotations

import os
import time
from dataclasses import dataclass, field

from rallyarc.study.chunks import play_chunk
from rallyarc.study.store import Store

#: Chunks in flight per worker thread.
IN_FLIGHT = 2
#: Times the scheduler plays a chunk again after it raised (a lost worker does not count).
RETRIES = 2


@dataclass
class StudyRun:
    """What a run did: chunks played now, chunks found done, rows written now, seconds."""

    folder: object
    played: list = field(default_factory=list)
    skipped: int = 0
    rows: int = 0
    seconds: float = 0.0
    dashboard: str | None = None


def _cores():
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:
        return os.cpu_count() or 1


def run_study(
    study,
    folder,
    scheduler=None,
    workers=None,
    force=False,
    progress=False,
    on_chunk=None,
    client=None,
    announce=None,
):
    """Play every chunk of ``study`` not yet in ``folder`` and write its partition.

    Parameters
    ----------
    study : rallyarc.study.Study
    folder : path
        The dataset folder; the same study's folder is resumed, anything else is refused
        unless ``force``.
    scheduler : str, optional
        Address of a running Dask scheduler (default: the study file's ``scheduler``, else a
        local cluster).
    workers : int, optional
        Processes of the local cluster (default every core); 1 plays in this process.
    progress : bool
        A progress bar of chunks with the estimated time left.
    on_chunk : callable, optional
        Called with each finished chunk's index after it is written.
    client : distributed.Client, optional
        A client to use as it is (not closed here).
    announce : callable, optional
        Called with one line of text, the dashboard's address, when a cluster is used.
    """
    from tqdm import tqdm

    t0 = time.perf_counter()
    store = Store.open(folder, study, force)
    todo = [k for k in range(study.n_chunks) if k not in store.done]
    run = StudyRun(store.folder, skipped=len(store.done))
    bar = tqdm(
        total=study.n_chunks,
        initial=len(store.done),
        desc=study.name[:24],
        unit="chunk",
        disable=not progress,
        leave=False,
    )

    def finished(k, data, rows):
        store.write(k, data, rows)
        run.played.append(k)
        run.rows += rows
        bar.update(1)
        if on_chunk is not None:
            on_chunk(k)

    scheduler = scheduler or study.scheduler
    try:
        if client is None and scheduler is None and workers == 1:
            for k in todo:
                finished(*play_chunk(study, k))
        elif todo:
            _distributed(study, todo, finished, scheduler, workers, client, announce, run)
    finally:
        bar.close()
    run.seconds = time.perf_counter() - t0
    return run


def _distributed(study, todo, finished, scheduler, workers, client, announce, run):
    from contextlib import ExitStack

    from distributed import Client, LocalCluster, as_completed

    with ExitStack() as stack:
        if client is None:
            if scheduler is None:
                cluster = stack.enter_context(
                    LocalCluster(
                        n_workers=workers or _cores(),
                        threads_per_worker=1,
                        processes=True,
                        host="127.0.0.1",
                        dashboard_address=":0",
                    )
                )
                client = stack.enter_context(Client(cluster))
            else:
                client = stack.enter_context(_connect(Client, scheduler))
        run.dashboard = client.dashboard_link
        if announce is not None and run.dashboard:
            announce(f"dask dashboard: {run.dashboard}")
        threads = max(1, sum(client.nthreads().values()))
        window = IN_FLIGHT * threads
        pending = iter(todo)
        tag = study.fingerprint[:12]

        def submit(k):
            return client.submit(
                play_chunk, study, k, key=f"study-{tag}-{k}", retries=RETRIES, pure=False
            )

        first = [submit(k) for _, k in zip(range(window), pending, strict=False)]
        queue = as_completed(first)
        for fut in queue:
            k, data, rows = fut.result()
            fut.release()
            finished(k, data, rows)
            nxt = next(pending, None)
            if nxt is not None:
                queue.add(submit(nxt))


def _connect(client_class, address):
    """A client of the scheduler at ``address``; one line naming it when it cannot be reached."""
    from rallyarc.errors import InputError

    try:
        return client_class(address, timeout="10s")
    except (OSError, TimeoutError) as exc:
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"scheduler {address}: cannot connect ({reason})") from None
