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
- Matrices print as matrix literals ``[a, b; c, d]`` (complex entries with the complex
  unit ``i`` of matrix literals) and quaternions as ``quaternion(w, x, y, z)``: both read
  back.  ``quaternion_text`` (``w + x i + y j + z k``) is the display ``show`` adds.

This module knows nothing of parsing; it uses the core's ``coefficient_texts()`` (ASCII
straight from the coefficient domain, fast) and only the Greek and operator spelling
tables of the language.
"""

from __future__ import annotations

import re

from gacalc.algebra.basis import BASIS_GRADES, BASIS_NAMES
from gacalc.language.tokens import greek

DEFAULT_WIDTH = 78
UNICODE_MINUS = "\u2212"
_SUPERSCRIPTS = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


# Coefficient texts ---------------------------------------------------------------
def is_sum(text: str) -> bool:
    """True when a coefficient text has a + or - (ASCII or Unicode minus) at the top level
    (not its leading sign)."""
    depth = 0
    previous = ""
    for index, char in enumerate(text):
        if char == "(":
            depth += 1
        elif char == ")":
            depth -= 1
        elif char in "+-\u2212" and depth == 0 and index > 0 and previous not in "^*/(":
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

    ``indent`` is the width of text already on the first line (``x = `` for example).
    Components that share a denominator are written over it once:
    ``((a2*b3 - a3*b2)*e23 + ...)/(a1^2*b2^2 + ...)``."""
    shared = mv.shared_denominator()
    if shared is not None:
        numerator, denominator = shared
        body = multivector_text(numerator, unicode, width, indent + 1)
        below = multivector_text(denominator, unicode, 10**6)
        # A name, a number or one call of plain arguments binds tighter than "/".
        if is_sum(below) or not re.fullmatch(r"[\w.]+(\([\w.,^ */+-]*\))?", below):
            below = f"({below})"
        return f"({body})/{below}"
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
    from gacalc.algebra.spelling import input_text   # sympy's printer: loaded when used

    text = input_text(expr)
    return unicode_text(text) if unicode else text


ONE_LINE_MATRIX_CHARS = 60   # a matrix this short prints on one line


def complex_text(expr, unicode: bool = False) -> str:
    """A matrix entry: a real scalar, or re + im i with i the complex unit of matrix
    literals (so it reads back, and never looks like the pseudoscalar I)."""
    import sympy

    if not expr.has(sympy.I):
        return scalar_text(expr, unicode)
    re, im = expr.as_real_imag()
    re_text = scalar_text(re, unicode) if re != 0 else ""
    sign, body = split_sign(scalar_text(im, unicode=False))
    if unicode:
        body = unicode_text(body)
    if body == "1":
        term = "i"
    else:
        term = f"({body})*i" if is_sum(body) else f"{body}*i"
    minus = UNICODE_MINUS if unicode else "-"
    if not re_text:
        return f"{minus}{term}" if sign < 0 else term
    return f"{re_text} {minus if sign < 0 else '+'} {term}"


def matrix_text(matrix, unicode: bool = False) -> str:
    """A matrix literal that reads back: [a, b; c, d], one row per line (columns aligned)
    unless it is short."""
    rows = [[complex_text(matrix[i, j], unicode) for j in range(matrix.cols)]
            for i in range(matrix.rows)]
    one_line = "[" + "; ".join(", ".join(row) for row in rows) + "]"
    if len(one_line) <= ONE_LINE_MATRIX_CHARS or matrix.rows == 1:
        return one_line
    widths = [max(len(row[j]) for row in rows) + 1 for j in range(matrix.cols - 1)]
    lines = []
    for index, row in enumerate(rows):
        cells = [(cell + ",").ljust(widths[j] + 1) for j, cell in enumerate(row[:-1])]
        end = "]" if index == len(rows) - 1 else ";"
        lines.append(("[" if index == 0 else " ") + "".join(cells) + row[-1] + end)
    return "\n".join(lines)


def quaternion_input_text(q, unicode: bool = False) -> str:
    """quaternion(w, x, y, z): a quaternion as input that reads back (i, j, k would be
    read as scalar names)."""
    parts = ", ".join(scalar_text(c, unicode) for c in (q.a, q.b, q.c, q.d))
    return f"quaternion({parts})"


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
    """Any gacalc value, as its kind (gacalc.values) writes it; a bare sympy scalar too."""
    from gacalc.values import kind_of

    kind = kind_of(value)
    if kind is None:
        return scalar_text(value, unicode)
    return kind.text(value, unicode, width, indent)


def describe_value(value) -> str:
    """A short description of a value's kind, for error messages."""
    from gacalc.values import describe

    return describe(value)


# A long exact value gets its numeric value beside it ------------------------------------
LONG_EXACT_CHARS = 300  # exact text longer than this is hard to read: add a number
NOTE_DIGITS = 10


def numeric_value(value, digits: int = NOTE_DIGITS):
    """The floating-point approximation of an exact value without symbols, or None (it has
    symbols, is already numeric, or cannot be evaluated)."""
    from gacalc.values import kind_of

    kind = kind_of(value)
    if kind is None:
        return None
    if not kind.is_exact_constant(value):
        return None
    try:
        return kind.numeric(value, digits)
    except (TypeError, ValueError, ArithmeticError, RecursionError):
        return None


def numeric_note(value, exact_text: str, unicode: bool = False) -> str | None:
    """One line with the numeric value of a long exact value ('  ≈ 0.8775825619 - ...'),
    None when the exact text is short enough to read (ordinary output is unchanged)."""
    if len(exact_text) <= LONG_EXACT_CHARS:
        return None
    approx = numeric_value(value)
    if approx is None:
        return None
    text = value_text(approx, unicode, width=10**6).replace("\n", " ")  # matrix rows
    mark = "≈" if unicode else "~="
    return f"  {mark} {text}   (numeric value of the exact result above)"
