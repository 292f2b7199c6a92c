"""The ``kitgen`` program's entry point: the signal handlers go in before
anything else is imported, so that Ctrl-C or a hang-up in the first
moments ends the run in one line, as it does later (:mod:`kitgen.interrupt`);
the modules are imported with the cyclic garbage collector's passes rare
(:func:`_import_main`), NumPy's linear algebra library asked for one
thread (:func:`one_blas_thread`); and once the command has finished, the
process ends without taking its heap apart (:func:`program`)."""

from __future__ import annotations

import atexit
import gc
import os
import sys
import threading

from . import interrupt
from .collect import collect_rarely


def program() -> None:
    """The ``kitgen`` program: :func:`run`, then :func:`end` with its status."""
    end(run())


def end(status: int) -> None:
    """End the process with ``status`` once the command is done: the exit
    handlers run (``atexit``, as at a normal exit, before the streams are
    flushed, so that what they write is kept), the standard streams
    flushed, then ``os._exit``, which leaves out the interpreter's
    teardown of every module and object.  A class set's process held 100
    to 150 MB of small objects, and freeing them one by one took 0.15 to
    0.5 s after the last file was written.  With a thread of the
    command's still running, or a stream that cannot be flushed, the
    ordinary exit does the rest.  ``atexit._run_exitfuncs`` is CPython's
    own (3.11 and later clear the handlers as they run them, so none runs
    twice)."""
    if threading.active_count() > 1:
        sys.exit(status)
    atexit._run_exitfuncs()
    try:
        for stream in (sys.stdout, sys.stderr):
            if stream is not None:
                stream.flush()
    except (OSError, ValueError):
        sys.exit(status)
    os._exit(status)


def run() -> int:
    """Install the handlers, then import and run :func:`kitgen.cli.main`."""
    one_blas_thread()
    previous = interrupt.install()
    try:
        main = _import_main()
    except (KeyboardInterrupt, interrupt.Stopped) as exc:
        return _stopped_while_starting(exc)
    return main(handlers_installed=previous is not None)


#: The environment variables by which the BLAS libraries NumPy is built
#: with take their thread count: OpenBLAS (NumPy's wheels) and, where
#: NumPy is built on them, Intel's MKL and Apple's Accelerate (vecLib).
BLAS_THREADS = ("OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "VECLIB_MAXIMUM_THREADS")


def one_blas_thread() -> None:
    """Ask NumPy's BLAS library for one thread, unless the user's
    environment says otherwise (:data:`BLAS_THREADS`), before NumPy is
    imported.  kitgen multiplies no matrix large enough to share among
    threads, and a class set runs its own worker processes; but OpenBLAS
    starts a thread a core as NumPy is imported, which waits busily for
    work that never comes: measured on a 2-core machine, 0.11 s of CPU
    during the imports alone (0.25 s where one thread takes 0.14 s), spent on
    the other core, which a class set's second worker or another program
    could use (#12)."""
    for name in BLAS_THREADS:
        os.environ.setdefault(name, "1")


def _import_main():
    """:func:`kitgen.cli.main`, imported with the cyclic garbage collector's
    passes rare (:func:`kitgen.collect.collect_rarely`) and what the
    imports made (modules, classes and functions, which live as long as
    the process) left out of later passes; the collector's thresholds are
    then as before, for the command to set (kitgen.cli.BUILDING).  The
    passes over what the imports make, none of it garbage, took about
    10 ms of every command's start, a class set's included, where no
    second worker can share it (#12)."""
    thresholds = collect_rarely()
    try:
        from .cli import main
    finally:
        gc.set_threshold(*thresholds)
    return main


def _stopped_while_starting(exc: BaseException) -> int:
    status = exc.exit_status if isinstance(exc, interrupt.Stopped) else 130  # 128 + SIGINT
    try:
        from .errors import Message

        said = Message("errors.terminated") if isinstance(exc, interrupt.Stopped) else Message("errors.interrupted")
        print(said.text(), file=sys.stderr)
    except BaseException:  # nothing more can be said, even if a second signal comes
        pass
    return status
