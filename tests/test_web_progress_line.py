"""The web page follows a class set's build by the progress lines
``kitgen batch`` writes when stderr is not a terminal (#12, #13): the page's
reader must read the lines the batch actually writes, whatever their
wording.  Reference: the batch's own line writer
(kitgen.batch.progress), fed a known count of kits."""

from __future__ import annotations

import io

from kitgen.batch.progress import progress
from kitgen.web.sets import PROGRESS_LINE


def test_the_page_reads_every_line_the_batch_writes():
    stream = io.StringIO()
    bar = progress(7, stream=stream)
    for _ in range(7):
        bar.advance()
    bar.close()
    lines = stream.getvalue().splitlines()
    assert lines   # at least the last line, 7 of 7
    read = [PROGRESS_LINE.match(line) for line in lines]
    assert all(read), lines
    assert (int(read[-1]["done"]), int(read[-1]["total"])) == (7, 7)
    assert all(int(m["total"]) == 7 and 1 <= int(m["done"]) <= 7 for m in read)
