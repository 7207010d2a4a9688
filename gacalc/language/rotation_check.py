"""``check L == R as rotation``: two rotors are the same rotation when L R~ is +1 or -1.

A rotor and its negative turn every vector the same way (x -> R x R~ is quadratic in R).
For rotors L and R, L x L~ = R x R~ for all x holds exactly when D = L R~ commutes with
every vector; D is even, so it is then a scalar with D D~ = 1: D = 1, D = -1, or a
scalar whose square is 1 (a sign that depends on the symbols).  The check proves which.

A unit quaternion stands for the same rotation as its rotor (q and -q as R and -R), so a
side that is a quaternion is compared through ``from_quaternion``.

Also here: the line a failed plain check adds when its sides differ only in sign.
"""

from __future__ import annotations

from gacalc.algebra import Multivector
from gacalc.printing.text import value_text
from gacalc.values import describe

from .errors import GacalcTypeError
from .evaluator import is_multivector, relevant_conditions


def _as_rotor(value):
    """(the multivector its kind compares as a rotation, whether it was a quaternion);
    a kind without one (a matrix, a list) gives the value back, for the refusal."""
    from gacalc.values import kind_of

    kind = kind_of(value)
    found = None if kind is None else kind.as_rotation(value)
    return found if found is not None else (value, False)


def _require_rotor(executor, value, side: str, node, exprs, quaternion: bool = False):
    """A one-line error unless the value is a rotor (even, R R~ = 1) under the conditions."""
    from gacalc.simplify import is_zero

    span = node.span
    if quaternion and value.is_zero():
        raise GacalcTypeError(f"'as rotation' compares rotations; {side} is the zero "
                              "quaternion", span)
    if quaternion:
        unit = is_zero(value * value.rev() - Multivector.scalar(1), exprs,
                       executor._simplify_budget())
        if unit is False:
            raise GacalcTypeError(f"'as rotation' compares rotations; {side} is not a unit "
                                  "quaternion (divide by its norm first)", span)
        if unit is None:
            raise GacalcTypeError(f"'as rotation' compares rotations; could not prove that "
                                  f"{side} is a unit quaternion", span)
        return
    if not is_multivector(value):
        raise GacalcTypeError(f"'as rotation' compares rotors; {side} is "
                              f"{describe(value)}, not a rotor", span)
    if not value.grades() <= {0, 2}:
        raise GacalcTypeError(f"'as rotation' compares rotors; {side} has odd grades "
                              f"(grades {', '.join(map(str, sorted(value.grades())))}), so it is "
                              "not a rotor", span)
    if value.is_zero():
        raise GacalcTypeError(f"'as rotation' compares rotors; {side} is 0", span)
    unit = is_zero(value * value.rev() - Multivector.scalar(1), exprs,
                   executor._simplify_budget())
    if unit is False:
        raise GacalcTypeError(f"'as rotation' compares rotors; {side} {side}~ is not 1, so "
                              f"{side} is not a rotor (divide by its norm first)", span)
    if unit is None:
        raise GacalcTypeError(f"'as rotation' compares rotors; could not prove {side} {side}~ "
                              f"= 1 for {side}", span)


def check_as_rotation(executor, statement, state, results, given, left, right):
    """The executor of ``check L == R as rotation`` (after both sides are evaluated)."""
    from gacalc.simplify import is_zero

    from .results import CheckResult

    (left, left_quaternion), (right, right_quaternion) = _as_rotor(left), _as_rotor(right)
    conditions = relevant_conditions(state.conditions() + given, [left, right])
    exprs = [c.expr for c in conditions]
    _require_rotor(executor, left, "L", statement.left, exprs, left_quaternion)
    _require_rotor(executor, right, "R", statement.right, exprs, right_quaternion)
    product = left * right.rev()           # L R^-1, R~ being the inverse of a rotor
    budget = executor._simplify_budget
    scalar, one = product.grade(0), Multivector.scalar(1)
    plane = is_zero(product.grade(2), exprs, budget())   # D must be a scalar
    sign, outcome = None, "undecided"
    if plane is False:
        outcome = "fails"
    elif plane is True:
        if is_zero(scalar - one, exprs, budget()) is True:
            outcome, sign = "holds", "L = R"
        elif is_zero(scalar + one, exprs, budget()) is True:
            outcome, sign = "holds", "L = -R"
        else:
            square = is_zero(scalar * scalar - one, exprs, budget())
            if square is True:
                factor, _, _ = executor._simplified(scalar, state, given)
                outcome = "holds"
                sign = f"L = s R with s = {value_text(factor)}, which is 1 or -1"
            elif square is False:
                outcome = "fails"
    difference, complete = None, True
    if outcome != "holds":
        difference, complete, _ = executor._simplified(product, state, given)
    used = list(dict.fromkeys(c.text for c in conditions)) if outcome != "undecided" else []
    results.append(executor._result(CheckResult, statement, outcome=outcome,
                                    difference=difference, conditions=used, complete=complete,
                                    rotation=True, note=sign or ""))


def sign_only_note(executor, left, right, exprs) -> str:
    """For a failed plain check: a note when L + R = 0 is proved (the sides differ only in
    sign), with the hint for rotors; '' otherwise."""
    from gacalc.simplify import is_zero

    (left, left_quaternion), (right, right_quaternion) = _as_rotor(left), _as_rotor(right)
    if not (is_multivector(left) and is_multivector(right)):
        return ""
    if is_zero(left + right, exprs, executor._simplify_budget()) is not True:
        return ""
    note = "L == -R: the two sides differ only in sign"
    if left_quaternion and right_quaternion:
        note += "\nfor unit quaternions, 'check L == R as rotation' compares the rotations"
    elif left.grades() <= {0, 2}:
        note += "\nfor rotors, 'check L == R as rotation' compares the rotations"
    return note
