"""LaTeX for papers: a multivector grade by grade, or a matrix as a pmatrix.

Built on sympy's LatexPrinter (Greek names, subscripted components a_{1}, fractions);
what is ours is the blade notation, the sign handling between terms and the aligned
layout for long results.
"""

from sympy.printing.conventions import split_super_sub
from sympy.printing.latex import LatexPrinter

from gacalc.algebra.basis import BASIS_GRADES, BASIS_NAMES

# Past ALIGN_AFTER characters of LaTeX a result is set as an aligned block, one grade
# per line (one term per line for a grade longer than LINE_LIMIT).
ALIGN_AFTER = 120
LINE_LIMIT = 100


class GacalcLatexPrinter(LatexPrinter):
    """sympy's LaTeX printer with multi-letter names set as one italic word."""

    def __init__(self, settings=None):
        settings = dict(settings or {})
        settings.setdefault('mat_str', 'pmatrix')
        settings.setdefault('mat_delim', '')
        super().__init__(settings)

    _naming_symbol = False

    def _print_Symbol(self, expr, style='plain'):
        self._naming_symbol = True
        try:
            return super()._print_Symbol(expr, style=style)
        finally:
            self._naming_symbol = False

    def _split_super_sub(self, name):
        base, supers, subs = super()._split_super_sub(name)
        # Function names come through here too: only symbols get the italic word.
        if self._naming_symbol and name is not None and '{' not in name:
            raw = split_super_sub(name)[0]
            # 'speed' would read as a product of five letters; Greek names are translated.
            if base == raw and len(raw) > 1 and raw.isalpha():
                base = r'\mathit{%s}' % raw
        return base, supers, subs

    def doprint_name(self, name):
        """A value's name set like a symbol of that name (theta -> \\theta, R1 -> R_{1})."""
        self._naming_symbol = True
        try:
            base, supers, subs = self._split_super_sub(name)
        finally:
            self._naming_symbol = False
        if supers:
            base += '^{%s}' % ' '.join(supers)
        if subs:
            base += '_{%s}' % ' '.join(subs)
        return base


def blade_latex(index, wedge=False):
    """\\mathbf{e}_{12}, or \\mathbf{e}_{1} \\wedge \\mathbf{e}_{2} with wedge=True."""
    digits = BASIS_NAMES[index][1:]
    if not digits:
        return ''
    if wedge:
        return r' \wedge '.join(r'\mathbf{e}_{%s}' % digit for digit in digits)
    return r'\mathbf{e}_{%s}' % digits


def _signed_term(printer, coefficient, index, wedge):
    """(sign, text) of one term coefficient·blade with the sign pulled out front."""
    blade = blade_latex(index, wedge)
    if not blade and coefficient.is_Add:
        # a sum with no blade after it keeps its own signs: pulling one minus out front
        # would need parentheses (-(t - |t|)), and without them it changes the value
        return '+', printer.doprint(coefficient)
    negative = coefficient.could_extract_minus_sign()
    if negative:
        coefficient = -coefficient
    if not blade:
        text = printer.doprint(coefficient)
    elif coefficient == 1:
        text = blade
    elif coefficient.is_Add:
        text = r'\left(%s\right) %s' % (printer.doprint(coefficient), blade)
    else:
        text = '%s %s' % (printer.doprint(coefficient), blade)
    return ('-' if negative else '+'), text


def _join(signed_terms, first):
    """Terms joined by their signs; first says whether the line starts the value."""
    pieces = []
    for position, (sign, text) in enumerate(signed_terms):
        if position == 0 and first:
            pieces.append(('- ' if sign == '-' else '') + text)
        else:
            pieces.append(f'{sign} {text}')
    return ' '.join(pieces)


def _lines(signed_by_grade):
    """The aligned block's lines: a grade per line, split per term when too long."""
    lines = []
    for signed_terms in signed_by_grade:
        whole = _join(signed_terms, first=not lines)
        if len(whole) <= LINE_LIMIT:
            lines.append(whole)
            continue
        for term in signed_terms:
            lines.append(_join([term], first=not lines))
    return lines


def render(value, name=None, options=None):
    """LaTeX (math-mode body, no delimiters) of a read Value."""
    options = options or {}
    printer = GacalcLatexPrinter()
    lead = '' if name is None else printer.doprint_name(name)
    if value.is_matrix:
        body = printer.doprint(value.matrix)
        return body if name is None else f'{lead} = {body}'
    if not value.components:
        return '0' if name is None else f'{lead} = 0'
    wedge = bool(options.get('wedge'))
    by_grade = {}
    for index, coefficient in value.components:
        term = _signed_term(printer, coefficient, index, wedge)
        by_grade.setdefault(BASIS_GRADES[index], []).append(term)
    signed_by_grade = [by_grade[grade] for grade in sorted(by_grade)]
    flat = _join([term for terms in signed_by_grade for term in terms], first=True)
    aligned = options.get('aligned')
    if aligned is None:
        aligned = len(flat) > ALIGN_AFTER and len(value.components) > 1
    if not aligned:
        return flat if name is None else f'{lead} = {flat}'
    lines = _lines(signed_by_grade)
    if name is None:
        rows = ['&' + ('' if i == 0 else ' ') + line for i, line in enumerate(lines)]
    else:
        rows = [f'{lead} &= {lines[0]}'] + [r'&\quad ' + line for line in lines[1:]]
    return '\\begin{aligned}\n' + ' \\\\\n'.join(rows) + '\n\\end{aligned}'


def emit(value, name=None, declared=None, options=None):
    """The entry of the export-target table (gacalc.export.targets); a formula in the
    options (gacalc.formulas, proved equal to the value) is written as a paper does."""
    formula = (options or {}).get('formula')
    if formula is not None and not value.is_matrix:
        body = formula.latex()
        return body if name is None else f'{GacalcLatexPrinter().doprint_name(name)} = {body}'
    options = {k: v for k, v in (options or {}).items() if k != 'formula'}
    return render(value, name=name, options=options)
