"""The one worker pool: where everything parallel in sizer runs (schedule rows, span-table cells,
the warping tiers of many sections).

- This process alone: `jobs = 1`, or inside a worker (a worker never starts workers of its own).
- Local processes: the standard library's `concurrent.futures.ProcessPoolExecutor`, never more
  processes than this process may use cores. On Linux, while this process runs a single thread,
  the workers are forked from it after it has imported what the work needs (`warm`), so they start
  at once with it loaded; elsewhere (fork is unsafe on macOS and absent on Windows) or beside other
  threads (a progress bar's), each is a fresh interpreter (spawn) that imports it itself. The
  results are the same either way.
- A Dask cluster: `cluster` names an existing Dask distributed scheduler (sizer.cluster); its
  workers need sizer installed and may not share this machine's files, so the work's results are
  kept (in the cache store) by this process.

Bad input inside a task comes back as data (`error_result`: the fields of InputError), so that it
crosses process and network boundaries; `result_error` turns it back into the InputError.
"""

from __future__ import annotations

import gc
import os
import sys
from typing import Any, Callable, Iterable, Iterator

from sizer.errors import InputError

# what schedule rows and span-table cells need (numpy, the analysis, the sections, the checks, the sizing)
JOB_MODULES = ("sizer.api", "sizer.checks", "sizer.design", "sizer.sections", "sizer.sizing")


def default_jobs() -> int:
    """The cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # pragma: no cover - not on Linux
        return max(1, os.cpu_count() or 1)


def check_workers(jobs: int | None, cluster: str | None) -> None:
    """--jobs and --cluster: at least one job, not both (more jobs than cores run on the cores: see Workers)."""
    if jobs is not None and jobs < 1:
        raise InputError("", "--jobs", f"{jobs} is not a number of processes", "give --jobs 1 or more (default: every core)")
    if jobs is not None and cluster:
        raise InputError("", "--jobs", "--jobs is for the local cores and --cluster for a Dask cluster; both were given", "give one of them")


def in_worker_process() -> bool:
    """Whether this process is a multiprocessing worker (a pool's, or a Dask worker's). A worker always
    has multiprocessing loaded, so a process that has not loaded it is none (and need not pay for the
    import)."""
    module = sys.modules.get("multiprocessing")
    return module is not None and module.parent_process() is not None


def local_context() -> Any:
    """The start method of local workers: fork on Linux while this process runs one thread (a fork
    copies only the calling thread, so a lock another thread holds could never be released in the
    copy), else spawn."""
    import multiprocessing
    import threading

    if sys.platform.startswith("linux") and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context("spawn")


def warm_up(modules: tuple[str, ...]) -> None:
    """When a worker process starts: leave Ctrl-C to the parent (it keeps what is finished and stops the
    rest), and import `modules`."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    import_modules(modules)


def import_modules(modules: tuple[str, ...]) -> None:
    """Import `modules` (by name) into this process."""
    import importlib

    for name in modules:
        importlib.import_module(name)


def error_result(error: InputError) -> dict:
    """An InputError as a plain result (it crosses processes and the network as data)."""
    return {"error": {"file": error.file, "key": error.key, "problem": error.problem, "fix": error.fix, "line": error.line}}


def result_error(result: dict) -> InputError | None:
    """The InputError a result carries, if any."""
    fields = result.get("error")
    return InputError(**fields) if fields else None


class Workers:
    """Where work runs: this process, local worker processes, or a Dask cluster (see the module
    docstring). `start()` opens the pool (as a context, entering starts it); `submit` sends one task,
    `completed` gives the futures as they finish; leaving the context shuts the local processes down
    or closes the client (the cluster is left running).

    Started before the work is prepared, forked workers are copies of this process with `warm`
    imported first; spawned ones start and import `warm` while this process reads the input (one
    trivial task each starts them all); a cluster's address is tried at once."""

    def __init__(self, jobs: int | None = None, cluster: str | None = None, warm: tuple[str, ...] = JOB_MODULES) -> None:
        check_workers(jobs, cluster)
        self.cluster = cluster
        self.warm = warm
        # never more processes than cores, and none inside a worker
        self.count = 1 if cluster or in_worker_process() else min(jobs or default_jobs(), default_jobs())
        self.pool: Any = None
        self.client: Any = None

    def __enter__(self) -> "Workers":
        self.start()
        return self

    def __exit__(self, *exc: Any) -> None:
        self.close()

    @property
    def parallel(self) -> bool:
        """Whether starting opens anything (a cluster, or more than one local process)."""
        return bool(self.cluster) or self.count > 1

    @property
    def started(self) -> bool:
        """Whether tasks go to other processes (local workers or a cluster)."""
        return self.pool is not None or self.client is not None

    @property
    def keeps_here(self) -> bool:
        """Whether the workers share this machine's cache folder (local processes), so that a task may
        keep its own result there."""
        return self.pool is not None

    @property
    def where(self) -> str:
        """Where the work ran, for the output's notes."""
        if self.client is not None:
            return f"the Dask cluster at {self.cluster}"
        return f"{self.count} local processes" if self.pool is not None else "1 local process"

    def start(self) -> None:
        """Open the pool, once: a cluster's client, or `count` local processes when more than one."""
        if self.started or not self.parallel:
            return
        if self.cluster:
            from sizer.cluster import cluster_client

            self.client = cluster_client(self.cluster)
        else:
            self.pool = self._local_pool()

    def _local_pool(self) -> Any:
        from concurrent.futures import ProcessPoolExecutor

        from sizer.cache_store import cache_root, code_fingerprint

        context = local_context()
        forked = context.get_start_method() == "fork"
        if forked:
            import_modules(self.warm)
            cache_root()  # the cache folder (platformdirs) and the code fingerprint found once here, not in each worker
            code_fingerprint()
            gc.freeze()  # the workers' copies of this process's objects stay out of their collections: no copy-on-write by them
        pool = ProcessPoolExecutor(self.count, mp_context=context, initializer=warm_up, initargs=(self.warm,))
        for _ in range(self.count):
            pool.submit(int)  # the first submit forks every worker
        if forked:
            gc.unfreeze()  # this process collects as before (a notebook's objects are not kept for good)
        return pool

    def close(self) -> None:
        """Stop the local processes (work not begun is dropped) or close the cluster's client."""
        if self.pool is not None:
            self.pool.shutdown(wait=True, cancel_futures=True)
            self.pool = None
        if self.client is not None:
            self.client.close()
            self.client = None

    def submit(self, function: Callable[..., Any], *args: Any, key: str | None = None) -> Any:
        """A future of function(*args) on the started pool (`key` names the task on a cluster)."""
        if self.client is not None:
            return self.client.submit(function, *args, key=key, pure=False)
        return self.pool.submit(function, *args)

    def completed(self, futures: Iterable[Any]) -> Iterator[Any]:
        """The futures as they finish: those finished already first, in the order given."""
        futures = list(futures)
        done = [future for future in futures if future.done()]
        yield from done
        taken = {id(future) for future in done}
        waiting = [future for future in futures if id(future) not in taken]
        if not waiting:
            return
        if self.client is not None:
            from distributed import as_completed

            yield from as_completed(waiting, loop=self.client.loop)
        else:
            from concurrent.futures import as_completed as local_completed

            yield from local_completed(waiting)

    def cancel(self, futures: list[Any]) -> None:
        """Cancel the futures not yet begun (a running one finishes, unheard)."""
        if self.client is not None:
            if futures:
                self.client.cancel(futures)
            return
        for future in futures:
            future.cancel()
