"""Many independent jobs (schedule rows, span-table cells) on the local cores or on a Dask cluster.

- Local: `concurrent.futures.ProcessPoolExecutor` (`jobs` processes), jobs sent in pairs but the
  last few; `jobs = 1` runs in this process. On Linux, while this process runs a single thread,
  the workers are forked from it after it has imported what the jobs need, so they start at once
  with sizer loaded; elsewhere (fork is unsafe on macOS and absent on Windows) or beside other
  threads, each is a fresh interpreter (spawn) that imports sizer itself. The results are the same
  either way.
- Cluster: `--cluster ADDRESS`, an existing Dask distributed scheduler (`pip install 'sizer[cluster]'`);
  its workers need sizer installed. Jobs carry everything they read (the member, the catalogue's
  text), so the workers need none of the user's files.
- Results come back in the input's order and are the same whatever ran them: a job is a pure
  function of its payload.
- Resume: each finished result is kept at once in the cache folder (`runs/`, under a keyed digest:
  sizer.digests), keyed by a hash of
  the job's content and sizer's code; a later run with the same key takes it instead of redoing it.
- A rich progress bar on stderr shows the count done and an estimate of the time left.

A job's function returns a JSON-ready dict; bad input inside a job comes back as {"error": {...}}
(the fields of InputError) so that it crosses process and network boundaries as plain data.
"""

from __future__ import annotations

import gc
import hashlib
import json
import os
from dataclasses import asdict, dataclass, field, fields, is_dataclass
from functools import cached_property, lru_cache
from pathlib import Path
from typing import Any, Callable, Iterable, Iterator, Sequence

from sizer.errors import InputError
from sizer.files import cache_error, cache_root, read_text, write_atomic

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

    @cached_property
    def digest(self) -> str:
        """The content hash of the files (made once: every job of a run carries the same catalogue)."""
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
        shipped.append(CatalogueText(Path(path).name, folder, read_text(path, "the catalogue file")))
    return ShippedCatalogue(tuple(shipped))


def catalogue_folders(catalogue: ShippedCatalogue) -> list[Path]:
    """Folders holding exact copies of the shipped catalogue files (made once in the cache folder,
    `catalogue-copies/<digest>/`), to pass as --catalogue paths."""
    return list(_copied_folders(catalogue.digest, catalogue))


@lru_cache(maxsize=16)
def _copied_folders(digest: str, catalogue: ShippedCatalogue) -> tuple[Path, ...]:
    base = cache_root() / COPIES_FOLDER / digest
    folders = sorted({item.folder for item in catalogue.files})
    try:
        for item in catalogue.files:
            path = base / str(item.folder) / item.name
            if not path.is_file() or path.read_text(encoding="utf-8", errors="replace") != item.text:
                write_atomic(path, item.text)
    except OSError as error:
        raise cache_error(error) from None
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
    """A result kept by an earlier run under `key`, or None (missing, damaged, or not matching its
    keyed digest (sizer.digests): redo it). The first line is the digest of the rest."""
    from sizer.digests import digest_matches

    try:
        with open(_kept_path(key), "rb") as stream:
            digest, _, body = stream.read().partition(b"\n")
        if not digest_matches(body, digest.decode("ascii")):
            return None
        kept = json.loads(body.decode("utf-8"))
    except (OSError, ValueError):
        return None
    return kept.get("result") if isinstance(kept, dict) and kept.get("key") == key and isinstance(kept.get("result"), dict) else None


def keep(key: str, result: dict) -> None:
    """Keep a finished result (never one that is bad input: that is redone, and fails again, next
    time) under its keyed digest. No fsync: a kept result is checked against its digest and key when
    read and redone when damaged."""
    from sizer.digests import keyed_digest

    if "error" not in result:
        body = json.dumps({"key": key, "result": result}, ensure_ascii=False).encode("utf-8")
        try:
            write_atomic(_kept_path(key), keyed_digest(body).encode("ascii") + b"\n" + body, durable=False)
        except OSError as error:
            raise cache_error(error) from None


# ----------------------------------------------------------------------------------------------
# running

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


class JobFailed(Exception):
    """Bad input met in the job at `index` (stops a run that stops on errors)."""

    def __init__(self, index: int, error: InputError) -> None:
        super().__init__(str(error))
        self.index, self.error = index, error


def warm_up() -> None:
    """When a worker process starts: leave Ctrl-C to the parent (it keeps what is finished and stops the
    rest), and import what every job needs."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    import_job_modules()


def import_job_modules() -> None:
    """Import what every job needs (numpy, the analysis, the sections, the checks and the sizing)."""
    import sizer.api  # noqa: F401
    from sizer import checks, design, sections, sizing  # noqa: F401


def local_context() -> Any:
    """The start method of local workers: fork on Linux while this process runs one thread (a fork
    copies only the calling thread, so a lock another thread holds could never be released in the
    copy), else spawn."""
    import multiprocessing
    import sys
    import threading

    if sys.platform.startswith("linux") and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context("spawn")


class Workers:
    """Where the jobs run: this process, local worker processes, or a Dask cluster. Opened before the
    jobs are prepared: forked workers are copies of this process with the job modules imported first;
    spawned ones start and import sizer while this process reads the input (one trivial task each
    starts them all); a cluster's address is tried at once."""

    def __init__(self, jobs: int | None = None, cluster: str | None = None) -> None:
        check_workers(jobs, cluster)
        self.cluster = cluster
        self.count = 1 if cluster else min(jobs or default_jobs(), default_jobs())  # never more processes than cores
        self.pool: Any = None
        self.client: Any = None

    def __enter__(self) -> "Workers":
        if self.cluster:
            self.client = _cluster_client(self.cluster)
        elif self.count > 1:
            from concurrent.futures import ProcessPoolExecutor

            context = local_context()
            forked = context.get_start_method() == "fork"
            if forked:
                import_job_modules()
                cache_root()  # the cache folder (platformdirs) found once here, not again in each worker's first job
                gc.freeze()  # the workers' copies of this process's objects stay out of their collections: no copy-on-write by them
            self.pool = ProcessPoolExecutor(self.count, mp_context=context, initializer=warm_up)
            for _ in range(self.count):
                self.pool.submit(int)  # the first submit forks every worker
            if forked:
                gc.unfreeze()  # this process collects as before (a notebook's objects are not kept for good)
        return self

    def __exit__(self, *exc: Any) -> None:
        if self.pool is not None:
            self.pool.shutdown(wait=True, cancel_futures=True)
        if self.client is not None:
            self.client.close()

    def run(self, work: Work, jobs: Iterable[Job], description: str = "Working", stop_on_error: bool = True,
            show_progress: bool = True, total: int | None = None) -> tuple[list[dict], RunSummary]:
        """Every job's result, in the jobs' order. Each job is started as soon as `jobs` yields it, so
        that preparing the later jobs overlaps the work of the earlier ones; a kept result is taken
        instead of running the job, and a job with the key of an earlier one shares its run. With
        `stop_on_error`, the first bad-input result stops the run (JobFailed, naming the job). `total`
        is the count of jobs for the progress bar, when `jobs` is not a sequence."""
        taken: list[Job] = []
        results: list[dict | None] = []
        sharing: dict[str, list[int]] = {}
        summary = RunSummary(where=self.where)
        count = total if total is not None else len(jobs)  # type: ignore[arg-type]
        runner = self.runner(work, count)

        def finished(index: int, result: dict) -> None:
            if not runner.keeps:
                keep(taken[index].key, result)
            for same in sharing[taken[index].key]:
                results[same] = result
            if stop_on_error and (error := result_error(result)) is not None:
                raise JobFailed(index, error)

        with _progress(description, count, show_progress) as bar:
            try:
                for index, job in enumerate(jobs):
                    taken.append(job)
                    kept = read_kept(job.key)
                    results.append(kept)
                    if kept is not None:
                        summary.resumed += 1
                        bar.advance(job.label)
                    elif job.key in sharing:
                        sharing[job.key].append(index)
                    else:
                        sharing[job.key] = [index]
                        runner.start(index, job)
                        if runner.submitted >= self.count:
                            bar.begin()  # once every worker has work: the bar's imports hold none of them up
                    for done, result in runner.ready():
                        finished(done, result)
                        bar.advance(taken[done].label)
                if sharing:
                    bar.begin()  # fewer jobs to run than workers
                for index, result in runner.finished():
                    finished(index, result)
                    bar.advance(taken[index].label)
            except BaseException:
                runner.cancel()
                raise
        summary.total = len(taken)
        summary.ran = summary.total - summary.resumed
        return [result for result in results if result is not None], summary

    @property
    def where(self) -> str:
        if self.client is not None:
            return f"the Dask cluster at {self.cluster}"
        return f"{self.count} local processes" if self.pool is not None else "1 local process"

    def runner(self, work: Work, total: int) -> "_Here | _Processes | _Cluster":
        if self.client is not None:
            return _Cluster(work, self.client)
        return _Processes(work, self.pool, self.count, total) if self.pool is not None else _Here(work)


def _work_and_keep(work: Work, items: list[tuple[str, Any]]) -> list[dict]:
    """The results of jobs given as (key, payload), each kept as soon as it is worked out (local
    workers share this machine's cache folder), so that the process that gathers the results does
    no file work of its own per job."""
    results = []
    for key, payload in items:
        results.append(work(payload))
        keep(key, results[-1])
    return results


class _Here:
    """Jobs run in this process, each when it is started."""

    keeps = False

    def __init__(self, work: Work) -> None:
        self.work = work
        self.done: list[tuple[int, dict]] = []
        self.submitted = 0

    def start(self, index: int, job: Job) -> None:
        self.done.append((index, self.work(job.payload)))
        self.submitted += 1

    def ready(self) -> list[tuple[int, dict]]:
        """(index, result) of the jobs finished since last asked."""
        done, self.done = self.done, []
        return done

    def finished(self) -> list[tuple[int, dict]]:
        """(index, result) of the rest (none: each job finishes when it is started)."""
        return self.ready()

    def cancel(self) -> None:
        pass


class _Futures:
    """Submitted futures in the order submitted, each with the indices of the jobs it runs: `ready()`
    takes those finished at the front without waiting (the progress bar moves while later jobs are
    still being read), `finished()` waits for the rest and gives each job as it finishes (those
    finished together in the jobs' order)."""

    def __init__(self) -> None:
        self.started: list[tuple[Any, tuple[int, ...]]] = []
        self.front = 0

    @property
    def submitted(self) -> int:
        return len(self.started)

    def ready(self) -> list[tuple[int, dict]]:
        done: list[tuple[int, dict]] = []
        while self.front < len(self.started) and self.started[self.front][0].done():
            future, indices = self.started[self.front]
            done.extend(zip(indices, self.results(future)))
            self.front += 1
        return done

    def finished(self) -> Iterator[tuple[int, dict]]:
        waiting = dict(self.started[self.front:])
        self.front = len(self.started)
        for batch in self.completed(list(waiting)):
            for future in sorted(batch, key=waiting.__getitem__):
                yield from zip(waiting[future], self.results(future))

    def results(self, future: Any) -> list[dict]:
        """The results of the jobs a finished future ran, in their order."""
        return [future.result()]

    def completed(self, futures: list[Any]) -> Iterator[list[Any]]:
        raise NotImplementedError


class _Processes(_Futures):
    """Jobs on the local worker processes (forked or spawned: see `local_context`), which keep their
    results themselves. Jobs go to the workers in pairs, which halves the round trips through the
    pool (about 0.3 ms each, against some 10-50 ms of work a job), except the last `TAIL_SINGLES`
    jobs per worker: those go singly, so that the workers finish together."""

    keeps = True
    TAIL_SINGLES = 2

    def __init__(self, work: Work, pool: Any, workers: int, total: int) -> None:
        super().__init__()
        self.work, self.pool = work, pool
        self.paired_below = total - self.TAIL_SINGLES * workers
        self.waiting: list[tuple[int, Job]] = []

    def start(self, index: int, job: Job) -> None:
        single = index >= self.paired_below
        if single:
            self.submit()  # a job held back for a pair goes alone
        self.waiting.append((index, job))
        if single or len(self.waiting) == 2:
            self.submit()

    def submit(self) -> None:
        """Send the jobs held back (one, or a pair) to the pool as one task."""
        if self.waiting:
            items = [(job.key, job.payload) for _, job in self.waiting]
            self.started.append((self.pool.submit(_work_and_keep, self.work, items), tuple(index for index, _ in self.waiting)))
            self.waiting = []

    def results(self, future: Any) -> list[dict]:
        return future.result()

    def finished(self) -> Iterator[tuple[int, dict]]:
        self.submit()
        return super().finished()

    def completed(self, futures: list[Any]) -> Iterator[list[Any]]:
        from concurrent.futures import as_completed

        done = [future for future in futures if future.done()]
        if done:
            yield done
        for future in as_completed([future for future in futures if not future.done()]):
            yield [future]

    def cancel(self) -> None:
        for future, _ in self.started:
            future.cancel()


class _Cluster(_Futures):
    """Jobs on an existing Dask distributed cluster (the client is closed by Workers, the cluster left
    running); its workers may not share this machine's files, so the results are kept here."""

    keeps = False

    def __init__(self, work: Work, client: Any) -> None:
        super().__init__()
        self.work, self.client = work, client

    def start(self, index: int, job: Job) -> None:
        self.started.append((self.client.submit(self.work, job.payload, key=f"sizer-{job.key}", pure=False), (index,)))

    def completed(self, futures: list[Any]) -> Iterator[list[Any]]:
        from distributed import as_completed

        for future in as_completed(futures, loop=self.client.loop):
            yield [future]

    def cancel(self) -> None:
        if self.started:
            self.client.cancel([future for future, _ in self.started])


CLUSTER_TIMEOUT = 5.0  # s: the longest a cluster address is tried before it is refused
DASK_PORT = 8786


def _cluster_client(address: str) -> Any:
    """A Dask client connected to `address` (tcp:// or host:port); InputError when dask is missing, the
    address is of another kind, or no Dask scheduler answers there within CLUSTER_TIMEOUT."""
    import time

    try:
        from distributed import Client
    except ImportError:
        raise InputError("", "--cluster", "Dask distributed is not installed", "pip install 'sizer[cluster]'") from None
    started = time.monotonic()
    host, port = cluster_host_port(address)
    probe_scheduler(address, host, port)
    left = max(1.0, CLUSTER_TIMEOUT - (time.monotonic() - started))
    try:
        return Client(f"tcp://{host}:{port}" if ":" not in host else f"tcp://[{host}]:{port}", timeout=f"{left:.1f}s", set_as_default=False)
    except Exception as exc:  # any failure to connect is the address's: one line
        raise InputError("", "--cluster", f"no Dask scheduler answers at {address!r} ({type(exc).__name__}: {str(exc)[:120]})",
                         "give the scheduler's address, e.g. tcp://10.0.0.5:8786, and check that it is running") from None


def cluster_host_port(address: str) -> tuple[str, int]:
    """(host, port) of a --cluster address: tcp://HOST:PORT, HOST:PORT or HOST (port 8786); IPv6 hosts
    in brackets. InputError for any other scheme (ucx://, tls://, ...) or a malformed address."""
    fix = "give the scheduler's address as tcp://HOST:PORT, e.g. tcp://10.0.0.5:8786"
    text = address.strip()
    scheme, separator, rest = text.partition("://")
    if not separator:
        scheme, rest = "tcp", text
    if scheme.lower() != "tcp":
        raise InputError("", "--cluster", f"the {scheme[:20]!r} protocol is not supported (only tcp://)", fix)
    if rest.startswith("["):
        host, _, tail = rest[1:].partition("]")
        port_text = tail.removeprefix(":") if tail.startswith(":") else ("" if not tail else None)
    else:
        host, _, port_text = rest.partition(":")
    if not host or port_text is None or "/" in rest or any(ch.isspace() for ch in rest):
        raise InputError("", "--cluster", f"{address[:80]!r} is not a scheduler address", fix)
    if not port_text:
        return host, DASK_PORT
    if not port_text.isdigit() or not 0 < int(port_text) < 65536:
        raise InputError("", "--cluster", f"{port_text[:20]!r} is not a port number", fix)
    return host, int(port_text)


def probe_scheduler(address: str, host: str, port: int) -> None:
    """InputError unless a Dask scheduler answers at host:port within CLUSTER_TIMEOUT: it is reached,
    and it sends its greeting first (a short framed message naming its compression and pickle
    protocol), which no web or other server does. Checked before Dask is given the address, which
    would otherwise wait for its own timeout or read another server's reply as a frame length."""
    import socket
    import time

    fix = "give the scheduler's address, e.g. tcp://10.0.0.5:8786, and check that it is running"
    deadline = time.monotonic() + CLUSTER_TIMEOUT
    try:
        connection = socket.create_connection((host, port), timeout=CLUSTER_TIMEOUT)
    except (OSError, UnicodeError, ValueError) as exc:
        raise InputError("", "--cluster", f"cannot reach {address[:80]!r} ({getattr(exc, 'strerror', None) or exc or 'timed out'})", fix) from None
    greeting = b""
    with connection:
        try:
            while len(greeting) < 64 and time.monotonic() < deadline:
                connection.settimeout(max(0.05, deadline - time.monotonic()))
                chunk = connection.recv(64 - len(greeting))
                if not chunk:
                    break
                greeting += chunk
        except OSError:  # timed out or reset: judged on what came
            pass
    if not _looks_like_dask(greeting):
        raise InputError("", "--cluster", f"the server at {address[:80]!r} is not a Dask scheduler (no Dask greeting within "
                         f"{CLUSTER_TIMEOUT:g} s)", fix)


def _looks_like_dask(greeting: bytes) -> bool:
    """True when `greeting` starts as a Dask comm handshake: a little-endian 8-byte total length under
    1 MiB, then a small frame count, and its msgpack names the compression or pickle protocol."""
    if len(greeting) < 16:
        return False
    length, frames = int.from_bytes(greeting[:8], "little"), int.from_bytes(greeting[8:16], "little")
    return 0 < length < 2**20 and 0 < frames < 64 and (b"compression" in greeting or b"pickle" in greeting)


class _progress:
    """A context giving a progress bar on stderr (rich: count done, time left), when shown: `begin()`
    shows it (Workers.run calls it once every worker has work, so that rich's imports delay no job;
    a run of kept results only shows none), `advance(label)` counts one job done."""

    def __init__(self, description: str, total: int, shown: bool) -> None:
        self.description, self.total, self.shown = description, total, shown
        self.done = 0
        self.bar: Any = None

    def __enter__(self) -> "_progress":
        return self

    def begin(self) -> None:
        if self.shown and self.bar is None:
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn, TimeRemainingColumn

            from sizer.printable import safe_console

            self.bar = Progress(TextColumn(self.description), BarColumn(), MofNCompleteColumn(), TimeElapsedColumn(),
                                TextColumn("left"), TimeRemainingColumn(), TextColumn("{task.fields[label]}", markup=False),
                                console=safe_console(stderr=True), transient=True)
            self.bar.start()
            self.task = self.bar.add_task(self.description, total=self.total, completed=self.done, label="")

    def advance(self, label: str) -> None:
        self.done += 1
        if self.bar is not None:
            self.bar.update(self.task, advance=1, label=label)

    def __exit__(self, *exc: Any) -> None:
        if self.bar is not None:
            self.bar.stop()
