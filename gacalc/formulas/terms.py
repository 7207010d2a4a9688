r"""A formula as data: a sum of coefficient x candidate terms over an optional scalar
denominator, written as gacalc input text, as LaTeX, and evaluated back to a multivector.

A candidate is a product of dot products of the variables times one *shape*:

    grade 0   one               1
              triple (i, j, k)  v_i . cross(v_j, v_k)
    grade 1   vec (i,)          v_i
              cross (i, j)      cross(v_i, v_j)
    grade 2   dualvec (i,)      I v_i           (for a bivector B: B itself)
              wedge (i, j)      v_i /\ v_j      (= I cross(v_i, v_j))
    grade 3   pseudo ()         I
              wedge3 (i, j, k)  v_i /\ v_j /\ v_k

The grade-2 and grade-3 shapes are I times the grade-1 and grade-0 ones, which is how
the basis module builds them.
"""

from __future__ import annotations

import re
from collections import Counter
from dataclasses import dataclass

from gacalc.lazy import sympy

from gacalc.algebra.coefficients import Coef
from gacalc.algebra.multivector import ONE, I, Multivector, cross

SHAPE_GRADES = {"one": 0, "triple": 0, "vec": 1, "cross": 1, "dualvec": 2, "wedge": 2,
                "pseudo": 3, "wedge3": 3}
# grade-2/3 shape = I times this grade-1/0 shape
DUAL_SHAPES = {"dualvec": "vec", "wedge": "cross", "pseudo": "one", "wedge3": "triple"}


@dataclass(frozen=True)
class Candidate:
    dots: tuple           # sorted (i, j) pairs, i <= j, repeated for powers
    shape: str
    indices: tuple = ()

    @property
    def grade(self) -> int:
        return SHAPE_GRADES[self.shape]

    def value(self, variables, cache=None) -> Multivector:
        """The candidate as a multivector (``cache`` keeps dot products between calls)."""
        vectors = [v.vector for v in variables]
        out = _shape_value(self.shape, self.indices, vectors)
        for i, j in self.dots:
            key = (i, j)
            dot = cache.get(key) if cache is not None else None
            if dot is None:
                dot = vectors[i].inner(vectors[j])
                if cache is not None:
                    cache[key] = dot
            out = dot * out
        return out

    def cost(self) -> tuple:
        """Preference among equal candidates: no cross products first, fewer dots."""
        epsilons = self.shape in ("triple", "cross", "wedge", "wedge3")
        return (self.grade, epsilons, len(self.dots), self.indices, self.dots)


def _shape_value(shape, indices, vectors) -> Multivector:
    base = DUAL_SHAPES.get(shape)
    if base is not None:
        return I * _shape_value(base, indices, vectors)
    if shape == "one":
        return ONE
    if shape == "vec":
        return vectors[indices[0]]
    if shape == "cross":
        return cross(vectors[indices[0]], vectors[indices[1]])
    if shape == "triple":
        i, j, k = indices
        return vectors[i].inner(cross(vectors[j], vectors[k]))
    raise ValueError(shape)


@dataclass(frozen=True)
class Term:
    coef: Coef
    candidate: Candidate


@dataclass
class Formula:
    """sum(coef * candidate) / denominator; ``variables`` give the names."""

    terms: list
    variables: list
    denominator: "Formula | None" = None

    # -- evaluation -----------------------------------------------------------------
    def value(self) -> Multivector:
        cache: dict = {}
        total = Multivector()
        for term in self.terms:
            total = total + term.candidate.value(self.variables, cache).scale(term.coef)
        if self.denominator is not None:
            total = total / self.denominator.value()
        return total

    def uses_cross(self) -> bool:
        return any(t.candidate.shape in ("cross", "triple") for t in self.terms) or (
            self.denominator is not None and self.denominator.uses_cross())

    # -- text -----------------------------------------------------------------------
    def text(self, unicode: bool = False) -> str:
        """gacalc input text of the formula (the Unicode form reads back too)."""
        ascii_text = self._ascii()
        return _unicode(ascii_text) if unicode else ascii_text

    def _ascii(self) -> str:
        pieces = [_term_text(t, self.variables) for t in self.terms]
        numerator = _join(pieces)
        if self.denominator is None:
            return numerator
        denominator = self.denominator._ascii()
        if not _is_atom(denominator):
            denominator = f"({denominator})"
        if len(pieces) == 1:
            sign, body = pieces[0]
            return f"{'-' if sign < 0 else ''}{body if _is_atom(body) else f'({body})'}/{denominator}"
        return f"({numerator})/{denominator}"

    def __str__(self):
        return self.text()

    # -- LaTeX ----------------------------------------------------------------------
    def latex(self) -> str:
        pieces = [_term_latex(t, self.variables) for t in self.terms]
        numerator = _join(pieces)
        if self.denominator is None:
            return numerator
        return rf"\frac{{{numerator}}}{{{self.denominator.latex()}}}"


@dataclass
class SquareRoot:
    """sqrt of a scalar formula (a norm): sqrt((a . a) (b . b) - (a . b)^2)."""

    radicand: Formula

    def text(self, unicode: bool = False) -> str:
        return f"sqrt({self.radicand.text(unicode)})"

    def latex(self) -> str:
        return rf"\sqrt{{{self.radicand.latex()}}}"

    def value(self) -> Multivector:
        return Multivector({0: sympy.sqrt(self.radicand.value()[0])})

    def __str__(self):
        return self.text()


# Text ------------------------------------------------------------------------------------
def _is_atom(text: str) -> bool:
    return re.fullmatch(r"[A-Za-z][A-Za-z0-9_]*|\d+|\([^()]*\)", text) is not None


def _join(pieces) -> str:
    if not pieces:
        return "0"
    out = ("-" if pieces[0][0] < 0 else "") + pieces[0][1]
    for sign, body in pieces[1:]:
        out += (" - " if sign < 0 else " + ") + body
    return out


def _split(coef: Coef) -> tuple[int, str]:
    from gacalc.printing.text import split_sign

    return split_sign(positive_first(coef.text()))


def positive_first(text: str) -> str:
    """A sum written with a positive term first when it has one: '-cos(t) + 1' ->
    '1 - cos(t)'."""
    parts, depth, start = [], 0, 0
    for index, char in enumerate(text):
        depth += char == "("
        depth -= char == ")"
        if depth == 0 and index > 0 and text[index - 1:index + 2] in (" + ", " - "):
            parts.append(text[start:index - 1])
            start = index - 1
    parts.append(text[start:])
    if len(parts) < 2 or not parts[0].startswith("-"):
        return text
    signed = [("-", parts[0][1:])] + [(p[1], p[3:]) for p in parts[1:]]
    first = next((k for k, (sign, _) in enumerate(signed) if sign == "+"), None)
    if first is None:
        return text
    order = [signed[first]] + signed[:first] + signed[first + 1:]
    out = order[0][1]
    for sign, body in order[1:]:
        out += f" {sign} {body}"
    return out


def _needs_parentheses(text: str) -> bool:
    from gacalc.printing.text import is_sum

    if is_sum(text):
        return True
    depth = 0
    for char in text:          # a division at the top level: (1/2) a, not 1/2 a
        depth += char == "("
        depth -= char == ")"
        if char == "/" and depth == 0:
            return True
    return False


def _dot_factors(candidate: Candidate, variables) -> list[str]:
    out = []
    for (i, j), power in sorted(Counter(candidate.dots).items()):
        text = f"({variables[i].text} . {variables[j].text})"
        out.append(text if power == 1 else f"{text}^{power}")
    return out


def _shape_text(candidate: Candidate, variables) -> str | None:
    names = [variables[k].text for k in candidate.indices]
    shape = candidate.shape
    if shape == "one":
        return None
    if shape == "vec":
        return names[0]
    if shape == "cross":
        return f"cross({names[0]}, {names[1]})"
    if shape == "triple":
        return f"({names[0]} . cross({names[1]}, {names[2]}))"
    if shape == "pseudo":
        return "I"
    if shape == "dualvec":
        v = variables[candidate.indices[0]]
        return v.name if v.kind == "bivector" else f"{names[0]} I"
    if shape in ("wedge", "wedge3"):
        return " /\\ ".join(names)
    raise ValueError(shape)


def _term_text(term: Term, variables) -> tuple[int, str]:
    sign, coefficient = _split(term.coef)
    factors = _dot_factors(term.candidate, variables)
    shape = _shape_text(term.candidate, variables)
    if shape is not None:
        factors.append(shape)
    if not factors:
        return sign, coefficient
    if len(factors) > 1 or coefficient != "1":
        factors = [f"({f})" if (" /\\ " in f or f.endswith(" I")) else f for f in factors]
    if coefficient != "1":
        factors.insert(0, f"({coefficient})" if _needs_parentheses(coefficient) else coefficient)
    text = factors[0]
    for factor in factors[1:]:
        # 'x (a . b)' would read as a call of x: write the product explicitly
        joiner = "*" if factor.startswith("(") and re.search(r"(?<![0-9])[A-Za-z_][A-Za-z0-9_]*$", text) else " "
        text += joiner + factor
    return sign, text


def _unicode(ascii_text: str) -> str:
    from gacalc.printing.text import unicode_text

    text = ascii_text.replace(" . ", " \u00b7 ").replace(" /\\ ", " \u2227 ")
    return unicode_text(text)


# LaTeX -----------------------------------------------------------------------------------
def _name_latex(variable) -> str:
    name = sympy.latex(sympy.Symbol(variable.name))
    if variable.kind == "bivector":
        return rf"\operatorname{{dual}}({name})"
    return rf"\mathbf{{{name}}}"


def _term_latex(term: Term, variables) -> tuple[int, str]:
    expr = term.coef.to_expr()
    sign = _split(term.coef)[0]       # the same sign as the text form
    if sign < 0:
        expr = -expr
    names = [_name_latex(v) for v in variables]
    factors = []
    for (i, j), power in sorted(Counter(term.candidate.dots).items()):
        if i == j:
            factors.append(rf"\lvert {names[i]} \rvert^{{{2 * power}}}")
        else:
            text = rf"({names[i]} \cdot {names[j]})"
            factors.append(text if power == 1 else f"{text}^{{{power}}}")
    c, ix = term.candidate, term.candidate.indices
    shape = {
        "one": None,
        "vec": names[ix[0]] if ix else None,
        "cross": (rf"({names[ix[0]]} \times {names[ix[1]]})" if len(ix) == 2 else None),
        "triple": (rf"{names[ix[0]]} \cdot ({names[ix[1]]} \times {names[ix[2]]})"
                   if len(ix) == 3 else None),
        "pseudo": "I",
        "dualvec": ((sympy.latex(sympy.Symbol(variables[ix[0]].name))
                     if variables[ix[0]].kind == "bivector" else rf"{names[ix[0]]} I") if ix else None),
        "wedge": " \\wedge ".join(names[k] for k in ix),
        "wedge3": " \\wedge ".join(names[k] for k in ix),
    }[c.shape]
    if shape is not None:
        if c.shape in ("wedge", "wedge3", "triple") and (factors or expr != 1):
            shape = f"({shape})"
        factors.append(shape)
    coefficient = sympy.latex(expr, order="old") if expr.is_Add else sympy.latex(expr)
    if expr != 1 or not factors:
        if expr.is_Add:
            coefficient = rf"\left({coefficient}\right)"
        factors.insert(0, coefficient)
    return sign, " ".join(factors)
