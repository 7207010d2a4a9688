"""Text printing of gacalc values: the output is valid gacalc input.

Layout (our own)
----------------
- A multivector is written grade by grade in the basis order 1; e1, e2, e3; e23, e31,
  e12; e123, one term per blade: ``3 - 2*e1 + (a1*b2 - a2*b1)*e12``.
- A blade's coefficient is written before it with ``*``; a coefficient that is a sum
  goes in parentheses; a coefficient of 1 is left out (``e12``), and a negative single
  term shows its sign as the operator (``- sin(theta)*e31``).  When the value has more
  than one term, a scalar part that is a sum is parenthesised too.
- The zero multivector is ``0``.
- A result longer than the line width is broken at grade boundaries (and, where one
  grade is still too long, between terms).  Each broken line ends with the ``+`` or
  ``-`` that joins it to the next, so the whole text still reads back as one
  expression; continuation lines are indented by two spaces.
- ASCII mode uses ``*``, ``^`` and plain names.  Unicode mode writes juxtaposition
  (a space) for ``*`` (but keeps ``*`` before a parenthesis that follows a name, which
  would otherwise read as a call), ``−`` for minus, superscripts for integer powers
  (``θ²``) and Greek letters for Greek names (theta -> θ); gacalc reads it back too.
- Matrices (from ``matrix`` and ``pauli``) print as bracketed rows and quaternions as
  ``w + x i + y j + z k``; these are displays, not input (use ``from_matrix``,
  ``from_quaternion`` with the entries).

This module knows nothing of parsing; it uses the core's ``coefficient_texts()`` (ASCII
straight from the coefficient domain, fast) and only the Greek and operator spelling
tables of the language.
"""

from __future__ import annotations

import re

from gacalc.language.tokens import GREEK_LETTERS

BASIS_NAMES = ("1", "e1", "e2", "e3", "e23", "e31", "e12", "e123")
BASIS_GRADES = (0, 1, 1, 1, 2, 2, 2, 3)
DEFAULT_WIDTH = 78
UNICODE_MINUS = "\u2212"
_SUPERSCRIPTS = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


# Coefficient texts ---------------------------------------------------------------
def is_sum(text: str) -> bool:
    """True when a coefficient text has a + or - at the top level (not its leading sign)."""
    depth = 0
    previous = ""
    for index, char in enumerate(text):
        if char == "(":
            depth += 1
        elif char == ")":
            depth -= 1
        elif char in "+-" and depth == 0 and index > 0 and previous not in "^*/(":
            return True
        if not char.isspace():
            previous = char
    return False


def split_sign(text: str) -> tuple[int, str]:
    """(sign, body) of a coefficient text: '-a*b' -> (-1, 'a*b'); sums keep their sign."""
    text = text.strip()
    if text.startswith("-") and not is_sum(text):
        return -1, text[1:].lstrip()
    return 1, text


_IDENTIFIER = re.compile(r"[A-Za-z][A-Za-z0-9_]*")
_INTEGER_POWER = re.compile(r"\^(\d+)|\^\((-\d+)\)")
_STAR = re.compile(r"\*")


def greek(name: str) -> str:
    """theta -> θ, theta2 -> θ2; other names unchanged."""
    stem = name.rstrip("0123456789")
    letter = GREEK_LETTERS.get(stem)
    return letter + name[len(stem):] if letter else name


def unicode_text(ascii_text: str) -> str:
    """The Unicode display form of an ASCII expression text."""
    text = _IDENTIFIER.sub(lambda m: greek(m.group()), ascii_text)
    text = _INTEGER_POWER.sub(lambda m: (m.group(1) or m.group(2)).translate(_SUPERSCRIPTS),
                              text)

    text = _stars_to_spaces(text)
    return text.replace("-", UNICODE_MINUS)


def _is_word_char(char: str) -> bool:
    return char.isalnum() or char == "_"     # what \w matches


def _stars_to_spaces(text: str) -> str:
    """Juxtaposition for '*', except where 'name (' would read as a call.  Looks only at
    the neighbours of each '*', so long coefficients print in linear time."""
    pieces, start, length = [], 0, len(text)
    for match in _STAR.finditer(text):
        before = match.start() - 1
        while before >= 0 and text[before].isspace():
            before -= 1
        word_start = before
        while word_start >= 0 and _is_word_char(text[word_start]):
            word_start -= 1
        after = match.end()
        while after < length and text[after].isspace():
            after += 1
        names_a_call = (after < length and text[after] == "(" and word_start < before
                        and not text[word_start + 1].isdigit())
        pieces.append(text[start:match.start()])
        pieces.append("*" if names_a_call else " ")
        start = match.end()
    pieces.append(text[start:])
    return "".join(pieces)


# Multivectors ----------------------------------------------------------------------
def _terms(mv, unicode: bool) -> list[tuple[int, str, int]]:
    """(sign, body, grade) of each term, in basis order."""
    texts = mv.coefficient_texts()
    several = len(texts) > 1
    terms = []
    for index, coefficient in texts:
        sign, body = split_sign(coefficient)
        parenthesize = is_sum(body)
        if unicode:
            body = unicode_text(body)
        blade = BASIS_NAMES[index]
        if index == 0:
            term = f"({body})" if several and parenthesize else body
        elif body == "1":
            term = blade
        else:
            if parenthesize:
                body = f"({body})"
            term = f"{body} {blade}" if unicode else f"{body}*{blade}"
        terms.append((sign, term, BASIS_GRADES[index]))
    return terms


def _join(terms, unicode: bool, first: bool) -> str:
    minus = UNICODE_MINUS if unicode else "-"
    parts = []
    for position, (sign, term, _) in enumerate(terms):
        if position == 0:
            parts.append(f"{minus}{term}" if sign < 0 and first else term)
        else:
            parts.append(f" {'+' if sign > 0 else minus} {term}")
    return "".join(parts)


def multivector_text(mv, unicode: bool = False, width: int = DEFAULT_WIDTH,
                     indent: int = 0) -> str:
    """The multivector as text that reads back as the same value (see module docstring).

    ``indent`` is the width of text already on the first line (``x = `` for example)."""
    terms = _terms(mv, unicode)
    if not terms:
        return "0"
    one_line = _join(terms, unicode, True)
    if len(one_line) + indent <= width:
        return one_line
    # One chunk per grade; a grade that is still too long gets one chunk per term.
    chunks: list[list] = []
    for grade in range(4):
        group = [term for term in terms if term[2] == grade]
        if not group:
            continue
        if len(_join(group, unicode, True)) + 4 > width:
            chunks.extend([term] for term in group)
        else:
            chunks.append(group)
    minus = UNICODE_MINUS if unicode else "-"
    lines = []
    for position, chunk in enumerate(chunks):
        line = _join(chunk, unicode, position == 0)
        if position + 1 < len(chunks):
            line += " +" if chunks[position + 1][0][0] > 0 else f" {minus}"
        lines.append(line if position == 0 else "  " + line)
    return "\n".join(lines)


# Scalars, matrices, quaternions -------------------------------------------------------
def scalar_text(expr, unicode: bool = False) -> str:
    """A sympy scalar expression as gacalc text (ASCII operators: * ^ /)."""
    text = _ScalarPrinter.text(expr)
    return unicode_text(text) if unicode else text


class _ScalarPrinter:
    _printer = None

    @classmethod
    def text(cls, expr) -> str:
        if cls._printer is None:
            cls._printer = _make_printer()
        return cls._printer.doprint(expr)


def _make_printer():
    import sympy
    from sympy.printing.str import StrPrinter

    class Printer(StrPrinter):
        """sympy's printer with gacalc's ^, function names, and exp(1) for e."""

        renames = {"Abs": "abs", "log": "ln"}

        def _print_Pow(self, expr, rational=False):
            base, exponent = expr.args
            if exponent == sympy.Rational(1, 2):
                return f"sqrt({self._print(base)})"
            if exponent.is_Number and exponent.is_negative:
                positive = -exponent
                denominator = self._print(sympy.Pow(base, positive, evaluate=False)) \
                    if positive != 1 else self.parenthesize(base, 60)
                if positive != 1 and not positive.is_Integer:
                    denominator = f"({denominator})"
                return f"1/{denominator}"
            if exponent.is_Integer:
                return f"{self.parenthesize(base, 60)}^{self._print(exponent)}"
            return f"{self.parenthesize(base, 60)}^({self._print(exponent)})"

        def _print_Function(self, expr):
            name = self.renames.get(expr.func.__name__, expr.func.__name__)
            return f"{name}({', '.join(self._print(arg) for arg in expr.args)})"

        def _print_Exp1(self, expr):
            return "exp(1)"

        def _print_ImaginaryUnit(self, expr):
            return "I"   # in the Pauli picture e123 plays the role of i

        def _print_Float(self, expr):
            import mpmath

            digits = max(1, int(expr._prec * 0.30103))
            return mpmath.nstr(expr._to_mpmath(expr._prec), digits, min_fixed=-30,
                               max_fixed=30, strip_zeros=True)

    return Printer()


def matrix_text(matrix, unicode: bool = False) -> str:
    """Bracketed rows with aligned columns."""
    rows = [[scalar_text(matrix[i, j], unicode) for j in range(matrix.cols)]
            for i in range(matrix.rows)]
    widths = [max(len(row[j]) for row in rows) for j in range(matrix.cols)]
    lines = []
    for row in rows:
        cells = "  ".join(cell.ljust(widths[j]) for j, cell in enumerate(row))
        lines.append(f"[ {cells} ]")
    return "\n".join(lines)


def quaternion_text(q, unicode: bool = False) -> str:
    """w + x i + y j + z k, with the coefficient layout of multivectors."""
    parts = []
    for coefficient, unit in ((q.a, ""), (q.b, "i"), (q.c, "j"), (q.d, "k")):
        if coefficient == 0:
            continue
        sign, body = split_sign(scalar_text(coefficient, unicode=False))
        parenthesize = is_sum(body)
        if unicode:
            body = unicode_text(body)
        if parenthesize:
            body = f"({body})"
        term = (unit if body == "1" else f"{body} {unit}") if unit else body
        parts.append((sign, term, 0))
    if not parts:
        return "0"
    return _join(parts, unicode, True)


def value_text(value, unicode: bool = False, width: int = DEFAULT_WIDTH,
               indent: int = 0) -> str:
    """Any gacalc value: multivector, matrix or quaternion."""
    if hasattr(value, "coefficient_texts"):
        return multivector_text(value, unicode, width, indent)
    if hasattr(value, "rows") and hasattr(value, "cols"):
        return matrix_text(value, unicode)
    if all(hasattr(value, part) for part in ("a", "b", "c", "d")):
        return quaternion_text(value, unicode)
    return scalar_text(value, unicode)


def describe_value(value) -> str:
    """A short description of a value's kind, for error messages."""
    if hasattr(value, "coefficient_texts"):
        grades = sorted(value.grades())
        if not grades:
            return "the zero multivector"
        names = {0: "scalar", 1: "vector", 2: "bivector", 3: "trivector"}
        if len(grades) == 1:
            return f"a {names[grades[0]]}"
        return "a multivector of grades " + ", ".join(str(g) for g in grades)
    if hasattr(value, "rows") and hasattr(value, "cols"):
        return f"a {value.rows}x{value.cols} matrix"
    return "a quaternion"


# A long exact value gets its numeric value beside it ------------------------------------
LONG_EXACT_CHARS = 300  # exact text longer than this is hard to read: add a number
NOTE_DIGITS = 10


def numeric_value(value, digits: int = NOTE_DIGITS):
    """The floating-point approximation of an exact value without symbols, or None (it has
    symbols, is already numeric, or cannot be evaluated)."""
    import sympy

    try:
        if hasattr(value, "coefficient_texts"):
            if value.free_symbols or any(e.has(sympy.Float) for _, e in value.items()):
                return None
            return value.evalf(digits)
        if hasattr(value, "rows") and hasattr(value, "cols"):
            if value.free_symbols or value.has(sympy.Float):
                return None
            return value.applyfunc(lambda e: sympy.N(e, digits))
        if all(hasattr(value, part) for part in ("a", "b", "c", "d")):
            parts = (value.a, value.b, value.c, value.d)
            if any(p.free_symbols or p.has(sympy.Float) for p in parts):
                return None
            return type(value)(*(sympy.N(p, digits) for p in parts))
    except (TypeError, ValueError, ArithmeticError, RecursionError):
        return None
    return None


def numeric_note(value, exact_text: str, unicode: bool = False) -> str | None:
    """One line with the numeric value of a long exact value ('  ≈ 0.8775825619 - ...'),
    None when the exact text is short enough to read (ordinary output is unchanged)."""
    if len(exact_text) <= LONG_EXACT_CHARS:
        return None
    approx = numeric_value(value)
    if approx is None:
        return None
    if hasattr(approx, "rows") and hasattr(approx, "cols"):
        rows = ("[" + ", ".join(scalar_text(e, unicode) for e in approx.row(i)) + "]"
                for i in range(approx.rows))
        text = " ".join(rows)
    else:
        text = " ".join(value_text(approx, unicode, width=10**6).split())
    mark = "≈" if unicode else "~="
    return f"  {mark} {text}   (numeric value of the exact result above)"
