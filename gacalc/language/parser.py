"""Hand-written precedence-climbing parser: tokens -> syntax tree (gacalc.language.syntax).

Grammar, loosest to tightest (DESIGN.md, "The language")::

    sum      := product (('+' | '-') product)*
    product  := wedge (('*' | '/' | <juxtaposition>) wedge)*
    wedge    := unary (OP unary)*        OP one of /\\ _| |_ . -- one operator per chain
    unary    := ('-' | '+') unary | postfix
    postfix  := primary ('~' | '^' exponent | superscript)*
    exponent := ('-' | '+')? primary ('^' exponent)?
    primary  := number | name | name '(' args ')' | '(' sum ')' | '<' sum '>' [digit]

Juxtaposition applies when the next token can begin a primary (number, name, '(' or
'<'), so ``a -b`` is a difference and ``2e1`` is 2 e1.  The grade digit of ``<A>k``
must touch the '>' (``<A> 2`` is the scalar part times 2).

Statements end at a newline or ';' (a ';' silences the result); see ``parse_statement``.
"""

from __future__ import annotations

import math
from fractions import Fraction
from functools import lru_cache
from typing import Iterator

from gacalc.export import targets as export_targets

from . import syntax as S
from . import tokens as T
from .errors import GacalcLimitError, GacalcSyntaxError, Source, Span
from .scanner import Token, scan_statements, token_error

MAX_STATEMENT_CHARS = 200_000
MAX_DEPTH = 100
MAX_NUMBER_DIGITS = 1000
MAX_BUDGET_SECONDS = 86_400      # a day; longer is 'budget none'

_WEDGE_KINDS = (T.WEDGE, T.LCONTRACT, T.RCONTRACT, T.INNER)
_PRIMARY_START = frozenset(T.NAME_KINDS | {T.NUMBER, T.LPAREN, T.LANGLE})
_STATEMENT_END = frozenset({T.NEWLINE, T.SEMICOLON, T.EOF})
_LEAF_KINDS = frozenset(T.NAME_KINDS | {T.NUMBER})
_NEGATION_KINDS = frozenset({T.MINUS})      # '-' before a number leaf: read at once too
_PAREN_KINDS = frozenset({T.LPAREN})        # a parenthesised signed number or fraction too
# after a number or name, these make it more than a leaf operand of a product
_AFTER_LEAF = frozenset({*_WEDGE_KINDS, T.REVERSE, T.CARET, T.SUPERSCRIPT, T.LBRACKET})
_LBRACKET, _RBRACKET = T.LBRACKET, T.RBRACKET   # square brackets: closed interval ends
_RELATIONS = {T.EQUALS: "=", T.LANGLE: "<", T.LESSEQ: "<=", T.RANGLE: ">", T.GREATEREQ: ">="}

_DESCRIPTIONS = {
    T.EOF: "the end of the input", T.NEWLINE: "the end of the line",
    T.SEMICOLON: "';'", T.STRING: "a string",
}


def describe(token: Token) -> str:
    if token.kind in _DESCRIPTIONS:
        return _DESCRIPTIONS[token.kind]
    if token.kind == T.NUMBER:
        return f"the number {token.text}"
    if token.kind in T.NAME_KINDS:
        return f"'{token.text}'"
    return f"'{token.text}'"


class _StatementParser:
    """Parses the tokens of one statement (terminator excluded)."""

    def __init__(self, tokens: list[Token], terminator: Token):
        self.tokens = tokens
        self.terminator = terminator
        self.count = len(tokens)
        # the terminator after the tokens: reading the current token needs no bounds test
        self.padded = tokens + [terminator]
        self.position = 0
        self.depth = 0
        self.comparing = False   # in a condition: a '<' after an operand compares

    # Token access -------------------------------------------------------------
    def peek(self, offset: int = 0) -> Token:
        index = self.position + offset
        return self.padded[index] if index <= self.count else self.terminator

    def advance(self) -> Token:
        position = self.position
        if position < self.count:
            self.position = position + 1
        return self.padded[position]

    def at_end(self) -> bool:
        return self.position >= self.count

    def check(self, kind: str, value: str | None = None) -> bool:
        token = self.padded[self.position]
        return token.kind == kind and (value is None or token.value == value)

    def previous(self) -> Token | None:
        return self.tokens[self.position - 1] if self.position > 0 else None

    def fail(self, message: str, span: Span | None = None, hint: str | None = None):
        if span is None:
            span = self.peek().span
            before = self.previous()
            if self.at_end() and before is not None:
                # Point just after the last token rather than at a line that may be empty.
                span = Span(before.span.source, before.span.end, before.span.end + 1)
        raise GacalcSyntaxError(message, span, hint)

    def expect(self, kind: str, message: str) -> Token:
        if not self.check(kind):
            self.fail(message)
        return self.advance()

    def span_from(self, start: Token) -> Span:
        last = self.previous()
        end = last.end if last is not None and last.end >= start.start else start.end
        return Span(start.source, start.start, end)

    def enter(self, token: Token):
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise GacalcLimitError(
                f"expression nested too deeply (more than {MAX_DEPTH} levels)", token.span)

    def leave(self):
        self.depth -= 1

    # Expressions --------------------------------------------------------------
    def expression(self) -> S.Node:
        return self.parse_sum()

    def parse_sum(self) -> S.Node:
        start = self.padded[self.position]
        first = self.parse_product()
        terms, signs = [first], [1]
        padded = self.padded
        while True:
            kind = padded[self.position].kind
            if kind != T.PLUS and kind != T.MINUS:
                break
            self.position += 1          # an operator, never the terminator
            terms.append(self.parse_product())
            signs.append(1 if kind == T.PLUS else -1)
        if len(terms) == 1:
            return first
        return S.Sum(self.span_from(start), terms, signs)

    def parse_product(self) -> S.Node:
        padded = self.padded
        start = padded[self.position]
        first = self.parse_wedge()
        factors, ops = [first], [""]
        while True:
            token = padded[self.position]
            kind = token.kind
            if kind == T.STAR or kind == T.SLASH:
                self.position += 1
                ops.append("*" if kind == T.STAR else "/")
            elif kind in _PRIMARY_START:
                if token.kind == T.LANGLE and self.comparing:
                    break           # 0 < a: a comparison, not a grade bracket
                if token.kind == T.NUMBER and self.previous().kind == T.NUMBER:
                    self.fail(f"two numbers in a row: write {self.previous().text}*{token.text} "
                              "for a product", token.span)
                ops.append("")
            else:
                break
            factors.append(self.parse_wedge())
        if len(factors) == 1:
            return first
        return S.Product(self.span_from(start), factors, ops)

    def parse_wedge(self) -> S.Node:
        position = self.position
        start = self.padded[position]
        kind = start.kind
        if kind in _LEAF_KINDS:
            # a number or a name with nothing after it that binds tighter than a product
            # (most operands of a script): the node parse_unary would build, made at once
            following = self.padded[position + 1].kind
            if following not in _AFTER_LEAF and (kind == T.NUMBER or following != T.LPAREN):
                self.position = position + 1
                return self._leaf(start)
        elif kind in _NEGATION_KINDS and self.depth < MAX_DEPTH:
            # -2 as parse_unary reads it: the negation of a number leaf
            number = self.padded[position + 1]
            if number.kind == T.NUMBER and self.padded[position + 2].kind not in _AFTER_LEAF:
                self.position = position + 2
                return S.Negate(Span(start.source, start.start, number.end),
                                self._leaf(number))
        elif kind in _PAREN_KINDS:
            number = self._parenthesised_number(position)
            if number is not None:
                return number
        first = self.parse_unary()
        if self.padded[self.position].kind not in _WEDGE_KINDS:
            return first
        op_token = self.peek()
        operands = [first]
        last_start = start
        while self.peek().kind in _WEDGE_KINDS:
            token = self.advance()
            operand_start = self.peek()
            operand = self.parse_unary()
            if token.kind != op_token.kind:
                self._mixed_operators(start, last_start, op_token, token, operand_start)
            operands.append(operand)
            last_start = operand_start
        return S.Wedge(self.span_from(start), op_token.kind, operands)

    def _mixed_operators(self, start, last_start, first_op, second_op, operand_start):
        source = start.span.source
        text = source.text
        whole_left = text[start.span.start:second_op.span.start].strip()
        chain_head = text[start.span.start:last_start.span.start].strip()
        last_operand = text[last_start.span.start:second_op.span.start].strip()
        new_operand = text[operand_start.span.start:self.previous().span.end].strip()
        op = second_op.text
        suggestion = (f"write ({whole_left}) {op} {new_operand} or "
                      f"{chain_head} ({last_operand} {op} {new_operand})")
        self.fail(f"'{first_op.text}' and '{op}' cannot be mixed without parentheses: "
                  f"{suggestion}", second_op.span)

    def parse_unary(self) -> S.Node:
        token = self.peek()
        if token.kind in (T.MINUS, T.PLUS):
            self.advance()
            self.enter(token)
            operand = self.parse_unary()
            self.leave()
            if token.kind == T.PLUS:
                return operand
            return S.Negate(self.span_from(token), operand)
        return self.parse_postfix()

    def parse_postfix(self) -> S.Node:
        start = self.peek()
        node = self.parse_primary()
        count = 0
        while True:
            token = self.peek()
            if token.kind in (T.REVERSE, T.CARET, T.SUPERSCRIPT, T.LBRACKET):
                count += 1      # each postfix operator nests the tree one level deeper
                if count + self.depth > MAX_DEPTH:
                    raise GacalcLimitError(f"too many postfix operators in a row (more than "
                                           f"{MAX_DEPTH})", token.span)
            if token.kind == T.REVERSE:
                self.advance()
                node = S.Reverse(self.span_from(start), node)
            elif token.kind == T.CARET:
                self.advance()
                exponent = self.parse_exponent(token)
                node = S.Power(self.span_from(start), node, exponent)
            elif token.kind == T.SUPERSCRIPT:
                self.advance()
                exponent = _integer_node(token.value, token.span)
                node = S.Power(self.span_from(start), node, exponent)
            elif token.kind == T.LBRACKET and token.start == self.previous().end:
                # X[k] only written against its operand: "A [..." is not an index
                node = self.parse_index(start, node)
            else:
                return node

    def parse_index(self, start: Token, base: S.Node) -> S.Node:
        opener = self.advance()
        self.enter(opener)
        if self.check(T.RBRACKET):
            self.fail("empty index: write X[1] for the first item")
        indices = [self._bracketed()]
        while self.check(T.COMMA):
            self.advance()
            indices.append(self._bracketed())
        self._close(opener, T.RBRACKET, "']'")
        self.leave()
        return S.Index(self.span_from(start), base, indices)

    def parse_exponent(self, caret: Token) -> S.Node:
        self.enter(caret)
        sign = None
        if self.peek().kind in (T.MINUS, T.PLUS):
            sign = self.advance()
        if self.peek().kind not in _PRIMARY_START:
            written = f"'^{sign.text}'" if sign is not None else "'^'"
            self.fail(f"expected an exponent after {written}, found {describe(self.peek())}")
        node = self._exponent_body(caret)
        if sign is not None and sign.kind == T.MINUS:
            node = S.Negate(self.span_from(sign), node)
        self.leave()
        return node

    def _exponent_body(self, caret: Token) -> S.Node:
        start = self.peek()
        base = self.parse_primary()
        if self.check(T.CARET):           # a^b^c is a^(b^c)
            token = self.advance()
            return S.Power(self.span_from(start), base, self.parse_exponent(token))
        return base

    def parse_primary(self) -> S.Node:
        token = self.peek()
        kind = token.kind
        if kind == T.NUMBER:
            self.advance()
            return self._leaf(token)
        if kind in T.NAME_KINDS:
            self.advance()
            if self.check(T.LPAREN):
                return self.parse_call(token)
            return S.Name(token.span, token.value)
        if kind == T.LPAREN:
            self.advance()
            self.enter(token)
            if self.check(T.RPAREN):
                self.fail("empty parentheses: put an expression inside ( )")
            inner = self._bracketed()
            if self.check(T.COMMA):
                items = [inner]
                while self.check(T.COMMA):
                    self.advance()
                    if self.check(T.RPAREN):
                        break                 # a trailing comma: (a, b,)
                    if self.check(T.COMMA):
                        self.fail("missing item before ','")
                    items.append(self._bracketed())
                self._close(token, T.RPAREN, "')'")
                self.leave()
                return S.ListLiteral(self.span_from(token), items)
            self._close(token, T.RPAREN, "')'")
            self.leave()
            return inner
        if kind == T.LANGLE:
            return self.parse_grade(token)
        if kind == T.LBRACKET:
            return self.parse_matrix(token)
        self._operand_expected(token)

    def _parenthesised_number(self, position: int) -> S.Node | None:
        """(-7/4), (3), (-2) as a whole operand, read at once (generated scripts write
        their coefficients so): the tree the full descent builds, or None to take it."""
        padded = self.padded
        q = position + 1
        minus = None
        if padded[q].kind in _NEGATION_KINDS:
            minus = padded[q]
            q += 1
        numerator = padded[q]
        if numerator.kind != T.NUMBER or self.depth + (2 if minus else 1) > MAX_DEPTH:
            return None
        q += 1
        denominator = None
        if padded[q].kind == T.SLASH and padded[q + 1].kind == T.NUMBER:
            denominator = padded[q + 1]
            q += 2
        if padded[q].kind != T.RPAREN or padded[q + 1].kind in _AFTER_LEAF:
            return None                  # more inside, or a postfix operator after it
        node = self._leaf(numerator)
        first = minus or numerator
        source = first.source
        if minus is not None:
            node = S.Negate(Span(source, minus.start, numerator.end), node)
        if denominator is not None:
            node = S.Product(Span(source, first.start, denominator.end),
                             [node, self._leaf(denominator)], ["", "/"])
        self.position = q + 1
        return node

    @staticmethod
    def _leaf(token: Token) -> S.Node:
        """The node of a number or name token (a name not followed by '(')."""
        if token.kind == T.NUMBER:
            if len(token.text) > MAX_NUMBER_DIGITS:
                raise GacalcLimitError(f"number too long ({len(token.text)} digits; the limit "
                                       f"is {MAX_NUMBER_DIGITS})", token.span)
            return S.Number(token.span, _fraction(token.text), token.text)
        return S.Name(token.span, token.value)

    def _bracketed(self) -> S.Node:
        """An expression inside brackets, where '<' opens a grade bracket again."""
        saved, self.comparing = self.comparing, False
        try:
            return self.expression()
        finally:
            self.comparing = saved

    def _operand_expected(self, token: Token):
        before = self.previous()
        if token.kind in (T.ERROR, T.UNTERMINATED_STRING):
            raise token_error(token)
        if token.kind == T.SUPERSCRIPT:
            self.fail("a superscript exponent needs something before it to raise")
        if token.kind == T.STRING:
            self.fail(f"{token.text} is a word in quotes: words are file names (use, save, "
                      "emit ... to) and arguments naming a convention, as in "
                      "euler_angles(R, \"zyx\")")
        if token.kind == T.KEYWORD:
            self.fail(f"'{token.text}' is a reserved word and cannot be used in an expression")
        if token.kind == T.DECLARATION:
            self.fail(f"'{token.text}' declares names and must start a statement: "
                      f"{token.text} NAME")
        if before is None:
            self.fail(f"expected an expression, found {describe(token)}")
        self.fail(f"expected an operand after '{before.text}', found {describe(token)}")

    def _close(self, opener: Token, kind: str, written: str):
        if self.check(kind):
            self.advance()
            return
        token = self.peek()
        if token.kind in _STATEMENT_END:
            self.fail(f"'{opener.text}' is never closed: add {written}", opener.span)
        if token.kind in (T.ERROR, T.UNTERMINATED_STRING):
            raise token_error(token)
        self.fail(f"expected {written} to close the '{opener.text}' at "
                  f"{opener.span.line}:{opener.span.column}, found {describe(token)}")

    def parse_grade(self, opener: Token) -> S.Node:
        self.advance()
        self.enter(opener)
        if self.check(T.RANGLE):
            self.fail("empty grade brackets: write <A> or <A>k")
        inner = self._bracketed()
        close = self.peek()
        self._close(opener, T.RANGLE, "'>'")
        self.leave()
        grade = None
        after = self.peek()
        if after.kind == T.NUMBER and after.span.start == close.span.end:
            self.advance()
            if not after.text.isdigit() or int(after.text) > 3:
                self.fail(f"<A>{after.text}: a grade in Cl(3,0) is 0, 1, 2 or 3", after.span)
            grade = int(after.text)
        return S.GradePart(self.span_from(opener), inner, grade)

    def parse_matrix(self, opener: Token) -> S.Node:
        """[a, b; c, d]: entries separated by ',', rows by ';' (all rows equally long)."""
        self.advance()
        self.enter(opener)
        if self.check(T.RBRACKET):
            self.fail("empty matrix: write its entries, [a, b; c, d]")
        rows, row = [], []
        while True:
            if self.peek().kind in (T.COMMA, T.ROWSEP, T.RBRACKET):
                self.fail("missing matrix entry")
            row.append(self._bracketed())
            token = self.peek()
            if token.kind == T.COMMA:
                self.advance()
                continue
            if token.kind == T.ROWSEP:
                self.advance()
                rows.append(row)
                row = []
                continue
            rows.append(row)
            break
        self._close(opener, T.RBRACKET, "']'")
        self.leave()
        widths = {len(r) for r in rows}
        if len(widths) > 1:
            self.fail(f"the rows of a matrix must be equally long (found rows of "
                      f"{', '.join(str(len(r)) for r in rows)} entries)", opener.span)
        return S.MatrixLiteral(self.span_from(opener), rows)

    def parse_call(self, name: Token) -> S.Node:
        opener = self.advance()
        self.enter(opener)
        args = []
        if not self.check(T.RPAREN):
            while True:
                if self.check(T.COMMA):
                    self.fail("missing argument before ','")
                if self.check(T.STRING):
                    # a word in quotes ("zyx") naming a convention: only the built-ins
                    # that take one accept it (the evaluator says so)
                    word = self.advance()
                    args.append(S.Text(word.span, word.value))
                else:
                    args.append(self._bracketed())
                if self.check(T.COMMA):
                    self.advance()
                    if self.check(T.RPAREN):
                        self.fail("missing argument after ','")
                    continue
                break
        self._close(opener, T.RPAREN, "')'")
        self.leave()
        spaced = opener.span.start > name.span.end
        return S.Call(self.span_from(name), name.value, name.span, args, spaced)

    # Statements ---------------------------------------------------------------
    def parse_statement(self) -> S.Statement:
        first = self.peek()
        if first.kind == T.KEYWORD:
            handler = getattr(self, f"_statement_{first.value}", None)
            if handler is None:
                self.fail(f"'{first.text}' cannot start a statement")
            statement = handler()
        elif first.kind == T.DECLARATION:
            statement = self._declaration()
        elif first.is_name and self.peek(1).kind == T.EQUALS:
            statement = self._assignment()
        elif first.is_name and self.peek(1).kind == T.LPAREN and self._is_definition():
            statement = self._definition()
        else:
            expr = self.expression()
            statement = S.ExpressionStatement(self.span_from(first), expr)
        if not self.at_end():
            self._trailing(self.peek())
        statement.span = self.span_from(first)
        statement.silent = self.terminator.kind == T.SEMICOLON
        return statement

    def _trailing(self, token: Token):
        kind = token.kind
        if kind in (T.ERROR, T.UNTERMINATED_STRING):
            raise token_error(token)
        if kind == T.RPAREN:
            self.fail("unmatched ')'")
        if kind == T.RANGLE:
            self.fail("unmatched '>'")
        if kind == T.RBRACKET:
            self.fail("unmatched ']'")
        if kind == T.EQUALS:
            self.fail("only a name or a function head f(x, ...) can be assigned",
                      hint="to compare two values write check L == R")
        if kind == T.EQEQ:
            self.fail("'==' belongs in a check statement: check L == R")
        if kind == T.COMMA:
            self.fail("unexpected ','")
        if kind in (T.KEYWORD, T.DECLARATION):
            self.fail(f"unexpected '{token.text}' here")
        if kind == T.STRING:
            self.fail("unexpected string: strings are paths for use, save and emit ... to, "
                      "and words such as \"zyx\" in a call of euler_angles")
        self.fail(f"unexpected {describe(token)}")

    def _new_name(self, token: Token, what: str) -> str:
        """Check that a token can be bound as a user name."""
        if token.kind == T.BUILTIN:
            self.fail(f"'{token.text}' is a built-in function; choose another name for the "
                      f"{what}", token.span)
        if token.kind == T.BLADE:
            self.fail(f"'{token.text}' is a basis blade; choose another name for the {what}",
                      token.span)
        if token.kind == T.CONSTANT:
            self.fail(f"'{token.text}' is a constant; choose another name for the {what}",
                      token.span)
        if token.kind in (T.KEYWORD, T.DECLARATION):
            self.fail(f"'{token.text}' is a reserved word; choose another name for the {what}",
                      token.span)
        if token.kind not in T.NAME_KINDS:
            self.fail(f"expected a name for the {what}, found {describe(token)}", token.span)
        if token.value == "ans":
            self.fail("'ans' is set by gacalc to the last result; choose another name",
                      token.span)
        return token.value

    def _assignment(self) -> S.Statement:
        name = self.advance()
        value = self._new_name(name, "value")
        self.advance()  # '='
        if self.at_end():
            self.fail(f"expected a value after '{name.text} ='")
        expr = self.expression()
        return S.Assign(self.span_from(name), value, name.span, expr)

    def _is_definition(self) -> bool:
        depth = 0
        for index in range(self.position + 1, len(self.tokens)):
            kind = self.tokens[index].kind
            if kind == T.LPAREN:
                depth += 1
            elif kind == T.RPAREN:
                depth -= 1
                if depth == 0:
                    following = self.tokens[index + 1] if index + 1 < len(self.tokens) else None
                    return following is not None and following.kind == T.EQUALS
        return False

    def _definition(self) -> S.Statement:
        name = self.advance()
        function = self._new_name(name, "function")
        self.advance()  # '('
        params: list[S.Param] = []
        seen = set()
        while not self.check(T.RPAREN):
            token = self.advance()
            if token.kind == T.RPAREN or token.kind in _STATEMENT_END:
                break
            if not token.is_name or self.peek().kind not in (T.COMMA, T.RPAREN):
                self.fail(f"the parameters of {function}(...) must be plain names",
                          token.span)
            param = self._new_name(token, "parameter")
            if param in seen:
                self.fail(f"parameter '{param}' appears twice", token.span)
            seen.add(param)
            params.append(S.Param(param, token.span))
            if self.check(T.COMMA):
                self.advance()
                if self.check(T.RPAREN):
                    self.fail("missing parameter after ','")
        self.advance()  # ')'
        self.advance()  # '='
        if self.at_end():
            self.fail(f"expected the body of {function}(...) after '='")
        body = self.expression()
        return S.FunctionDef(self.span_from(name), function, name.span, params, body)

    def _declaration(self) -> S.Statement:
        keyword = self.advance()
        names: list[S.Param] = []
        unit = False
        intervals: dict = {}
        ranged = 0
        while True:
            token = self.peek()
            if token.kind in _STATEMENT_END:
                self.fail(f"expected a name after '{self.previous().text}'")
            self.advance()
            names.append(S.Param(self._new_name(token, keyword.value), token.span,
                                 self._dependence(keyword.value)))
            if self.check(T.COMMA):
                self.advance()
                continue
            if self.check(T.NAME, "unit"):
                self.advance()
                unit = True
            if self.check(T.NAME, "in"):
                if keyword.value != "scalar":
                    self.fail(f"a range 'in (low, high)' belongs to scalars, not to a "
                              f"{keyword.value}")
                self.advance()
                interval = self._interval()
                for param in names[ranged:]:   # the names since the last range share it
                    intervals[param.name] = interval
                ranged = len(names)
                if self.check(T.COMMA):
                    self.advance()
                    continue
            if not self.at_end():
                following = self.peek()
                if following.is_name:
                    self.fail(f"separate the names with commas: {keyword.value} "
                              f"{token.text}, {following.text}", following.span)
                self._trailing(following)
            break
        if len({param.name for param in names}) != len(names):
            self.fail("a name is declared twice in the same statement", keyword.span)
        return S.Declare(keyword.span, keyword.value, names, unit, intervals=intervals)

    def _dependence(self, kind: str) -> tuple:
        """The scalars a declared name depends on: the (t) of 'vector r(t)'."""
        if not self.check(T.LPAREN):
            return ()
        self.advance()
        params = []
        while True:
            token = self.peek()
            if not token.is_name or self.peek(1).kind not in (T.COMMA, T.RPAREN):
                self.fail(f"a {kind} depends on plain scalar names, as in {kind} r(t)",
                          token.span)
            self.advance()
            param = self._new_name(token, "variable")
            if param in params:
                self.fail(f"'{param}' appears twice", token.span)
            params.append(param)
            if self.check(T.COMMA):
                self.advance()
                continue
            self.advance()  # ')'
            return tuple(params)

    def _conditions(self, keyword: str) -> list[S.Condition]:
        """C, C, ...: each an equation L = R or a range chain such as 0 < a < pi."""
        conditions = []
        while True:
            start = self.peek()
            if start.kind in _STATEMENT_END:
                self.fail(f"expected a condition L = R after '{self.previous().text}' "
                          "(or a range such as t > 0)")
            conditions.extend(self._condition_chain(keyword))
            if self.check(T.COMMA):
                self.advance()
                continue
            return conditions

    def _comparand(self) -> S.Node:
        saved, self.comparing = self.comparing, True
        try:
            return self.expression()
        finally:
            self.comparing = saved

    def _condition_chain(self, keyword: str) -> list[S.Condition]:
        start = self.peek()
        left = self._comparand()
        if self.check(T.EQEQ):
            self.fail("a condition is written with a single '=': L = R")
        links = []
        while self.peek().kind in _RELATIONS:
            op = self.advance()
            if self.at_end() or self.check(T.COMMA):
                self.fail(f"expected the right-hand side of the condition after '{op.text}'")
            links.append((op, self._comparand()))
        if not links:
            if self.at_end():
                self.fail(f"a condition after '{keyword}' is written L = R (or as a range "
                          "such as t > 0 or 0 < t < pi)")
            self._trailing(self.peek())
        relations = [_RELATIONS[op.kind] for op, _ in links]
        if "=" in relations and len(relations) > 1:
            self.fail("an equation L = R cannot be chained with other relations",
                      links[1][0].span)
        if len(relations) > 1 and len({r[0] for r in relations}) > 1:
            self.fail("a range chain runs one way: write 0 < a < pi or pi > a > 0",
                      links[1][0].span)
        span = self.span_from(start)
        out, lower = [], left
        for (op, upper), relation in zip(links, relations):
            out.append(S.Condition(span, lower, upper, relation=relation))
            lower = upper
        return out

    def _interval(self) -> S.Interval:
        """(low, high), [low, high], (low, high], [low, high) after 'in'."""
        opener = self.peek()
        if opener.kind not in (T.LPAREN, _LBRACKET):
            self.fail("a range after 'in' is an interval: (low, high), [low, high], "
                      "(low, high] or [low, high)")
        self.advance()
        low = self._bracketed()
        self.expect(T.COMMA, "an interval has two ends: (low, high)")
        high = self._bracketed()
        closer = self.peek()
        if closer.kind not in (T.RPAREN, _RBRACKET):
            self.fail(f"expected ')' or ']' to close the interval opened at "
                      f"{opener.span.line}:{opener.span.column}, found {describe(closer)}")
        self.advance()
        return S.Interval(self.span_from(opener), low, high, opener.kind == T.LPAREN,
                          closer.kind == T.RPAREN)

    def _statement_check(self) -> S.Statement:
        keyword = self.advance()
        if self.at_end():
            self.fail("check needs an equation: check L == R")
        left = self.expression()
        if self.check(T.EQUALS):
            self.fail("check compares with '==': check L == R")
        if not self.check(T.EQEQ):
            if self.at_end():
                self.fail("check needs an equation: check L == R")
            self._trailing(self.peek())
        self.advance()
        if self.at_end():
            self.fail("expected the right-hand side after '=='")
        right = self.expression()
        rotation = False
        if self.check(T.KEYWORD, "as"):
            self.advance()
            if not self.check(T.NAME, "rotation"):
                self.fail("a check compares 'as rotation': check L == R as rotation")
            self.advance()
            rotation = True
        given = []
        if self.check(T.KEYWORD, "given"):
            self.advance()
            given = self._conditions("given")
        return S.Check(keyword.span, left, right, given, rotation=rotation)

    def _statement_given(self):
        self.fail("'given' belongs after a check: check L == R given C = D")

    def _statement_assume(self) -> S.Statement:
        keyword = self.advance()
        if self.at_end():
            return S.Assume(keyword.span, [], False)
        if self.check(T.NAME, "none") and self.peek(1).kind in _STATEMENT_END:
            self.advance()
            return S.Assume(keyword.span, [], True)
        return S.Assume(keyword.span, self._conditions("assume"), False)

    def _starts_operand(self, offset: int) -> bool:
        return self.peek(offset).kind in _PRIMARY_START | {T.MINUS}

    def _statement_show(self) -> S.Statement:
        keyword = self.advance()
        latex = False
        if self.check(T.NAME, "latex") and self._starts_operand(1):
            self.advance()
            latex = True
        if self.at_end():
            self.fail("show needs a value: show EXPR")
        expr = self.expression()
        against = None
        if self.check(T.KEYWORD, "against"):
            self.advance()
            if self.at_end():
                self.fail("expected a value after 'against'")
            against = self.expression()
        return S.Show(keyword.span, expr, against, latex)

    def _statement_emit(self) -> S.Statement:
        keyword = self.advance()
        target = self.peek()
        if not (target.is_name and target.value in export_targets.TARGETS):
            forms = [f"emit {t.name} EXPR" for t in export_targets.described()]
            self.fail("emit needs a target: " + ", ".join(forms[:-1]) + " or " + forms[-1])
        self.advance()
        components = False
        if self.check(T.NAME, "components") and self._starts_operand(1):
            self.advance()
            components = True
        if self.at_end():
            self.fail(f"emit {target.value} needs a value")
        expr = self.expression()
        as_name = path = path_span = None
        if self.check(T.KEYWORD, "as"):
            self.advance()
            token = self.peek()
            if token.kind != T.NAME:
                self.fail("expected a plain name after 'as'")
            self.advance()
            as_name = token.value
        if self.check(T.KEYWORD, "to"):
            self.advance()
            token = self.expect(T.STRING, 'expected a file name in quotes after \'to\': to "out.py"')
            path, path_span = token.value, token.span
        return S.Emit(keyword.span, target.value, expr, as_name, path, path_span, components)

    def _statement_formula(self) -> S.Statement:
        keyword = self.advance()
        if self.at_end():
            self.fail("formula needs a value: formula EXPR (or formula auto, formula off)")
        if (self.check(T.NAME, "auto") or self.check(T.NAME, "off")) \
                and self.peek(1).kind in _STATEMENT_END:
            return S.FormulaStatement(keyword.span, None, self.advance().value)
        return S.FormulaStatement(keyword.span, self.expression())

    def _path(self, statement: str) -> Token:
        token = self.peek()
        if token.kind == T.UNTERMINATED_STRING:
            raise token_error(token)
        if token.kind != T.STRING:
            self.fail(f'{statement} needs a file name in double quotes: {statement} "file.gac"')
        self.advance()
        if not token.value.strip():
            self.fail("the file name is empty", token.span)
        return token

    def _statement_use(self) -> S.Statement:
        keyword = self.advance()
        token = self._path("use")
        return S.Use(keyword.span, token.value, token.span)

    def _statement_save(self) -> S.Statement:
        keyword = self.advance()
        token = self._path("save")
        force = False
        if self.check(T.NAME, "force"):
            self.advance()
            force = True
        return S.Save(keyword.span, token.value, token.span, force)

    def _statement_budget(self) -> S.Statement:
        keyword = self.advance()
        if self.at_end():
            return S.BudgetSetting(keyword.span, None)
        token = self.peek()
        if token.is_name and token.value == "none" and self.peek(1).kind in _STATEMENT_END:
            self.advance()
            return S.BudgetSetting(keyword.span, math.inf)
        usage = "budget takes a number of seconds: budget 5 (budget none: no limit)"
        if token.kind != T.NUMBER:
            self.fail(usage)
        if self.peek(1).kind not in _STATEMENT_END:
            self.fail(usage, self.peek(1).span)
        self.advance()
        seconds = _fraction(token.text) if len(token.text) <= MAX_NUMBER_DIGITS else None
        if seconds is None or not 0 < seconds <= MAX_BUDGET_SECONDS:
            self.fail(f"a budget is more than 0 and at most {MAX_BUDGET_SECONDS} seconds "
                      "(budget none: no limit)", token.span)
        return S.BudgetSetting(keyword.span, float(seconds))

    def _statement_help(self) -> S.Statement:
        keyword = self.advance()
        topic = None
        if not self.at_end():
            topic = self.advance().value
        return S.Help(keyword.span, topic)

    def _statement_draw(self) -> S.Statement:
        keyword = self.advance()
        if self.at_end() or self.check(T.KEYWORD, "to"):
            self.fail("draw needs values: draw X, Y, ... [to \"picture.svg\"]")
        exprs = [self.expression()]
        while self.check(T.COMMA):
            self.advance()
            if self.at_end() or self.check(T.KEYWORD, "to"):
                self.fail("missing value after ','")
            exprs.append(self.expression())
        path = path_span = None
        if self.check(T.KEYWORD, "to"):
            self.advance()
            token = self.peek()
            if token.kind == T.UNTERMINATED_STRING:
                raise token_error(token)
            token = self.expect(T.STRING, 'expected a file name in quotes after \'to\': '
                                'to "picture.svg"')
            if not token.value.strip():
                self.fail("the file name is empty", token.span)
            path, path_span = token.value, token.span
        return S.Draw(keyword.span, exprs, path, path_span)

    def _unexpected_keyword(self):
        token = self.peek()
        self.fail(f"'{token.text}' cannot start a statement")

    _statement_against = _statement_as = _statement_to = _unexpected_keyword


@lru_cache(maxsize=4096)
def _fraction(text: str) -> Fraction:
    """The exact value of a number's text (scripts repeat the same few numbers)."""
    if text.isdigit():
        return Fraction(int(text))
    return Fraction(text)


def _integer_node(text: str, span: Span) -> S.Node:
    if text.startswith("-"):
        return S.Negate(span, S.Number(span, _fraction(text[1:]), text[1:]))
    return S.Number(span, _fraction(text), text)


def _check_tokens(tokens: list[Token], terminator: Token, flawed: bool = True):
    if flawed:           # the scanner says whether any token is a bad character
        for token in tokens:
            if token.kind in (T.ERROR, T.UNTERMINATED_STRING):
                raise token_error(token)
    if tokens:
        length = tokens[-1].end - tokens[0].start
        if length > MAX_STATEMENT_CHARS:
            raise GacalcLimitError(
                f"statement too long ({length} characters; the limit is "
                f"{MAX_STATEMENT_CHARS})", Span(tokens[0].span.source, tokens[0].span.start,
                                               tokens[0].span.end))


def parse_statement_tokens(tokens: list[Token], terminator: Token,
                           flawed: bool = True) -> S.Statement:
    _check_tokens(tokens, terminator, flawed)
    return _StatementParser(tokens, terminator).parse_statement()


def iter_statements(source: Source) -> Iterator[S.Statement]:
    """Statements one at a time, so earlier ones can run before a later mistake."""
    for tokens, terminator, flawed in scan_statements(source):
        if tokens:
            yield parse_statement_tokens(tokens, terminator, flawed)


def parse(text: str, filename: str | None = None) -> list[S.Statement]:
    """All statements of a program (raises GacalcError at the first mistake)."""
    return list(iter_statements(Source(text, filename)))


def read_expression(text: str, filename: str | None = None) -> S.Node:
    """A single expression (for tests and tools)."""
    statements = parse(text, filename)
    if len(statements) != 1 or not isinstance(statements[0], S.ExpressionStatement):
        source = Source(text, filename)
        raise GacalcSyntaxError("expected a single expression", Span(source, 0, len(text)))
    return statements[0].expr


def reading(text: str, unicode: bool = False) -> list[str]:
    """How each expression in the text is read, fully parenthesised (for REPL echoes);
    statements without an expression give their text unchanged."""
    out = []
    for statement in parse(text):
        expr = getattr(statement, "expr", None)
        if isinstance(statement, (S.ExpressionStatement, S.Assign)) and expr is not None:
            shown = S.unparse(expr, unicode=unicode, parenthesize=True)
            out.append(f"{statement.name} = {shown}" if isinstance(statement, S.Assign)
                       else shown)
        else:
            out.append(" ".join(statement.span.text.split()))
    return out
