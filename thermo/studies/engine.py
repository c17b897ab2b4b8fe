"""Where a study's points run: a ``concurrent.futures.Executor``, in chunks, gathered as they finish.

- ``scheduler=None``, ``workers=1``: in this process, one chunk after another (no pool).
- ``scheduler=None``, ``workers=N`` (default: the CPU count): a pool of N local processes.
- ``scheduler="local"``: a Dask ``LocalCluster`` on this machine (one single-threaded worker
  process per core), through ``distributed.Client.get_executor()``.
- ``scheduler="tcp://HOST:PORT"`` (any address ``distributed.Client`` takes): a running Dask
  cluster. Its workers need brakeheat installed and the scenario's folder readable at the same
  path (a shared file system).

Dask is optional (``pip install ".[cluster]"``); asking for it without it installed is a one-line
error. Each chunk's points are run by ``thermo.studies.lanes.run_chunk``; ``run_points`` hands
every finished chunk to a callback (the study checkpoints it and moves its progress bar) in the
order chunks finish, so the result never depends on which worker ran what.
"""
from __future__ import annotations

import contextlib
import os
from concurrent.futures import Executor, Future, as_completed

from thermo.errors import BrakeheatError


class StudyError(BrakeheatError):
    """A study that cannot be set up or run (bad --vary, [uncertainty], scheduler, resume file)."""


class InlineExecutor(Executor):
    """Runs each submitted call at once, in this process (``workers=1``: no pool to start)."""

    def submit(self, fn, /, *args, **kwargs) -> Future:
        future = Future()
        try:
            future.set_result(fn(*args, **kwargs))
        except Exception as error:         # delivered through the future, as a pool would
            future.set_exception(error)
        return future


def default_workers() -> int:
    """Worker processes when none are asked for: the CPU cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:                  # not on every platform
        return max(1, os.cpu_count() or 1)


@contextlib.contextmanager
def study_executor(scheduler: str | None = None, workers: int | None = None):
    """Yield the executor the points run on (see the module notes) and shut it down afterwards.

    Parameters
    ----------
    scheduler : str or None
        None (local processes), "local" (a Dask LocalCluster) or the address of
        a running Dask scheduler [-]
    workers : int or None
        Local processes or LocalCluster workers (default: the CPU cores); 1 with
        no scheduler runs in this process [-]
    """
    if workers is not None and workers < 1:
        raise StudyError(f"--workers {workers}: expected a whole number of at least 1")
    if scheduler is None:
        count = default_workers() if workers is None else workers
        if count == 1:
            yield InlineExecutor()
            return
        from concurrent.futures import ProcessPoolExecutor
        pool = ProcessPoolExecutor(max_workers=count, mp_context=_process_context(), initializer=_worker_start)
        try:
            yield pool
        except BaseException:               # an interrupt or a failure: stop the chunks still running
            for process in list(getattr(pool, "_processes", {}).values()):
                process.terminate()
            pool.shutdown(wait=False, cancel_futures=True)
            raise
        pool.shutdown(wait=True)
        return
    try:
        from distributed import Client, LocalCluster
    except ImportError:
        raise StudyError(f"--scheduler {scheduler}: Dask is not installed; install it with "
                         "pip install \".[cluster]\" (dask and distributed)") from None
    with contextlib.ExitStack() as stack:
        if scheduler == "local":
            cluster = stack.enter_context(LocalCluster(
                n_workers=default_workers() if workers is None else workers, threads_per_worker=1,
                processes=True, dashboard_address=None, silence_logs=True))
            client = stack.enter_context(Client(cluster))
        else:
            try:
                client = stack.enter_context(Client(scheduler, timeout="20s"))
            except (OSError, TimeoutError, ValueError) as error:
                raise StudyError(f"--scheduler {scheduler}: cannot reach a Dask scheduler there ({error})") from None
        yield client.get_executor(pure=False)


def _process_context():
    """How local workers start: forked where the platform can and this process runs one thread (a
    fork copies no other thread's locks, and needs no importable main script, so a study runs
    from a notebook or a script on standard input); otherwise spawned (a clean interpreter; the
    compiled kernels come from numba's on-disk cache)."""
    import multiprocessing
    import threading
    if "fork" in multiprocessing.get_all_start_methods() and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context("spawn")


def _worker_start() -> None:
    """A local worker process leaves Ctrl-C to the study (which stops it): no traceback from each worker."""
    import signal
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def chunks_of(todo: list, chunk_size: int) -> list[list]:
    """``todo`` in consecutive chunks of at most ``chunk_size`` items."""
    size = max(1, int(chunk_size))
    return [todo[i:i + size] for i in range(0, len(todo), size)]


def default_chunk_size(points: int, workers: int) -> int:
    """Points per chunk: the points shared evenly between the workers, at most ``MAX_CHUNK`` (a
    checkpoint at least every ``MAX_CHUNK`` points a worker finishes). A chunk's points run side by
    side (``thermo.studies.lanes``), where a point costs about a fifth of one run alone, so few wide
    chunks beat many narrow ones: nine points on two workers go as chunks of five and four."""
    return int(max(1, min(MAX_CHUNK, -(-points // max(1, workers)))))


# measured with 1000 demo samples, 2 workers, full Newton side by side (python -m thermo.bench, sweep
# figure's command, one session): chunks of 32 48 s, of 64 41 s, peak memory 1.1 GB either way
MAX_CHUNK = 64


def run_points(job, todo, executor: Executor, chunk_size: int, on_chunk) -> None:
    """Run ``todo`` (``[(index, values), ...]``) in chunks on ``executor``; ``on_chunk(results)``
    gets each finished chunk's ``[(index, point), ...]`` as it arrives. An exception (an interrupt
    included) cancels the chunks not yet started and is raised."""
    from thermo.studies.lanes import run_chunk
    from concurrent.futures.process import BrokenProcessPool
    futures = [executor.submit(run_chunk, job, chunk) for chunk in chunks_of(list(todo), chunk_size)]
    try:
        for future in as_completed(futures):
            try:
                results = future.result()
            except BrokenProcessPool:
                raise StudyError("a worker process ended abruptly (killed, or out of memory); the points "
                                 "finished so far are in the study file, and --resume continues") from None
            on_chunk(results)
    finally:
        for future in futures:
            future.cancel()


def run_study(kind: str, path, job, values: list, definition: dict, *, scheduler=None, workers=None,
              chunk_size=None, checkpoint=None, resume=False, progress=None):
    """Run every point of a study (``values``: one list of key values per point) and return its
    ``StudyRecord``. With ``checkpoint`` (a file path) the record is written there, atomically,
    after every finished chunk; with ``resume`` the finished points already in that file are kept
    and only the rest run. ``progress(points_done, points_total)`` is called as chunks finish."""
    import json
    from pathlib import Path

    from thermo.output.study_file import StudyRecord, resumable, write_study_hdf5
    from thermo.scenario import load_scenario
    if chunk_size is not None and (isinstance(chunk_size, bool) or not isinstance(chunk_size, int) or chunk_size < 1):
        raise StudyError(f"--chunk-size {chunk_size}: expected a whole number of at least 1")
    base = load_scenario(path, job.overrides)
    record = StudyRecord(kind, base.name, base.text, json.loads(json.dumps(definition)), tuple(job.keys),
                         json.loads(json.dumps(values)))
    if resume:
        if checkpoint is None:
            raise StudyError("--resume needs --out DIR, the folder holding the study file to continue")
        if not Path(checkpoint).is_file():
            raise StudyError(f"{checkpoint}: --resume: no study file there to continue")
        record = resumable(Path(checkpoint), record)
    todo = [(i, v) for i, (v, p) in enumerate(zip(record.values, record.points)) if p is None]
    total = len(record.values)
    size = chunk_size if chunk_size is not None else default_chunk_size(len(todo), workers or default_workers())

    def on_chunk(results) -> None:
        for index, point in results:
            record.points[index] = point
        if checkpoint is not None:
            write_study_hdf5(record, checkpoint)
        if progress is not None:
            progress(record.done, total)

    if progress is not None:
        progress(record.done, total)
    if checkpoint is not None:
        write_study_hdf5(record, checkpoint)        # from the start, the file says what it holds
    if todo:
        with study_executor(scheduler, workers) as executor:
            run_points(job, todo, executor, size, on_chunk)
    return record
