"""The wall-clock budget of one statement.

A statement that runs past its deadline is abandoned with :class:`StatementTimeout`.
Two mechanisms enforce it:

- cooperative: the evaluator calls ``clock.check()`` at every node it evaluates (works in
  any thread);
- preemptive, in the main thread: a watching thread delivers SIGUSR1 to the main
  thread's Python handler through ``_thread.interrupt_main`` at the deadline, which
  interrupts long pure-Python work inside sympy.

Why not SIGALRM: the simplifier (gacalc.simplify.budget.time_limit) arms its own
ITIMER_REAL alarm only when none is armed, and disarms it when done.  Sharing that timer
would either silence the simplifier's alarm (so a long simplification could not fall
back to the honest unsimplified value) or let the simplifier cancel the statement's.
With the statement's deadline on its own signal, both work: the simplifier gets
``min(its budget, the statement's remaining time)`` and returns an unsimplified value
when that runs out; anything else that runs too long ends the statement.

Neither mechanism can stop a single long call into C (a python-flint product); the size
limits in gacalc.language.limits refuse those before they start.
"""

from __future__ import annotations

import _thread
import os
import signal
import threading
import time
from contextlib import contextmanager

from gacalc.simplify.budget import Budget

_SIGNAL = getattr(signal, "SIGUSR1", None)
REPEAT_SECONDS = 0.25     # past the deadline, the interrupt repeats this often


class StatementTimeout(BaseException):
    """The statement ran past its deadline.  A BaseException, like KeyboardInterrupt, so
    that no ``except Exception`` inside sympy or the core can swallow it."""


class StatementClock(Budget):
    """The deadline of the statement being run (None: no budget): a Budget whose
    running out abandons the statement."""

    def __init__(self):
        super().__init__(None)

    def check(self):
        if self.deadline is not None and time.monotonic() >= self.deadline:
            self.exceeded()

    def exceeded(self):
        raise StatementTimeout()


class _Alarm:
    """Interrupts the main thread at the running statement's deadline.

    One sleeping thread serves every statement: arming is a lock and, only when the
    thread must wake earlier than planned, a notify (a thread per statement cost about
    half a millisecond each, which long scripts of short statements would feel)."""

    def __init__(self):
        self._condition = threading.Condition()
        self._clock: StatementClock | None = None
        self._deadline: float | None = None
        self._sleeping_until: float | None = None   # None: idle until notified
        self._thread: threading.Thread | None = None

    def arm(self, clock: StatementClock):
        with self._condition:
            self._clock = clock
            self._deadline = clock.deadline
            if self._thread is None:
                self._thread = threading.Thread(target=self._watch, daemon=True,
                                                name="gacalc statement budget")
                self._thread.start()
            elif self._sleeping_until is None or self._sleeping_until > self._deadline:
                self._condition.notify()

    def disarm(self):
        with self._condition:
            self._clock = None
            self._deadline = None        # the thread finds out when it next wakes

    def owns(self, clock: StatementClock) -> bool:
        return self._clock is clock

    def _watch(self):
        with self._condition:
            while True:
                deadline = self._deadline
                if deadline is None:
                    self._sleeping_until = None
                    self._condition.wait()
                    continue
                remaining = deadline - time.monotonic()
                if remaining > 0:
                    self._sleeping_until = deadline
                    self._condition.wait(remaining)
                    continue
                # Again and again until the statement ends: an exception raised while
                # Python runs a finalizer or a gc callback is swallowed ("ignored").
                self._deadline = time.monotonic() + REPEAT_SECONDS
                try:
                    _thread.interrupt_main(_SIGNAL)
                except (ValueError, RuntimeError, OSError):
                    pass

    def _after_fork(self):
        # the watching thread does not exist in a forked child: start afresh there
        self.__init__()

    def handler(self, signum, frame):
        # Runs in the main thread.  A late signal from a finished statement is ignored.
        clock = self._clock
        if clock is not None and clock.expired():
            raise StatementTimeout()


_ALARM = _Alarm()
if hasattr(os, "register_at_fork"):
    os.register_at_fork(after_in_child=_ALARM._after_fork)


def _preemption_available() -> bool:
    return (_SIGNAL is not None
            and threading.current_thread() is threading.main_thread())


@contextmanager
def statement_budget(clock: StatementClock, seconds: float | None):
    """Run the body under a deadline of ``seconds`` (None: no deadline)."""
    clock.start(seconds)
    if seconds is None or not _preemption_available():
        try:
            yield clock
        finally:
            clock.start(None)
        return
    previous = signal.signal(_SIGNAL, _ALARM.handler)
    _ALARM.arm(clock)
    try:
        yield clock
    finally:
        _ALARM.disarm()
        clock.start(None)
        # None: the previous handler was installed from C; the default is the best guess.
        signal.signal(_SIGNAL, previous if previous is not None else signal.SIG_DFL)


def restart(clock: StatementClock):
    """A fresh deadline of the same length (each statement of a used file gets its own)."""
    if clock.seconds is None:
        return
    clock.start(clock.seconds)
    if _preemption_available() and _ALARM.owns(clock):
        _ALARM.arm(clock)
