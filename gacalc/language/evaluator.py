"""Evaluation of expression trees to values, over a session state.

Values are Multivectors (scalars are grade-0 multivectors), sympy matrices (from
``matrix`` and ``pauli``), sympy quaternions (from ``quaternion``) and linear maps (from
``linmap``); see gacalc.values.

Names resolve, in order: parameters of the function being evaluated (lexical: a
function body never sees its caller's parameters), the session's names, ``ans``, the
constants ``pi`` and ``I`` and the basis blades ``e1 ... e123`` (any index string).  A
name never assigned is a real scalar symbol; its first use adds a note once.

``name(args)`` is a call when name is a function (built-in or user), a product when it
is a value.  For a name that is neither, ``k(a + b)`` is a product with the new symbol
k, except that a name written right against '(' that resembles a function name is an
error with a suggestion ("did you mean sin?").
"""

from __future__ import annotations

import difflib
import math
import re
from dataclasses import dataclass, field

from gacalc.lazy import sympy

from gacalc.algebra import AlgebraError, Multivector, NotInvertibleError, blade
from gacalc.printing.text import scalar_text
from gacalc.values import describe as describe_value, kind_of, symbols as value_symbols
from gacalc.values.matrix import MATRIX
from gacalc.values.quaternion import QUATERNION

from . import limits
from . import syntax as S
from . import tokens as T
from .builtins import BUILTINS
from .literals import evaluate_literal
from .errors import (GacalcError, GacalcLimitError, GacalcMathError, GacalcNameError,
                     GacalcTypeError, Span)
from .watchdog import StatementClock

MAX_EXPONENT = 1000
MAX_CALL_DEPTH = 40
MAX_EVAL_DEPTH = 250
MAX_RESULT_DIGITS = 4000     # Python refuses to print integers much longer

_BLADE_NAME = re.compile(r"e[1-3]+\Z")
_NOT_A_BLADE = re.compile(r"e[0-9]+\Z")
_RUN_TOGETHER_BLADES = re.compile(r"(?:e[0-9]+){2,}\Z")
_BLADE_PARTS = re.compile(r"e[0-9]+")
_WEDGE_METHODS = {T.WEDGE: "outer", T.LCONTRACT: "lc", T.RCONTRACT: "rc", T.INNER: "inner"}
_WEDGE_NAMES = {T.WEDGE: "outer product", T.LCONTRACT: "left contraction",
                T.RCONTRACT: "right contraction", T.INNER: "inner product"}


def symbol(name: str) -> sympy.Symbol:
    """The real scalar symbol of a name (the same object the core uses for components)."""
    return sympy.Symbol(name, real=True)


@dataclass
class UserFunction:
    name: str
    params: list[str]
    body: S.Node
    text: str           # the definition as written, for help and save


@dataclass
class Condition:
    """A side condition: ``expr`` = 0 on the set where it holds; ``text`` for people."""

    expr: object
    text: str
    origin: str = "assume"   # 'declaration', 'assume' or 'given'


@dataclass
class State:
    """Everything a session remembers.  Copied before each statement, committed after."""

    values: dict = field(default_factory=dict)
    functions: dict = field(default_factory=dict)
    declarations: dict = field(default_factory=dict)      # name -> kind
    unit_names: set = field(default_factory=set)          # declared with 'unit'
    facts: dict = field(default_factory=dict)             # name -> [Condition] of its symbols
    assumptions: list = field(default_factory=list)       # [Condition] from assume
    ans: object = None
    known_symbols: set = field(default_factory=set)       # names already noted as symbols
    log: list = field(default_factory=list)               # statement texts, for save
    # name -> the scalar names it is a function of, for 'vector r(t)': r and r1, r2, r3
    dependence: dict = field(default_factory=dict)

    def copy(self) -> "State":
        return State(dict(self.values), dict(self.functions), dict(self.declarations),
                     set(self.unit_names), dict(self.facts), list(self.assumptions),
                     self.ans, set(self.known_symbols), list(self.log),
                     dict(self.dependence))

    def conditions(self) -> list:
        out = []
        for facts in self.facts.values():
            out.extend(facts)
        out.extend(self.assumptions)
        return out


def is_multivector(value) -> bool:
    return isinstance(value, Multivector)


def whole_number(value) -> int | None:
    """The value as an int when it is a rational scalar with denominator 1, else None."""
    q = value.rational_scalar() if is_multivector(value) else None
    return int(q) if q is not None and q.denominator == 1 else None


class Evaluator:
    """Evaluates expressions against a (scratch) State; collects notes."""

    def __init__(self, state: State, extra_conditions: list | None = None,
                 clock: StatementClock | None = None):
        self.state = state
        self.extra_conditions = list(extra_conditions or ())
        self.notes: list[tuple[str, Span | None]] = []
        self.call_depth = 0
        self.matrix_depth = 0     # inside [ ]: i is the complex unit
        self.depth = 0
        self.clock = clock
        self.literal_shapes: dict = {}     # (node id, depth) -> literal or mark (literals.py)

    # Notes ----------------------------------------------------------------------
    def note(self, text: str, span: Span | None = None):
        if all(existing != text for existing, _ in self.notes):
            self.notes.append((text, span))

    # Entry ----------------------------------------------------------------------
    def evaluate(self, node: S.Node, frame: dict | None = None):
        self.depth += 1
        try:
            if self.clock is not None:
                self.clock.check()      # the statement's time budget, between nodes
            if self.depth > MAX_EVAL_DEPTH:
                raise GacalcLimitError("expression nested too deeply to evaluate", node.span)
            method = getattr(self, "_eval_" + type(node).__name__)
            return method(node, frame)
        except AlgebraError as error:
            raise math_error(error, node.span) from None
        except ZeroDivisionError:
            raise GacalcMathError("division by zero", node.span) from None
        finally:
            self.depth -= 1

    # Leaves ---------------------------------------------------------------------
    def _eval_Number(self, node: S.Number, frame):
        return Multivector.from_rationals((node.value,))     # exact, and needs no sympy

    def _eval_Name(self, node: S.Name, frame):
        return self.lookup(node.name, node.span, frame)

    def lookup(self, name: str, span: Span, frame: dict | None):
        if frame is not None and name in frame:
            return frame[name]
        if self.matrix_depth and name == "i":
            return blade("123")     # the complex unit of a matrix entry
        if self.matrix_depth and name == "I":
            raise GacalcNameError("inside [ ] the complex unit is written i; I is the "
                                  "pseudoscalar e123, not a matrix entry", span)
        state = self.state
        if name in state.values:
            return state.values[name]
        if name in state.dependence:       # r1 of 'vector r(t)' is r1(t)
            return Multivector.scalar(sympy.Function(name, real=True)(
                *(symbol(param) for param in state.dependence[name])))
        if name == "ans":
            if state.ans is None:
                raise GacalcNameError("ans has no value yet: it holds the last result", span)
            return state.ans
        if name == "pi":
            return Multivector.scalar(sympy.pi)
        if name == "I":
            return blade("123")
        if _BLADE_NAME.match(name):
            return blade(name[1:])
        if _NOT_A_BLADE.match(name):
            raise GacalcNameError(f"there is no {name} in Cl(3,0): the basis vectors are e1, "
                                  "e2 and e3 (blades such as e12, e123)", span)
        if _RUN_TOGETHER_BLADES.match(name):
            raise GacalcNameError(f"{name} is not a blade name: write the factors apart "
                                  f"({' '.join(_BLADE_PARTS.findall(name))}) or as one index "
                                  "string such as e12", span)
        if name in BUILTINS:
            raise GacalcTypeError(f"{name} is a function: call it as "
                                  f"{BUILTINS[name].signature}", span)
        if name in state.functions:
            params = ", ".join(state.functions[name].params)
            raise GacalcTypeError(f"{name} is a function: call it as {name}({params})", span)
        return self.new_symbol(name, span)

    def new_symbol(self, name: str, span: Span | None):
        if name not in self.state.known_symbols:
            similar = difflib.get_close_matches(name, self._value_names(), n=1, cutoff=0.75)
            self.state.known_symbols.add(name)
            hint = f" (did you mean {similar[0]}?)" if similar else ""
            self.note(f"{name} is a new scalar symbol{hint}", span)
        return Multivector.scalar(symbol(name))

    def _value_names(self):
        return [name for name in self.state.values] + sorted(self.state.known_symbols)

    # Sums and products ----------------------------------------------------------------
    def _literal(self, node, frame):
        """The value of a subtree of numbers and blades computed in fractions, or None."""
        if self.matrix_depth:
            return None                    # inside [ ] names such as i mean other things
        state = self.state
        return evaluate_literal(node, frame, state.values, state.dependence,
                                self.literal_shapes, self.depth, MAX_EVAL_DEPTH)

    def _eval_Sum(self, node: S.Sum, frame):
        literal = self._literal(node, frame)
        if literal is not None:
            return literal
        total = self.evaluate(node.terms[0], frame)
        for sign, term in zip(node.signs[1:], node.terms[1:]):
            value = self.evaluate(term, frame)
            total = self.add(total, value, sign, term.span)
        return total

    def _coerced(self, left, right):
        """(left, right) in one kind when one side's kind takes the other (a multivector
        next to a Pauli matrix); unchanged otherwise."""
        left_kind, right_kind = kind_of(left), kind_of(right)
        if left_kind is None or right_kind is None or left_kind is right_kind:
            return left, right
        converted = getattr(right_kind, "coerce", lambda v, like: None)(left, right)
        if converted is not None:
            return converted, right
        converted = getattr(left_kind, "coerce", lambda v, like: None)(right, left)
        if converted is not None:
            return left, converted
        return left, right

    def add(self, left, right, sign: int, span: Span):
        left, right = self._coerced(left, right)
        kind = kind_of(left)
        if kind is not None and kind_of(right) is kind:
            total = kind.add(left, right, sign, span)
            if total is not None:
                return total
        raise GacalcTypeError(f"cannot {'add' if sign > 0 else 'subtract'} "
                              f"{describe_value(right)} {'to' if sign > 0 else 'from'} "
                              f"{describe_value(left)}", span)

    def _eval_Product(self, node: S.Product, frame):
        literal = self._literal(node, frame)
        if literal is not None:
            return literal
        total = self.evaluate(node.factors[0], frame)
        for op, factor in zip(node.ops[1:], node.factors[1:]):
            value = self.evaluate(factor, frame)
            if op == "/":
                total = self.divide(total, value, factor.span, node.span)
            else:
                total = self.multiply(total, value, factor.span)
        return total

    def multiply(self, left, right, span: Span):
        """Two values of one kind multiply as that kind says; a value of another kind is
        first offered to the left one's act_on (a linear map applied to a multivector);
        otherwise a scalar scales any value."""
        left_kind, right_kind = kind_of(left), kind_of(right)
        if left_kind is not right_kind and not (
                is_multivector(left) and left.is_scalar() or
                is_multivector(right) and right.is_scalar()):
            left, right = self._coerced(left, right)
            left_kind, right_kind = kind_of(left), kind_of(right)
        result = None
        if left_kind is not None and left_kind is right_kind:
            result = left_kind.multiply(left, right, span)
        elif left_kind is not None and right_kind is not None:
            result = left_kind.act_on(self, left, right, span)
            if result is None:
                result = self._scaled(left_kind, left, right_kind, right)
        if result is None:
            raise GacalcTypeError(f"cannot multiply {describe_value(left)} by "
                                  f"{describe_value(right)}", span)
        return result

    @staticmethod
    def _scaled(left_kind, left, right_kind, right):
        factor = left_kind.as_scalar(left)
        if factor is not None:
            return right_kind.scale(right, factor)
        factor = right_kind.as_scalar(right)
        return None if factor is None else left_kind.scale(left, factor)

    def divide(self, left, right, span: Span, whole: Span):
        return self._kind(right).divide(self, left, right, span)

    def inverse(self, value, span: Span):
        """value^-1, as the value's kind computes it (with notes on its validity)."""
        return self._kind(value).inverse(self, value, span)

    def _kind(self, value):
        kind = kind_of(value)
        if kind is None:     # a bug: every value the evaluator makes has a kind
            raise TypeError(f"not a gacalc value: {type(value).__name__}")
        return kind

    def active_conditions(self, values) -> list:
        """The side conditions in force (the session's and this check's) that concern
        the values."""
        return relevant_conditions(self.state.conditions() + self.extra_conditions, values)

    # Wedge family and unary operators ---------------------------------------------------
    def _eval_Wedge(self, node: S.Wedge, frame):
        values = [self.evaluate(operand, frame) for operand in node.operands]
        for value, operand in zip(values, node.operands):
            if not is_multivector(value):
                raise GacalcTypeError(f"the {_WEDGE_NAMES[node.op]} needs multivectors, not "
                                      f"{describe_value(value)}", operand.span)
        method = _WEDGE_METHODS[node.op]
        what = f"this {_WEDGE_NAMES[node.op]}"
        if node.op == T.LCONTRACT:          # a _| b _| C = a _| (b _| C)
            result = values[-1]
            for value in reversed(values[:-1]):
                limits.check_product(value, result, node.span, what)
                result = getattr(value, method)(result)
            return result
        result = values[0]
        for value in values[1:]:
            limits.check_product(result, value, node.span, what)
            result = getattr(result, method)(value)
        return result

    def _eval_Negate(self, node: S.Negate, frame):
        literal = self._literal(node, frame)
        if literal is not None:
            return literal
        value = self.evaluate(node.operand, frame)
        negated = self._kind(value).negate(value)
        if negated is None:
            raise GacalcTypeError(f"cannot negate {describe_value(value)}", node.span)
        return negated

    def _eval_Reverse(self, node: S.Reverse, frame):
        value = self.multivector(self.evaluate(node.operand, frame), node.operand.span,
                                 "the reverse")
        return value.rev()

    def _eval_GradePart(self, node: S.GradePart, frame):
        value = self.multivector(self.evaluate(node.operand, frame), node.operand.span,
                                 "a grade part")
        return value.grade(0 if node.grade is None else node.grade)

    def _eval_Power(self, node: S.Power, frame):
        base = self.evaluate(node.base, frame)
        exponent_value = self.evaluate(node.exponent, frame)
        exact = self._whole_power(base, whole_number(exponent_value), node)
        if exact is not None:
            return exact
        exponent = self.scalar(exponent_value, node.exponent.span, "an exponent")
        return self.power(base, exponent, node)

    def _whole_power(self, base, n: int | None, node: S.Power):
        """base^n for a whole n, computed as the multivector kind would but without sympy
        (a rational statement starts without importing it); None: take the general path,
        which also says what is wrong."""
        if n is None or abs(n) > MAX_EXPONENT or not is_multivector(base):
            return None
        if not base.is_scalar():
            if n < 0:
                base, n = self.inverse(base, node.span), -n
            return self.integer_power(base, n, node.span)
        q = base.rational_scalar()
        if q is None or (q == 0 and n < 0):
            return None
        size = max(abs(q.numerator), q.denominator)
        if size > 1 and abs(n) * math.log10(size) > MAX_RESULT_DIGITS:
            return None
        if abs(n) >= 2:
            limits.check_power(base, abs(n), node.span)
        return Multivector.scalar(q ** n)

    def power(self, base, exponent, node: S.Power):
        span = node.exponent.span
        if exponent.is_Rational:
            limit = MAX_EXPONENT
            if abs(exponent.p) > limit or exponent.q > limit:
                shown = str(exponent) if len(str(exponent)) <= 20 else "with so many digits"
                raise GacalcLimitError(f"exponent {shown} is too large (the limit is "
                                       f"{limit})", span)
        elif exponent.is_Number:
            raise GacalcTypeError("exponents are exact numbers or scalar symbols", span)
        return self._kind(base).power(self, base, exponent, node)

    def integer_power(self, base, n: int, span: Span):
        """base^n (n >= 0) by repeated squaring, each product checked against the limits."""
        if n >= 2:
            limits.check_power(base, n, span)   # bounds the result and every square
        result, square = None, base
        while n:
            if n & 1:
                result = square if result is None else self._power_step(result, square, span)
            n >>= 1
            if n:
                square = self._power_step(square, square, span)
        return result if result is not None else Multivector.scalar(1)

    def _power_step(self, left, right, span: Span):
        if is_multivector(left) and is_multivector(right):
            limits.check_product(left, right, span, "this power", result_bound=False)
            return left * right
        return self.multiply(left, right, span)

    # Lists and indexing ------------------------------------------------------------
    def _eval_MatrixLiteral(self, node: S.MatrixLiteral, frame):
        """[a, b; c, d] as a matrix value.  Entries are scalars; inside the brackets i is
        the complex unit (an entry a + b i), computed as the central a + b e123, which
        multiplies exactly like a complex number (I^2 = -1, I commutes with all)."""
        self.matrix_depth += 1
        try:
            rows = []
            for row in node.rows:
                entries = []
                for entry in row:
                    value = self.evaluate(entry, frame)
                    if not is_multivector(value) or not set(value.grades()) <= {0, 3}:
                        raise GacalcTypeError("a matrix entry is a scalar (complex ones "
                                              f"written with i), not {describe_value(value)}",
                                              entry.span)
                    entries.append(value.scalar_part() + sympy.I * value["e123"])
                rows.append(entries)
        finally:
            self.matrix_depth -= 1
        return sympy.ImmutableMatrix(rows)

    def _eval_ListLiteral(self, node: S.ListLiteral, frame):
        from gacalc.values.sequence import ValueList

        return ValueList(self.evaluate(item, frame) for item in node.items)

    def _eval_Index(self, node: S.Index, frame):
        base = self.evaluate(node.base, frame)
        indices = [self.evaluate(index, frame) for index in node.indices]
        spans = [index.span for index in node.indices] + [node.span]
        return self._kind(base).index(self, base, indices, spans)

    def index_number(self, value, span: Span, count: int, what: str = "items") -> int:
        """A 1-based index into ``count`` items, as a Python int."""
        exact = whole_number(value)                # read without sympy when it is one
        if exact is not None and 1 <= exact <= count:
            return exact
        number = self.scalar(value, span, "an index")
        if not number.is_Integer:
            raise GacalcTypeError(f"an index is a whole number from 1 to {count}, not "
                                  f"{scalar_text(number)}", span)
        position = int(number)
        if not 1 <= position <= count:
            raise GacalcTypeError(f"index {position} is out of range: {what} are numbered "
                                  f"1 to {count}", span)
        return position

    # Calls -------------------------------------------------------------------------
    def _eval_Call(self, node: S.Call, frame):
        name = node.name
        if frame is not None and name in frame:
            return self._as_product(node, frame[name], frame)
        state = self.state
        if name in state.dependence:
            return self.call_dependent(name, node, frame)
        if name in state.values or name in ("ans", "pi", "I") or _BLADE_NAME.match(name):
            return self._as_product(node, self.lookup(name, node.name_span, frame), frame)
        if name in state.functions:
            return self.call_user(state.functions[name], node, frame)
        if name in BUILTINS:
            return self.call_builtin(BUILTINS[name], node, frame)
        if _NOT_A_BLADE.match(name):
            self.lookup(name, node.name_span, frame)   # raises the blade error
        if len(node.args) != 1:
            raise self._unknown_function(node, force=True)
        if not node.spaced and name not in state.known_symbols:
            error = self._unknown_function(node, force=False)
            if error is not None:
                raise error
        return self._as_product(node, self.new_symbol(name, node.name_span), frame)

    def call_dependent(self, name: str, node: S.Call, frame):
        """r(s) or r1(s) for a name declared as a function ('vector r(t)'): the value with
        its variables replaced by the arguments (r(t) is r itself)."""
        params = self.state.dependence[name]
        if len(node.args) != len(params):
            raise GacalcTypeError(f"{name} is declared as a function of {', '.join(params)}, "
                                  f"so it takes {len(params)} argument"
                                  f"{'' if len(params) == 1 else 's'}", node.span)
        args = [self.scalar(self.evaluate(arg, frame), arg.span, f"an argument of {name}")
                for arg in node.args]
        variables = [symbol(param) for param in params]
        if name in self.state.values:
            value = self.state.values[name]
            if args == variables:
                return value
            return value.subs(dict(zip(variables, args)))
        return Multivector.scalar(sympy.Function(name, real=True)(*args))

    def _unknown_function(self, node: S.Call, force: bool):
        candidates = list(BUILTINS) + list(self.state.functions)
        similar = difflib.get_close_matches(node.name, candidates, n=1, cutoff=0.6)
        if similar:
            return GacalcNameError(f"unknown function {node.name}", node.name_span,
                                   hint=f"did you mean {similar[0]}?")
        if force:
            return GacalcNameError(f"unknown function {node.name}", node.name_span,
                                   hint="help lists the functions")
        return None

    def _as_product(self, node: S.Call, value, frame):
        if len(node.args) != 1:
            raise GacalcTypeError(f"{node.name} is a value, not a function, so "
                                  f"{node.name}(...) with {len(node.args)} arguments means "
                                  "nothing", node.name_span)
        return self.multiply(value, self.evaluate(node.args[0], frame), node.args[0].span)

    def call_builtin(self, function, node: S.Call, frame):
        count = len(node.args)
        if not function.min_args <= count <= function.max_args:
            raise GacalcTypeError(f"{function.name} takes {function.arity_text()}, not "
                                  f"{count}: {function.signature}", node.span)
        args = [self._builtin_argument(function, arg, frame) for arg in node.args]
        limits.check_call(function, args, node.span)
        context = CallContext(self, function, node, args)
        try:
            result = function.impl(context, *args)
        except GacalcError as error:
            raise error.with_span(node.span)
        except NotInvertibleError as error:
            raise math_error(error, node.span) from None
        except (AlgebraError, ValueError, NotImplementedError, ArithmeticError) as error:
            # The core and sympy refuse some inputs with these; the messages are for users.
            message = _exception_text(error)
            if not message.startswith(function.name):
                message = f"{function.name}: {message}"
            raise GacalcMathError(message, node.span) from None
        if is_multivector(result) and result.is_scalar() and result.rational_scalar() is None:
            check_finite(result.scalar_part(), node.span)      # a rational is finite
        limits.check_value(result, node.span, f"the result of {function.name}")
        return result

    def _builtin_argument(self, function, arg: S.Node, frame):
        """An argument's value; a word in quotes stays a Python str where words are taken."""
        if isinstance(arg, S.Text) and function.words:
            return arg.value
        if isinstance(arg, S.Text):
            raise GacalcTypeError(f"{function.name} takes no words in quotes here: "
                                  f"\"{arg.value}\" is not a value", arg.span)
        return self.evaluate(arg, frame)

    def _eval_Text(self, node: S.Text, frame):
        raise GacalcTypeError(f"\"{node.value}\" is a word in quotes, not a value: words "
                              "name conventions in calls such as euler_angles(R, \"zyx\")",
                              node.span)

    def call_user(self, function: UserFunction, node: S.Call, frame):
        count = len(node.args)
        if count != len(function.params):
            raise GacalcTypeError(f"{function.name} takes {len(function.params)} argument"
                                  f"{'' if len(function.params) == 1 else 's'}, not {count}: "
                                  f"{function.name}({', '.join(function.params)})", node.span)
        args = [self.evaluate(arg, frame) for arg in node.args]
        if self.call_depth >= MAX_CALL_DEPTH:
            raise GacalcLimitError(f"function calls nested more than {MAX_CALL_DEPTH} deep",
                                   node.span)
        self.call_depth += 1
        try:
            return self.evaluate(function.body, dict(zip(function.params, args)))
        except GacalcError as error:
            # Point at the call the user just wrote, naming the function.
            if error.span is not None and error.span.source is not node.span.source \
                    or error.span is not None and not (node.span.start <= error.span.start
                                                       <= node.span.end):
                error.message = f"in {function.name}: {error.message}"
                error.span = node.span
            raise
        finally:
            self.call_depth -= 1

    # Argument checks shared with CallContext -------------------------------------------
    def multivector(self, value, span: Span, what: str):
        if not is_multivector(value):
            raise GacalcTypeError(f"{what} needs a multivector, not {describe_value(value)}",
                                  span)
        return value

    def scalar(self, value, span: Span, what: str):
        if is_multivector(value) and (value.is_scalar() or value.is_zero()):
            return value.scalar_part()
        raise GacalcTypeError(f"{what} must be a scalar, not {describe_value(value)}", span)


class CallContext:
    """What a built-in sees: its arguments with checks that point at the right text."""

    def __init__(self, evaluator: Evaluator, function, node: S.Call, args: list):
        self.evaluator = evaluator
        self.function = function
        self.node = node
        self.args = args

    def span(self, index: int | None) -> Span:
        if index is None or index >= len(self.node.args):
            return self.node.span
        return self.node.args[index].span

    def fail(self, message: str, index: int | None = None):
        raise GacalcTypeError(f"{self.function.name}: {message}", self.span(index))

    def note(self, text: str):
        self.evaluator.note(text, self.node.span)

    def conditions(self) -> tuple:
        """Active side conditions (sympy Exprs equal to zero) that concern the arguments."""
        return tuple(c.expr for c in self.evaluator.active_conditions(self.args))

    def _what(self, index: int) -> str:
        ordinal = ("first", "second", "third", "fourth")[index] if index < 4 else f"#{index + 1}"
        return f"the {ordinal} argument of {self.function.name}"

    def multivector(self, index: int):
        return self.evaluator.multivector(self.args[index], self.span(index), self._what(index))

    def vector(self, index: int):
        value = self.multivector(index)
        if not value.grades() <= {1}:
            raise GacalcTypeError(f"{self._what(index)} must be a vector, not "
                                  f"{describe_value(value)}", self.span(index))
        return value

    def scalar(self, index: int):
        return self.evaluator.scalar(self.args[index], self.span(index), self._what(index))

    def rational(self, index: int):
        value = self.scalar(index)
        if not value.is_Rational:
            raise GacalcTypeError(f"{self._what(index)} must be an exact number such as 1/2",
                                  self.span(index))
        return value

    def integer(self, index: int, low: int, high: int) -> int:
        exact = whole_number(self.args[index])     # read without sympy when it is one
        if exact is not None and low <= exact <= high:
            return exact
        value = self.scalar(index)
        if not value.is_Integer or not low <= int(value) <= high:
            raise GacalcTypeError(f"{self._what(index)} must be a whole number from {low} to "
                                  f"{high}", self.span(index))
        return int(value)

    def inverse(self, value, index: int):
        return self.evaluator.inverse(value, self.span(index))

    def word(self, index: int, example: str) -> str:
        """A word in quotes (for built-ins registered with words=True)."""
        value = self.args[index]
        if not isinstance(value, str):
            raise GacalcTypeError(f"{self._what(index)} must be a word in quotes such as "
                                  f"{example}, not {describe_value(value)}", self.span(index))
        return value

    def is_word(self, index: int) -> bool:
        return isinstance(self.args[index], str)

    def quaternion(self, index: int):
        value = self.args[index]
        if kind_of(value) is QUATERNION:
            return value
        raise GacalcTypeError(f"{self._what(index)} must be a quaternion value (from "
                              f"quaternion(...)), not {describe_value(value)}", self.span(index))

    def matrix_argument(self, args, rows: int, cols: int, name: str,
                        complex_entries: bool = False):
        """A matrix value, or rows*cols entries given one by one (row by row)."""
        if len(args) == 1:
            value = args[0]
            if kind_of(value) is not MATRIX or value.shape != (rows, cols):
                self.fail(f"expected a {rows}x{cols} matrix value or its {rows * cols} entries",
                          0)
            return value
        if len(args) != rows * cols:
            self.fail(f"expected a {rows}x{cols} matrix value or its {rows * cols} entries")
        entries = []
        for index in range(len(args)):
            value = self.multivector(index)
            if complex_entries:
                if not value.grades() <= {0, 3}:
                    raise GacalcTypeError(f"{self._what(index)} must be a complex number "
                                          "a + b I", self.span(index))
                entries.append(value.scalar_part() + sympy.I * value["e123"])
            else:
                entries.append(self.scalar(index))
        return sympy.Matrix(rows, cols, entries)


# Helpers -----------------------------------------------------------------------------
def relevant_conditions(conditions: list, values) -> list:
    """The conditions connected to the values' symbols (directly or through each other);
    conditions on unrelated symbols cannot matter and only cost time."""
    if not conditions:
        return []
    if not isinstance(values, (list, tuple)):
        values = [values]
    symbols = set()
    for value in values:
        symbols |= value_symbols(value)
    chosen, remaining = [], list(conditions)
    changed = True
    while changed:
        changed = False
        for condition in list(remaining):
            condition_symbols = condition.expr.free_symbols
            if condition_symbols & symbols:
                chosen.append(condition)
                remaining.remove(condition)
                symbols |= condition_symbols
                changed = True
    return chosen


def check_result_digits(base, exponent, span: Span):
    """Refuse exact powers whose numbers would be enormous (10^1000^1000...)."""
    if not (base.is_Rational and exponent.is_Rational) or base == 0:
        return
    size = max(abs(base.p), base.q)
    if size <= 1:
        return
    digits = abs(exponent.p) / exponent.q * math.log10(size)
    if digits > MAX_RESULT_DIGITS:
        raise GacalcLimitError(f"the result would have about {int(digits)} digits (the limit "
                               f"is {MAX_RESULT_DIGITS})", span)


def check_finite(expr, span: Span):
    if expr.has(sympy.zoo, sympy.nan, sympy.oo, -sympy.oo):
        raise GacalcMathError("the result is undefined (a division by zero or a pole)", span)


def _exception_text(error: Exception) -> str:
    text = str(error).strip().splitlines()[0] if str(error).strip() else type(error).__name__
    return text[:200]


def math_error(error: AlgebraError, span: Span) -> GacalcMathError:
    message = _exception_text(error)
    condition = getattr(error, "condition", None)
    if isinstance(error, NotInvertibleError) and condition is not None \
            and "not invertible" not in message:
        message = f"not invertible: {scalar_text(condition)} = 0"
    return GacalcMathError(message, span)
