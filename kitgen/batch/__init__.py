"""Class sets: many kits from one set recipe, in parallel, into one folder
of per-kit PDFs, a print file a stock (plain paper, card, film) and a
manifest (#12).

``run_set(set_path, out_dir, jobs, quiet) -> Summary`` is the entry point
for the command line (``kitgen batch``) and for any other caller.

- :mod:`.setfile`: read and check the set (defaults, kits list, roster);
- :mod:`.naming`: the kits' file names;
- :mod:`.work`: build one kit (in a worker process);
- :mod:`.stamp`, :mod:`.printfiles`: the stamped print files;
- :mod:`.manifest`: ``manifest.csv``;
- :mod:`.folder`: the output folder, swapped in whole;
- :mod:`.progress`: the progress bar or lines;
- :mod:`.run`: all of it in order.
"""

from .run import Summary, default_jobs, run_set, summary_lines

__all__ = ["Summary", "default_jobs", "run_set", "summary_lines"]
