"""Many independent jobs (schedule rows, span-table cells) on the worker pool (sizer.workers: this
process, the local cores or a Dask cluster), with their results kept.

- Local processes get the jobs in pairs but the last few (half the round trips); a cluster, one by
  one. Jobs carry everything they read (the member, the catalogue's text), so the workers need none
  of the user's files.
- Results come back in the input's order and are the same whatever ran them: a job is a pure
  function of its payload.
- Resume: each finished result is kept at once in the cache store (`runs/`, a sealed file:
  sizer.cache_store), under the hash of the job's content; the seal holds the code fingerprint, so a
  later run of the same code with the same key takes it instead of redoing it.
- The progress bar (sizer.progress) shows the count done and an estimate of the time left.

A job's function returns a JSON-ready dict; bad input inside a job comes back as {"error": {...}}
(sizer.workers.error_result) so that it crosses process and network boundaries as plain data.
"""

from __future__ import annotations

import json
from dataclasses import asdict, dataclass, field
from functools import cached_property, lru_cache
from pathlib import Path
from typing import Any, Callable, Iterable, Iterator, Sequence

from sizer.cache_store import cache_error, cache_root, content_hash, read_sealed, write_sealed
from sizer.errors import InputError
from sizer.files import read_text, write_atomic
from sizer.progress import ProgressBar
from sizer.workers import Workers, result_error

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
# kept results

def _kept_path(key: str) -> Path:
    return cache_root() / RUNS_FOLDER / key[:2] / f"{key}.json"


def read_kept(key: str) -> dict | None:
    """A result kept by an earlier run of this code under `key`, or None (missing, damaged, sealed by
    other code: redo it)."""
    body = read_sealed(_kept_path(key))
    try:
        kept = json.loads(body.decode("utf-8")) if body is not None else None
    except ValueError:
        return None
    return kept if isinstance(kept, dict) else None


def keep(key: str, result: dict) -> None:
    """Keep a finished result (never one that is bad input: that is redone, and fails again, next
    time), sealed. No fsync: a kept result is checked against its seal when read and redone when
    damaged."""
    if "error" not in result:
        try:
            write_sealed(_kept_path(key), json.dumps(result, ensure_ascii=False).encode("utf-8"))
        except OSError as error:
            raise cache_error(error) from None


# ----------------------------------------------------------------------------------------------
# running

class JobFailed(Exception):
    """Bad input met in the job at `index` (stops a run that stops on errors)."""

    def __init__(self, index: int, error: InputError) -> None:
        super().__init__(str(error))
        self.index, self.error = index, error



def run_jobs(workers: Workers, work: Work, jobs: Iterable[Job], description: str = "Working", stop_on_error: bool = True,
             show_progress: bool = True, total: int | None = None) -> tuple[list[dict], RunSummary]:
    """Every job's result, in the jobs' order, worked out by `workers`. Each job is started as soon as
    `jobs` yields it, so that preparing the later jobs overlaps the work of the earlier ones; a kept
    result is taken instead of running the job, and a job with the key of an earlier one shares its
    run. With `stop_on_error`, the first bad-input result stops the run (JobFailed, naming the job).
    `total` is the count of jobs for the progress bar, when `jobs` is not a sequence."""
    taken: list[Job] = []
    results: list[dict | None] = []
    sharing: dict[str, list[int]] = {}
    summary = RunSummary(where=workers.where)
    count = total if total is not None else len(jobs)  # type: ignore[arg-type]
    runner = _Pooled(work, workers, count) if workers.started else _Here(work)

    def finished(index: int, result: dict) -> None:
        if not runner.keeps:
            keep(taken[index].key, result)
        for same in sharing[taken[index].key]:
            results[same] = result
        if stop_on_error and (error := result_error(result)) is not None:
            raise JobFailed(index, error)

    with ProgressBar(description, count, show_progress) as bar:
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
                    if runner.submitted >= workers.count:
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


class _Pooled:
    """Jobs on the started pool. Local processes keep their results themselves and get the jobs in
    pairs, which halves the round trips through the pool (about 0.3 ms each, against some 10-50 ms of
    work a job), except the last `TAIL_SINGLES` jobs per worker: those go singly, so that the workers
    finish together. A cluster's workers may not share this machine's files: its jobs go singly and
    their results are kept here.

    Futures are held in the order submitted, each with the indices of the jobs it runs: `ready()`
    takes those finished at the front without waiting (the progress bar moves while later jobs are
    still being read), `finished()` waits for the rest and gives each job as it finishes (those
    finished together in the jobs' order)."""

    TAIL_SINGLES = 2

    def __init__(self, work: Work, workers: Workers, total: int) -> None:
        self.work, self.workers = work, workers
        self.keeps = workers.keeps_here
        self.paired_below = total - self.TAIL_SINGLES * workers.count if self.keeps else 0
        self.waiting: list[tuple[int, Job]] = []
        self.started: list[tuple[Any, tuple[int, ...]]] = []
        self.front = 0

    @property
    def submitted(self) -> int:
        return len(self.started)

    def start(self, index: int, job: Job) -> None:
        single = index >= self.paired_below
        if single:
            self.submit()  # a job held back for a pair goes alone
        self.waiting.append((index, job))
        if single or len(self.waiting) == 2:
            self.submit()

    def submit(self) -> None:
        """Send the jobs held back (one, or a pair) to the pool as one task."""
        if not self.waiting:
            return
        indices = tuple(index for index, _ in self.waiting)
        if self.keeps:
            future = self.workers.submit(_work_and_keep, self.work, [(job.key, job.payload) for _, job in self.waiting])
        else:
            [(_, job)] = self.waiting
            future = self.workers.submit(self.work, job.payload, key=f"sizer-{job.key}")
        self.started.append((future, indices))
        self.waiting = []

    def results(self, future: Any) -> list[dict]:
        """The results of the jobs a finished future ran, in their order."""
        return future.result() if self.keeps else [future.result()]

    def ready(self) -> list[tuple[int, dict]]:
        done: list[tuple[int, dict]] = []
        while self.front < len(self.started) and self.started[self.front][0].done():
            future, indices = self.started[self.front]
            done.extend(zip(indices, self.results(future)))
            self.front += 1
        return done

    def finished(self) -> Iterator[tuple[int, dict]]:
        self.submit()
        waiting = dict(self.started[self.front:])
        self.front = len(self.started)
        for future in self.workers.completed(list(waiting)):
            yield from zip(waiting[future], self.results(future))

    def cancel(self) -> None:
        self.workers.cancel([future for future, _ in self.started])
