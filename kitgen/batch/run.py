"""Build a class set: every kit, in parallel, into one fresh folder (#12).

The order of the work never shows in the output: each kit's file name,
its place in the print files and its manifest row follow its number in
the set, and each kit is built alone from its own recipe, so the same set
gives the same bytes whatever ``jobs`` is and whichever worker finishes
first.  Workers are long-lived processes (``concurrent.futures``).  The
main process reads and checks the set and warms what every kit needs (the
fonts, their glyph bounds, the catalogue: :func:`kitgen.batch.work.warm`)
before they start, so that a forked worker begins with it all, as the
one-process build does: each worker loading them itself had put 0.1 to
0.2 s more before every worker's first kit.  A language is loaded by the
worker whose kit first needs it (a worker builds school by school, so the
set's languages are mostly loaded side by side, each by one worker),
where the main process had loaded them all, one after another, before
any worker started.
"""

from __future__ import annotations

import multiprocessing
import os
import signal
import sys
import threading
import time
from concurrent.futures import ProcessPoolExecutor
from contextlib import ExitStack
from dataclasses import dataclass, replace
from pathlib import Path

from ..collect import collect_rarely, rare_collections
from ..errors import EXIT_INTERNAL, EXIT_OK, EXIT_USER, Message, one_line, speaking
from ..kit import school_of
from ..plan.resolve import plan_words
from ..words.templates import available_languages, load_words
from .folder import KITS, MANIFEST, BackgroundWrites, check_output_folder, fresh_folder, target_folder
from .manifest import manifest_csv, manifest_row
from .naming import kit_file_names
from .printfiles import PrintedKit, PrintFiles, sheet_key
from .progress import progress
from .setfile import load_set
from .stamp import SchoolStamps
from .dispatch import dispatch
from .shares import worker_shares
from .work import KitJob, build_one, warm

#: Most worker processes one run may ask for.
MAX_JOBS = 256


@dataclass(frozen=True)
class Summary:
    """What a set's run did: the folder, how many kits were built of how
    many, each failed kit's number and one-line reason, whether any of
    them was kitgen's own fault, and the largest peak memory of a worker."""

    folder: Path
    total: int
    built: int
    failures: tuple[tuple[int, str], ...]
    internal: bool
    jobs: int
    seconds: float
    peak_rss_kib: int
    language: str | None = None   # the set's language, to say the summary in
    #: With ``debug``: (kit number, traceback) of each fault of kitgen's own.
    traces: tuple[tuple[int, str], ...] = ()
    #: Whether the folder was written: not where no kit was built and an
    #: earlier set's folder is there, which a run whose every kit failed
    #: (a mistyped default, say) leaves as it was.
    written: bool = True

    @property
    def exit_status(self) -> int:
        if not self.failures:
            return EXIT_OK
        return EXIT_INTERNAL if self.internal else EXIT_USER


def default_jobs() -> int:
    """The cores this process may run on (its CPU affinity where the
    system tells it, as in a container), else all the machine's."""
    try:
        return len(os.sched_getaffinity(0)) or 1
    except (AttributeError, OSError):
        return os.cpu_count() or 1


def run_set(set_path, out_dir, jobs: int | None = None, quiet: bool = False, stream=None,
            debug: bool = False) -> Summary:
    """Build the set at ``set_path`` into the folder ``out_dir`` (made
    fresh), with ``jobs`` worker processes (default: the machine's
    cores), showing progress on ``stream`` (default stderr) unless
    ``quiet``; with ``debug``, a kit's internal fault comes back with its
    traceback (:attr:`Summary.traces`).  A fault of the set as a whole raises
    :class:`~kitgen.errors.UserError` before anything is written; a kit
    that fails is in the summary and the manifest, and the others are
    built."""
    started = time.monotonic()
    set_path, out_dir = Path(set_path), target_folder(out_dir)
    with ExitStack() as stack:
        stack.enter_context(rare_collections())   # the whole run, main process and workers
        kit_set = load_set(set_path)
        # a fault of the whole run from here on (the folder, the disk) is
        # said in the set's language, as its summary is
        stack.enter_context(speaking(_spoken(kit_set)))
        check_output_folder(out_dir, [set_path, *kit_set.inputs])
        buildable = [k for k in kit_set.kits if k.error is None]
        warm()   # the languages: as each kit first needs one, in whichever process builds it
        pools = _start_workers(stack, min(jobs or default_jobs(), len(buildable)))
        return _run(kit_set, out_dir, pools, quiet, stream, started, debug)


def _run(kit_set, out_dir: Path, pools: list, quiet: bool, stream, started: float, debug: bool = False) -> Summary:
    """:func:`run_set` once the set is read: its kits built with the
    workers ``pools`` (none: in this process) into ``out_dir``."""
    speak = _spoken(kit_set)
    words = load_words(speak) if speak else None
    names = kit_file_names(kit_set.kits)
    errors = {k.number: one_line(k.error.text(words)) for k in kit_set.kits if k.error is not None}
    stamps = SchoolStamps(k for k in kit_set.kits if k.error is None)
    stamp_lists = stamps.lists()   # drawn with each school's first kit, where its words are loaded
    jobs_list = [KitJob(k.number, k.recipe, speak=speak, stamps=stamp_lists.get(k.number, ()), debug=debug)
                 for k in kit_set.kits if k.error is None]
    jobs = max(1, min(len(pools) or 1, len(jobs_list) or 1))
    # No progress where every kit is refused: nothing is built, and the
    # summary says why each kit was not.
    bar = progress(len(kit_set.kits) if jobs_list else 0, quiet, stream)
    results, internal, peak, traces = {}, False, 0, []
    by_number = {k.number: k for k in kit_set.kits}
    written = True
    try:
        with fresh_folder(out_dir) as tmp, BackgroundWrites() as files:
            for _ in errors:
                bar.advance()
            printing, waiting, next_number = PrintFiles(), {}, 1
            for result in _build_all(jobs_list, pools[:jobs] if jobs > 1 else []):
                kit = by_number[result.number]
                peak = max(peak, result.peak_rss_kib)
                stamps.give(result.number, result.stamps)
                if result.error:
                    errors[result.number] = result.error
                    internal = internal or result.internal
                    if result.trace:
                        traces.append((result.number, result.trace))
                else:
                    files.write(tmp / KITS / names[kit.number - 1], result.pdf)
                    # the manifest's part
                    results[result.number] = replace(result, pdf=b"", shared=b"", overlay=b"", stamps=b"")
                waiting[result.number] = result
                next_number = _print_ready(printing, stamps, waiting, next_number, by_number)
                bar.advance()
            if not results and any((out_dir / name).exists() for name in (KITS, MANIFEST)):
                raise _NothingBuilt   # the fresh folder is let go, the earlier set kept
            _print_ready(printing, stamps, waiting, next_number, by_number, last=True)
            for name, data in printing.finish().items():
                files.write(tmp / name, data)
            spans = printing.ranges
            _with_set_notes(results, kit_set.kits)
            rows = [manifest_row(k, names[k.number - 1], results.get(k.number), spans.get(k.number, {}),
                                 errors.get(k.number, "")) for k in kit_set.kits]
            files.write(tmp / MANIFEST, manifest_csv(rows))
    except _NothingBuilt:
        written = False
    finally:
        bar.close()
    failures = tuple(sorted(errors.items()))
    return Summary(out_dir, len(kit_set.kits), len(results), failures, internal, jobs,
                   time.monotonic() - started, peak, speak, tuple(sorted(traces)), written)


def _with_set_notes(results: dict, kits) -> None:
    """Put each built kit's notes from the set's merging
    (:attr:`~kitgen.batch.setfile.SetKit.notes`) before its build's, in
    its own language, for the manifest; a language is read here only for a
    kit that has such notes."""
    for kit in kits:
        result = results.get(kit.number)
        if kit.notes and result is not None:
            words = plan_words(kit.recipe)
            said = tuple(one_line(note.text(words)) for note in kit.notes)
            results[kit.number] = replace(result, notes=said + result.notes)


class _NothingBuilt(Exception):
    """No kit of the set was built, and an earlier set's folder is there:
    nothing is written."""


def _spoken(kit_set) -> str | None:
    """The language the run speaks in: the set's, where it is a shipped
    template's, else None (English)."""
    return kit_set.language if kit_set.language in available_languages() else None


def _print_ready(printing, stamps, waiting: dict, next_number: int, by_number: dict, last: bool = False) -> int:
    """Add to the print files, in kit order, every kit up to the first one
    not yet built (kits that failed, or were never built, are skipped);
    the print files so grow while later kits are still being built.
    Returns the number of the next kit to add."""
    while next_number in by_number and (next_number in waiting or by_number[next_number].error is not None
                                        or last):
        result = waiting.pop(next_number, None)
        if result is not None and not result.error:
            kit = by_number[next_number]
            stamp, stamp_page = stamps.of(next_number)
            printing.add(PrintedKit(next_number, result.pdf, stamp, result.materials, result.margin_mm,
                                    kit.copies, result.shared, result.owner_pages, result.overlay, stamp_page,
                                    school_of(kit.recipe), sheet_key(kit.recipe.sheet)))
        next_number += 1
    return next_number


def _start_workers(stack: ExitStack, jobs: int) -> list:
    """``jobs`` worker processes (none for one: the kits are built in this
    process), each a pool of one, started at once; closed with ``stack``,
    which then waits for each pool's managing thread to end
    (:func:`_join_all`)."""
    if jobs < 2:
        return []
    threads: list[threading.Thread] = []
    stack.callback(_join_all, threads)   # before the pools: it runs after they are shut down
    pools = [stack.enter_context(ProcessPoolExecutor(max_workers=1, mp_context=_context(),
                                                     initializer=_worker_start)) for _ in range(jobs)]
    for pool in pools:
        pool.submit(int)   # starts its process now
        thread = getattr(pool, "_executor_manager_thread", None)
        if thread is not None:
            threads.append(thread)
    return pools


def _join_all(threads: list) -> None:
    """Wait for the pools' managing threads to end.  A pool told to shut
    down without waiting, as the last kit comes in (:func:`_build_all`),
    forgets its thread, and its shutdown at the end of the run then waits
    for nothing; a thread still ending when the process exits met
    Python's own exit handler for the pools, which wrote to the pipe the
    thread was closing and printed a traceback (Python 3.11's
    ``concurrent.futures.process._python_exit``).  The thread is CPython's
    own attribute of the pool; where a Python has none, nothing is joined."""
    for thread in threads:
        thread.join()


def _build_all(jobs_list, pools: list):
    """Each job's :class:`~kitgen.batch.work.KitResult`, as they finish:
    in this process without ``pools``, school by school
    (:func:`kitgen.batch.shares.worker_shares`), else as the workers come
    free (:func:`kitgen.batch.dispatch.dispatch`)."""
    if not jobs_list:   # every kit of the set refused: nothing to build
        return
    if pools:
        yield from dispatch(jobs_list, pools)
        for pool in pools:   # every kit is in: the workers end while the print files are written
            pool.shutdown(wait=False)
        return
    for job in worker_shares(jobs_list, 1)[0]:
        yield build_one(job)


def _worker_start() -> None:
    """A worker leaves Ctrl-C to the main process, which stops the pool
    and cleans up, and ends at once on the other signals (it writes
    nothing); then it warms its caches (already warm when forked from the
    main process) and collects garbage rarely."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    for name in ("SIGTERM", "SIGHUP", "SIGQUIT"):
        if hasattr(signal, name):
            signal.signal(getattr(signal, name), signal.SIG_DFL)
    warm()
    collect_rarely()   # for the worker's life


def _context():
    """Fork where the system has it (Linux: the workers start with
    kitgen already imported); spawn elsewhere."""
    methods = multiprocessing.get_all_start_methods()
    return multiprocessing.get_context("fork" if sys.platform.startswith("linux") and "fork" in methods else "spawn")


def summary_lines(summary: Summary, words=None) -> list[str]:
    """What the command says at the end: one line a failed kit, then the
    summary line."""
    lines = [one_line(Message("errors.batch_kit_failed", kit=n, reason=reason).text(words))
             for n, reason in summary.failures]
    if not summary.written:
        lines.append(one_line(Message("errors.batch_nothing_built", total=summary.total,
                                      folder=summary.folder).text(words)))
        return lines
    lines.append(one_line(Message("errors.batch_summary", built=summary.built, total=summary.total,
                                  failed=len(summary.failures), folder=summary.folder).text(words)))
    return lines
