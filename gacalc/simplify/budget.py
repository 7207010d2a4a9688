"""Deadlines: the one type of time budget, and an alarm for sympy.

A ``Budget`` is a deadline some seconds ahead (or none).  The same type serves every
layer: a statement's wall-clock budget (gacalc.language.watchdog.StatementClock is a
Budget whose ``check`` raises its own exception), the report of ``show`` and each
simplification, which takes ``within(seconds)`` of whatever budget it runs under, so
an inner budget never outlives an outer one.

The alarm (SIGALRM, main thread only) interrupts long sympy calls that have no check
points of their own; elsewhere only the explicit ``check`` calls enforce the budget.
"""

from __future__ import annotations

import math
import signal
import threading
import time
from contextlib import contextmanager


class BudgetExceeded(Exception):
    """The time budget ran out; the caller falls back to the unsimplified value."""


class Budget:
    """A deadline ``seconds`` from now; ``None`` (or infinity) is no deadline."""

    def __init__(self, seconds: float | None = None):
        self.start(seconds)

    def start(self, seconds: float | None):
        """Restart the deadline ``seconds`` from now (None: no deadline)."""
        if seconds is not None and math.isinf(seconds):
            seconds = None
        self.seconds = seconds
        self.deadline = None if seconds is None else time.monotonic() + seconds

    def remaining(self) -> float:
        """Seconds left (may be negative); infinity without a deadline."""
        if self.deadline is None:
            return math.inf
        return self.deadline - time.monotonic()

    def expired(self) -> bool:
        return self.deadline is not None and time.monotonic() >= self.deadline

    def check(self):
        if self.deadline is not None and time.monotonic() > self.deadline:
            self.exceeded()

    def exceeded(self):
        """What running out means; a subclass raises its own exception."""
        raise BudgetExceeded(f"time budget of {self.seconds:g} s ran out")

    def within(self, seconds: float | None, margin: float = 0.0) -> "Budget":
        """A new budget of ``seconds`` that ends no later than this one (``margin`` seconds
        before it)."""
        left = max(self.remaining() - margin, 0.0)
        if seconds is None:
            return Budget(left)
        return Budget(min(float(seconds), left))


def _alarm(signum, frame):
    raise BudgetExceeded("time budget ran out")


REPEAT_SECONDS = 0.25    # past the deadline, the alarm repeats this often


@contextmanager
def time_limit(budget: Budget, repeat: float = REPEAT_SECONDS):
    """Arm SIGALRM for the budget's remaining time unless an outer limit is already armed.

    The alarm repeats every ``repeat`` seconds after the deadline until the body ends: a
    BudgetExceeded raised where sympy catches every Exception (or where an inner
    fallback takes it) is raised again, so the limit holds however the body is written."""
    if budget.remaining() <= 0:      # spent already, whatever alarm is armed outside
        raise BudgetExceeded("time budget ran out")
    usable = (
        threading.current_thread() is threading.main_thread()
        and hasattr(signal, "setitimer")
        and signal.getitimer(signal.ITIMER_REAL)[0] == 0
    )
    if not usable:
        yield
        return
    remaining = budget.remaining()
    if remaining <= 0:
        raise BudgetExceeded("time budget ran out")
    if math.isinf(remaining):
        yield
        return
    previous = signal.signal(signal.SIGALRM, _alarm)
    signal.setitimer(signal.ITIMER_REAL, remaining, repeat)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
