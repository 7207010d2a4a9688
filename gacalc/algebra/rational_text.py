"""The display policy for rational factors in polynomial text printed by flint.

Plain string work, so that printing a rational or polynomial coefficient needs no sympy
(gacalc.algebra.spelling, which spells sympy scalars, follows the same policy).
"""

from __future__ import annotations

# The display policy for rational factors (README, Conventions): a rational factor of a
# term is written as a multiplier in front and a divisor behind, the way sympy writes
# scalars: sqrt(2)/2, pi/3, 3*pi/4, -a*b/2.  Polynomial text from flint writes 1/2*sqrt(2);
# both read back, but one value should have one spelling.

def _top_level_terms(text: str):
    """[(sign, term)] of a polynomial text split at top-level ' + ' and ' - '."""
    terms, depth, start, sign = [], 0, 0, "+"
    if text.startswith("-"):
        sign, start = "-", 1
    i = start
    while i < len(text):
        ch = text[i]
        depth += ch == "("
        depth -= ch == ")"
        if depth == 0 and text.startswith((" + ", " - "), i):
            terms.append((sign, text[start:i]))
            sign, start = text[i + 1], i + 3
            i += 3
            continue
        i += 1
    terms.append((sign, text[start:]))
    return terms


def _divisor_behind(term: str) -> str:
    head, star, rest = term.partition("*")
    if not star or "/" not in head or not head.replace("/", "").isdigit():
        return term
    depth = 0
    for ch in rest:   # a top-level '/' in the rest would make x/2/y: leave it alone
        depth += ch == "("
        depth -= ch == ")"
        if ch == "/" and depth == 0:
            return term
    p, q = head.split("/")
    return (rest if p == "1" else f"{p}*{rest}") + f"/{q}"


def rational_factors_behind(text: str) -> str:
    """'1/2*sqrt(2) - 3/4*pi' -> 'sqrt(2)/2 - 3*pi/4' (the display policy above)."""
    if "/" not in text:
        return text
    out = []
    for index, (sign, term) in enumerate(_top_level_terms(text)):
        term = _divisor_behind(term)
        if index == 0:
            out.append(("-" if sign == "-" else "") + term)
        else:
            out.append(f" {sign} {term}")
    return "".join(out)
