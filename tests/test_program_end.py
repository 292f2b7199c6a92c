"""The program's end (kitgen.start.end): the process ends with the
command's status, its buffered output written and its exit handlers run,
though it skips the interpreter's teardown.

Reference: the Python standard library's documentation, ``os._exit``
("without calling cleanup handlers, flushing stdio buffers, etc.") and
``atexit`` (handlers run at normal interpreter termination); a program
that ends must behave as if it had ended normally.
"""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap


def _run(code: str) -> subprocess.CompletedProcess:
    """Run ``code`` in a child whose output to the pipes is buffered, as
    Python buffers it by default (``PYTHONUNBUFFERED`` unset)."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONUNBUFFERED"}
    return subprocess.run([sys.executable, "-c", textwrap.dedent(code)], capture_output=True, text=True,
                          timeout=60, env=env)


def test_status_output_and_exit_handlers_kept():
    done = _run("""
        import atexit, sys
        from kitgen.start import end
        atexit.register(lambda: print("handler ran", end=""))   # buffered, written at the end
        print("written before the end", end="")   # no newline: still buffered
        sys.stderr.write("said on stderr")
        end(3)
        print("never")
    """)
    assert done.returncode == 3
    assert done.stdout == "written before the end" + "handler ran"
    assert done.stderr == "said on stderr"


def test_a_running_thread_is_waited_for():
    done = _run("""
        import threading, time
        from kitgen.start import end
        def late():
            time.sleep(0.3)
            print("thread finished", flush=True)
        threading.Thread(target=late).start()
        end(0)
    """)
    assert done.returncode == 0
    assert done.stdout == "thread finished\n"


def test_the_program_ends_with_its_status(tmp_path):
    missing = tmp_path / "no-such-recipe.yaml"
    done = subprocess.run([sys.executable, "-m", "kitgen", "build", str(missing)], capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 2
    assert len(done.stderr.strip().splitlines()) == 1
    assert "no-such-recipe.yaml" in done.stderr
