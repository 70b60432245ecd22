"""Many independent jobs (schedule rows, span-table cells) on the local cores or on a Dask cluster.

- Local: `concurrent.futures.ProcessPoolExecutor` with the spawn start method (`jobs` processes);
  one job or `jobs = 1` runs in this process.
- Cluster: `--cluster ADDRESS`, an existing Dask distributed scheduler (`pip install 'sizer[cluster]'`);
  its workers need sizer installed. Jobs carry everything they read (the member, the catalogue's
  text), so the workers need none of the user's files.
- Results come back in the input's order and are the same whatever ran them: a job is a pure
  function of its payload.
- Resume: each finished result is kept at once in the cache folder (`runs/`), keyed by a hash of
  the job's content and sizer's code; a later run with the same key takes it instead of redoing it.
- A rich progress bar on stderr shows the count done and an estimate of the time left.

A job's function returns a JSON-ready dict; bad input inside a job comes back as {"error": {...}}
(the fields of InputError) so that it crosses process and network boundaries as plain data.
"""

from __future__ import annotations

import hashlib
import json
import os
from dataclasses import asdict, dataclass, field, fields, is_dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any, Callable, Sequence

from sizer.errors import InputError
from sizer.files import cache_root, write_atomic

Work = Callable[[Any], dict]
RUNS_FOLDER = "runs"
COPIES_FOLDER = "catalogue-copies"


@dataclass(frozen=True)
class Job:
    """One unit of work: `payload` for the work function, `key` its content hash, `label` for the
    progress bar."""

    key: str
    payload: Any
    label: str = ""


@dataclass
class RunSummary:
    """How a batch of jobs was run: counts and where (for the output's notes)."""

    total: int = 0
    resumed: int = 0
    ran: int = 0
    where: str = ""

    def note(self, noun: str) -> str:
        """One line for the assumptions: how many jobs ran where and how many were taken from an earlier run."""
        text = f"{self.total} {noun}: {self.ran} worked out now on {self.where}"
        if self.resumed:
            text += f", {self.resumed} taken from an earlier run with identical input and the same sizer code (kept in the cache folder)"
        return text + "."


@dataclass(frozen=True)
class CatalogueText:
    """One catalogue file carried inside a job: its name (basename), folder number and text."""

    name: str
    folder: int
    text: str


@dataclass(frozen=True)
class ShippedCatalogue:
    """The catalogue files a job reads, carried as text so that any worker sees the same catalogue."""

    files: tuple[CatalogueText, ...] = field(default_factory=tuple)

    @property
    def digest(self) -> str:
        return content_hash([asdict(item) for item in self.files])


# ----------------------------------------------------------------------------------------------
# keys

def content_hash(*parts: Any) -> str:
    """sha256 of the parts' canonical JSON: sorted keys, dataclasses as their fields, sets sorted, so the
    same content gives the same key in every process (set order varies with string hashing)."""
    text = json.dumps(parts, sort_keys=True, default=_canonical, ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _canonical(value: Any) -> Any:
    """A JSON-ready stand-in for what json cannot write itself."""
    if is_dataclass(value) and not isinstance(value, type):
        return {"__type__": type(value).__name__, **{item.name: getattr(value, item.name) for item in fields(value)}}
    if isinstance(value, (set, frozenset)):
        return sorted(value, key=lambda item: json.dumps(item, sort_keys=True, default=_canonical))
    if isinstance(value, Path):
        return str(value)
    raise TypeError(f"no canonical form for {type(value).__name__}")


@lru_cache(maxsize=1)
def code_fingerprint() -> str:
    """A hash of sizer's own code (every module's path, size and modification time), its version and
    sectionproperties' version: a kept result is reused only by the same code."""
    import sizer
    from sizer.sections.cache import sectionproperties_version

    package = Path(sizer.__file__).parent
    parts = [sizer.__version__, sectionproperties_version()]
    for source in sorted(package.rglob("*.py")):
        status = source.stat()
        parts.append(f"{source.relative_to(package)}|{status.st_size}|{status.st_mtime_ns}")
    return content_hash(parts)


# ----------------------------------------------------------------------------------------------
# catalogues carried inside jobs

def ship_catalogue(files: Sequence[Path]) -> ShippedCatalogue:
    """The catalogue files (as `load_catalogue` found them) as text, each in a folder number of its own
    parent folder, so that files of the same name in two folders stay apart."""
    folders: dict[Path, int] = {}
    shipped = []
    for path in files:
        folder = folders.setdefault(Path(path).resolve().parent, len(folders))
        shipped.append(CatalogueText(Path(path).name, folder, Path(path).read_text(encoding="utf-8")))
    return ShippedCatalogue(tuple(shipped))


def catalogue_folders(catalogue: ShippedCatalogue) -> list[Path]:
    """Folders holding exact copies of the shipped catalogue files (made once in the cache folder,
    `catalogue-copies/<digest>/`), to pass as --catalogue paths."""
    return list(_copied_folders(catalogue.digest, catalogue))


@lru_cache(maxsize=16)
def _copied_folders(digest: str, catalogue: ShippedCatalogue) -> tuple[Path, ...]:
    base = cache_root() / COPIES_FOLDER / digest
    folders = sorted({item.folder for item in catalogue.files})
    for item in catalogue.files:
        path = base / str(item.folder) / item.name
        if not path.is_file() or path.read_text(encoding="utf-8") != item.text:
            write_atomic(path, item.text)
    return tuple(base / str(folder) for folder in folders)


# ----------------------------------------------------------------------------------------------
# errors as data

def error_result(error: InputError) -> dict:
    """An InputError as a plain result (it crosses processes and the network as data)."""
    return {"error": {"file": error.file, "key": error.key, "problem": error.problem, "fix": error.fix, "line": error.line}}


def result_error(result: dict) -> InputError | None:
    """The InputError a result carries, if any."""
    fields = result.get("error")
    return InputError(**fields) if fields else None


# ----------------------------------------------------------------------------------------------
# kept results

def _kept_path(key: str) -> Path:
    return cache_root() / RUNS_FOLDER / key[:2] / f"{key}.json"


def read_kept(key: str) -> dict | None:
    """A result kept by an earlier run under `key`, or None (missing or damaged: redo it)."""
    try:
        kept = json.loads(_kept_path(key).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    return kept.get("result") if isinstance(kept, dict) and kept.get("key") == key and isinstance(kept.get("result"), dict) else None


def keep(key: str, result: dict) -> None:
    """Keep a finished result (never one that is bad input: that is redone, and fails again, next time)."""
    if "error" not in result:
        write_atomic(_kept_path(key), json.dumps({"key": key, "result": result}, ensure_ascii=False))


# ----------------------------------------------------------------------------------------------
# running

def default_jobs() -> int:
    """The cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # pragma: no cover - not on Linux
        return max(1, os.cpu_count() or 1)


def check_workers(jobs: int | None, cluster: str | None) -> None:
    """--jobs and --cluster: at least one job, not both."""
    if jobs is not None and jobs < 1:
        raise InputError("", "--jobs", f"{jobs} is not a number of processes", "give --jobs 1 or more (default: every core)")
    if jobs is not None and cluster:
        raise InputError("", "--jobs", "--jobs is for the local cores and --cluster for a Dask cluster; both were given", "give one of them")


class JobFailed(Exception):
    """Bad input met in the job at `index` (stops a run that stops on errors)."""

    def __init__(self, index: int, error: InputError) -> None:
        super().__init__(str(error))
        self.index, self.error = index, error


def warm_up() -> None:
    """When a worker process starts: leave Ctrl-C to the parent (it keeps what is finished and stops the
    rest), and import what every job needs (numpy, scipy, the analysis and the checks)."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    import sizer.api  # noqa: F401
    from sizer import checks, design, sections  # noqa: F401


class Workers:
    """Where the jobs run: this process, local worker processes, or a Dask cluster. Opened before the
    jobs are prepared, so that local processes start and import sizer while this process reads the
    input (they start on demand: one trivial task each starts them all), and a cluster's address is
    tried at once."""

    def __init__(self, jobs: int | None = None, cluster: str | None = None) -> None:
        check_workers(jobs, cluster)
        self.cluster = cluster
        self.count = 1 if cluster else (jobs or default_jobs())
        self.pool: Any = None
        self.client: Any = None

    def __enter__(self) -> "Workers":
        if self.cluster:
            self.client = _cluster_client(self.cluster)
        elif self.count > 1:
            import multiprocessing
            from concurrent.futures import ProcessPoolExecutor

            self.pool = ProcessPoolExecutor(self.count, mp_context=multiprocessing.get_context("spawn"), initializer=warm_up)
            for _ in range(self.count):
                self.pool.submit(int)
        return self

    def __exit__(self, *exc: Any) -> None:
        if self.pool is not None:
            self.pool.shutdown(wait=True, cancel_futures=True)
        if self.client is not None:
            self.client.close()

    def run(self, work: Work, jobs: Sequence[Job], description: str = "Working", stop_on_error: bool = True,
            show_progress: bool = True) -> tuple[list[dict], RunSummary]:
        """Every job's result, in the jobs' order: kept results first, the rest run by `work`. Jobs with
        the same key run once. With `stop_on_error`, the first bad-input result stops the run
        (JobFailed, naming the job)."""
        results: list[dict | None] = [read_kept(job.key) for job in jobs]
        sharing: dict[str, list[int]] = {}
        for index, result in enumerate(results):
            if result is None:
                sharing.setdefault(jobs[index].key, []).append(index)
        pending = [indices[0] for indices in sharing.values()]
        resumed = sum(result is not None for result in results)
        summary = RunSummary(total=len(jobs), resumed=resumed, ran=len(jobs) - resumed)

        def finished(index: int, result: dict) -> None:
            keep(jobs[index].key, result)
            for same in sharing[jobs[index].key]:
                results[same] = result
            if stop_on_error and (error := result_error(result)) is not None:
                raise JobFailed(index, error)

        with _progress(description, len(pending) + resumed, resumed, show_progress and bool(pending)) as advance:
            if self.client is not None:
                summary.where = f"the Dask cluster at {self.cluster}"
                _run_on_cluster(work, jobs, pending, self.client, finished, advance)
            elif self.pool is not None and len(pending) > 1:
                summary.where = f"{self.count} local processes"
                _run_on_processes(work, jobs, pending, self.pool, finished, advance)
            else:
                summary.where = "1 local process"
                _run_here(work, jobs, pending, finished, advance)
        return [result for result in results if result is not None], summary


def _run_here(work: Work, jobs: Sequence[Job], pending: list[int], finished: Callable[[int, dict], None],
              advance: Callable[[str], None]) -> None:
    for index in pending:
        finished(index, work(jobs[index].payload))
        advance(jobs[index].label)


def _run_on_processes(work: Work, jobs: Sequence[Job], pending: list[int], pool: Any,
                      finished: Callable[[int, dict], None], advance: Callable[[str], None]) -> None:
    """Local processes (spawn: a clean interpreter each, the same on every platform)."""
    from concurrent.futures import FIRST_COMPLETED, wait

    futures = {pool.submit(work, jobs[index].payload): index for index in pending}
    try:
        waiting = set(futures)
        while waiting:
            done, waiting = wait(waiting, return_when=FIRST_COMPLETED)
            for future in sorted(done, key=futures.__getitem__):
                finished(futures[future], future.result())
                advance(jobs[futures[future]].label)
    except BaseException:
        for future in futures:
            future.cancel()
        raise


def _run_on_cluster(work: Work, jobs: Sequence[Job], pending: list[int], client: Any,
                    finished: Callable[[int, dict], None], advance: Callable[[str], None]) -> None:
    """An existing Dask distributed cluster (the client is closed by Workers, the cluster left running)."""
    from distributed import as_completed

    futures = client.map(work, [jobs[index].payload for index in pending], key=[f"sizer-{jobs[index].key}" for index in pending], pure=False)
    where = {future.key: index for future, index in zip(futures, pending)}
    try:
        for future in as_completed(futures, loop=client.loop):
            index = where[future.key]
            finished(index, future.result())
            advance(jobs[index].label)
    except BaseException:
        client.cancel(futures)
        raise


def _cluster_client(address: str) -> Any:
    """A Dask client connected to `address`; InputError when dask is missing or the scheduler does not answer."""
    try:
        from distributed import Client
    except ImportError:
        raise InputError("", "--cluster", "Dask distributed is not installed", "pip install 'sizer[cluster]'") from None
    try:
        return Client(address, timeout="15s", set_as_default=False)
    except (OSError, TimeoutError, ValueError) as exc:
        raise InputError("", "--cluster", f"no Dask scheduler answers at {address!r} ({exc})",
                         "give the scheduler's address, e.g. tcp://10.0.0.5:8786, and check that it is running") from None


class _progress:
    """A context giving advance(label): a rich progress bar on stderr (count done, time left) when shown."""

    def __init__(self, description: str, total: int, done: int, shown: bool) -> None:
        self.description, self.total, self.done, self.shown = description, total, done, shown
        self.bar: Any = None

    def __enter__(self) -> Callable[[str], None]:
        if self.shown:
            from rich.console import Console
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn, TimeRemainingColumn

            self.bar = Progress(TextColumn(self.description), BarColumn(), MofNCompleteColumn(), TimeElapsedColumn(),
                                TextColumn("left"), TimeRemainingColumn(), TextColumn("{task.fields[label]}"),
                                console=Console(stderr=True), transient=True)
            self.bar.start()
            self.task = self.bar.add_task(self.description, total=self.total, completed=self.done, label="")
        return self.advance

    def advance(self, label: str) -> None:
        if self.bar is not None:
            self.bar.update(self.task, advance=1, label=label)

    def __exit__(self, *exc: Any) -> None:
        if self.bar is not None:
            self.bar.stop()
