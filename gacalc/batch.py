"""Script files run in parallel processes (``gacalc -j N FILE...``).

Each file runs in a worker process, in a fresh session, exactly as the sequential runner
runs it; what it writes to stdout and stderr is recorded in order, chunk by chunk, and the
parent replays the files' records in file order.  So the output of ``-j N`` is the output
of ``-j 1``, byte for byte on each stream (and interleaved the same way when both go to
one terminal), only sooner.

Workers ignore SIGINT: Ctrl-C reaches the parent, which terminates the pool (the
standard library's ``multiprocessing.Pool``), prints the files finished so far and
reports the interruption.
"""

from __future__ import annotations

import multiprocessing
import signal

OUT, ERR = 0, 1


class _Recorder:
    """A write-only text stream that appends to a shared list of (stream, text) chunks."""

    def __init__(self, chunks: list, stream: int):
        self._chunks = chunks
        self._stream = stream

    def write(self, text: str) -> int:
        if text:
            if self._chunks and self._chunks[-1][0] == self._stream:
                self._chunks[-1] = (self._stream, self._chunks[-1][1] + text)
            else:
                self._chunks.append((self._stream, text))
        return len(text)

    def flush(self):
        pass


def _ignore_interrupts():
    # the parent alone answers Ctrl-C; it then terminates the workers
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _run_in_worker(job):
    """Run one file; its recorded output and its tally (both picklable)."""
    from gacalc.runner import ScriptRunner

    path, options = job
    chunks: list = []
    runner = ScriptRunner(options, out=_Recorder(chunks, OUT), err=_Recorder(chunks, ERR))
    tally = runner.run_file(path)
    return chunks, tally


def _context():
    # fork shares the parent's imports (sympy, flint) with every worker at no cost; the
    # statement watchdog restarts its thread after a fork.  Elsewhere: the default method.
    if "fork" in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context()


def _warm_up(options):
    """Import and first-use work done once in the parent, so that forked workers share it
    instead of each paying for it: the language, the printers, the simplifier's caches."""
    from gacalc.runner import ScriptRunner

    chunks: list = []
    ScriptRunner(options, out=_Recorder(chunks, OUT), err=_Recorder(chunks, ERR)).run_text(
        "vector a, b\ncheck a b == a . b + a /\\ b\n(a + e1)/2", "<warm-up>")


class ParallelFiles:
    """The recorded runs of ``paths``, handed out in file order as they finish."""

    def __init__(self, paths: list[str], options, jobs: int):
        _warm_up(options)
        self._pool = _context().Pool(min(jobs, len(paths)), initializer=_ignore_interrupts)
        self._results = self._pool.imap(_run_in_worker, [(path, options) for path in paths],
                                        chunksize=1)

    def __iter__(self):
        return self._results

    def close(self, interrupted: bool = False):
        if interrupted:
            self._pool.terminate()
        else:
            self._pool.close()
        self._pool.join()


def replay(chunks: list, out, err):
    """Write a worker's recorded output to the real streams, in the order it was written."""
    for stream, text in chunks:
        target = out if stream == OUT else err
        target.write(text)
        target.flush()
