"""Time budgets for simplification: a deadline checked at safe points, and an alarm for sympy.

The alarm (SIGALRM, main thread only) interrupts long sympy calls that have no check
points of their own; elsewhere only the explicit ``check`` calls enforce the budget.
"""

from __future__ import annotations

import signal
import threading
import time
from contextlib import contextmanager


class BudgetExceeded(Exception):
    """The time budget ran out; the caller falls back to the unsimplified value."""


class Budget:
    def __init__(self, seconds: float):
        self.seconds = seconds
        self.deadline = time.monotonic() + seconds

    def remaining(self) -> float:
        return self.deadline - time.monotonic()

    def check(self):
        if time.monotonic() > self.deadline:
            raise BudgetExceeded(f"time budget of {self.seconds:g} s ran out")


def _alarm(signum, frame):
    raise BudgetExceeded("time budget ran out")


@contextmanager
def time_limit(budget: Budget):
    """Arm SIGALRM for the budget's remaining time unless an outer limit is already armed."""
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
    previous = signal.signal(signal.SIGALRM, _alarm)
    signal.setitimer(signal.ITIMER_REAL, remaining)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
