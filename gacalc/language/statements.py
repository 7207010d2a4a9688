"""The statement executors of a Session: one ``_do_NAME`` method per statement node of
gacalc.language.syntax (``use`` and ``save`` are in gacalc.language.files).

Each executor gets the statement, the scratch State it may change (committed by the
session when the statement succeeds), the list to append results to and the run
context (gacalc.language.files.RunContext).
"""

from __future__ import annotations

from gacalc.values import describe, kind_of

from . import limits
from . import syntax as S
from . import tokens as T
from .builtins import BUILTINS
from .errors import GacalcError, GacalcMathError, GacalcNameError, GacalcTypeError
from .evaluator import (Condition, Evaluator, State, UserFunction, is_multivector,
                        relevant_conditions, symbol)
from .help import help_text, wrapped
from .watchdog import restart as restart_clock
from .results import (CheckResult, DeclarationResult, EmitResult, HelpResult, NoteResult,
                      ShowResult, ValueResult)

MIN_SIMPLIFY_BUDGET = 0.05        # below this a simplification is not worth starting


class StatementExecutors:
    """Mixed into Session; uses its options (unicode, width, budget, emit_dir) and clock."""

    def _result(self, cls, statement, **fields):
        return cls(span=statement.span, silent=statement.silent, unicode=self.unicode,
                   width=self.width, **fields)

    def _note(self, statement, message):
        return NoteResult(message=message, span=statement.span, unicode=self.unicode,
                          width=self.width)

    def _flush_notes(self, evaluator: Evaluator, results: list, statement):
        for text, span in evaluator.notes:
            results.append(NoteResult(message=text, span=span or statement.span,
                                      unicode=self.unicode, width=self.width))
        evaluator.notes.clear()

    def _log(self, state: State, statement: S.Statement):
        text = statement.span.text.strip()
        state.log.append(text if text.endswith(";") else text + ";")

    def _evaluate(self, node, state: State, results: list, statement, extra=None):
        evaluator = Evaluator(state, extra, self._clock)
        try:
            value = evaluator.evaluate(node)
        finally:
            self._flush_notes(evaluator, results, statement)
        return value

    def _simplified(self, value, state: State, extra: list | None = None):
        """(value, complete, conditions used) through gacalc.simplify."""
        kind = kind_of(value)
        conditions = relevant_conditions(state.conditions() + list(extra or ()), value)
        value, complete = kind.simplify(value, [c.expr for c in conditions],
                                        self._simplify_budget())
        return value, complete, conditions

    def _simplify_budget(self):
        """The simplifier's budget: its own, but never past the statement's deadline
        (simplify arms its own SIGALRM alarm; the statement's deadline uses another
        signal, see gacalc.language.watchdog)."""
        return self._clock.within(float(self.budget), MIN_SIMPLIFY_BUDGET)

    def _do_ExpressionStatement(self, statement, state, results, context):
        self._value_statement(statement, state, results, None)

    def _do_Assign(self, statement, state, results, context):
        self._value_statement(statement, state, results, statement.name)

    def _value_statement(self, statement, state, results, name: str | None):
        """An expression (name None) or an assignment: the simplified value becomes ans
        (and the name's value)."""
        value = self._evaluate(statement.expr, state, results, statement)
        value, complete, _ = self._simplified(value, state)
        if name is not None:
            rebound = _rebinding_note(state, name)
            if rebound:
                results.append(self._note(statement, rebound))
            state.functions.pop(name, None)
            state.declarations.pop(name, None)
            state.unit_names.discard(name)
            state.dependence.pop(name, None)
            state.values[name] = value
        state.ans = value
        self._log(state, statement)
        if not complete:
            results.append(self._note(statement, "simplification ran out of time: the value "
                                      "is correct but not fully simplified"))
        formula = None
        if self.formulas:          # the 'formula auto' setting (gacalc.language.formula_support)
            from .formula_support import formula_outcome

            formula = formula_outcome(value, state, self._clock).formula
        results.append(self._result(ValueResult, statement, value=value, name=name,
                                    complete=complete, formula=formula))

    def _do_FunctionDef(self, statement, state, results, context):
        name = statement.name
        params = [param.name for param in statement.params]
        for call in S.walk(statement.body):
            if isinstance(call, S.Call) and call.name == name and call.name not in params:
                raise GacalcTypeError(f"{name} calls itself: without conditionals the "
                                      "recursion would never end", call.name_span)
        state.values.pop(name, None)
        state.declarations.pop(name, None)
        state.dependence.pop(name, None)
        state.unit_names.discard(name)
        state.functions[name] = UserFunction(name, params, statement.body,
                                             " ".join(statement.span.text.split()))
        self._log(state, statement)
        if not statement.silent:
            results.append(self._note(statement, f"defined {name}({', '.join(params)})"))

    def _do_Declare(self, statement, state, results, context):
        from gacalc.algebra import symbolic

        kind = statement.kind
        if statement.unit and kind not in ("vector", "bivector", "rotor"):
            raise GacalcTypeError(f"'unit' applies to vectors, bivectors and rotors, not to a "
                                  f"{kind}", statement.span)
        from gacalc.algebra.symbolic import component_names

        created, all_conditions = {}, []
        for param in statement.names:
            name = param.name
            depends = tuple(symbol(variable) for variable in param.depends)
            value, exprs = symbolic(kind, name, unit=statement.unit, depends=depends)
            components = sorted(component_names(kind, name)) if kind != "scalar" else []
            for component in components:
                clash = _reserved_kind(component)
                if clash:
                    raise GacalcNameError(f"{kind} {name} would have a component {component}, "
                                          f"which is {clash}; choose another name", param.span)
            text = _unit_text(kind, name) if exprs else None
            texts = [text] + [f"{name} stays unit as {v} varies" for v in param.depends]
            conditions = [Condition(expr, texts[min(i, len(texts) - 1)], "declaration")
                          for i, expr in enumerate(exprs)]
            if name in statement.intervals:
                conditions.extend(self._interval_conditions(statement.intervals[name], name,
                                                            value, state, results, statement))
            state.values[name] = value
            state.functions.pop(name, None)
            state.declarations[name] = kind
            if statement.unit or exprs:
                state.unit_names.add(name)
            else:
                state.unit_names.discard(name)
            state.facts[name] = conditions
            state.known_symbols.update((components or [name]) + list(param.depends))
            for dependent in [name] + components:
                if param.depends:
                    state.dependence[dependent] = param.depends
                else:
                    state.dependence.pop(dependent, None)
            created[name] = value
            all_conditions.extend(conditions)
        self._log(state, statement)
        results.append(self._result(DeclarationResult, statement, declared_kind=kind,
                                    values=created, conditions=all_conditions))

    def _interval_conditions(self, interval, name, value, state, results, statement) -> list:
        """scalar a in (low, high]: the two ranges low < a, a <= high."""
        evaluator = Evaluator(state, None, self._clock)
        try:
            low = evaluator.evaluate(interval.low)
            high = evaluator.evaluate(interval.high)
        finally:
            self._flush_notes(evaluator, results, statement)
        for end, node in ((low, interval.low), (high, interval.high)):
            if not is_multivector(end) or any(g != 0 for g, _ in end.items()) \
                    or end[0].free_symbols:
                raise GacalcTypeError("the ends of a range are numbers (pi/2, 3, ...)",
                                      node.span)
        from gacalc.algebra.signs import certified_sign

        width = certified_sign(high[0] - low[0])
        if width != 1:
            raise GacalcMathError(f"the range {' '.join(interval.span.text.split())} is "
                                  "empty: its low end must be below its high end",
                                  interval.span)
        text = f"{name} in {' '.join(interval.span.text.split())}"
        import sympy

        out = []
        lower = sympy.StrictGreaterThan if interval.low_open else sympy.GreaterThan
        upper = sympy.StrictGreaterThan if interval.high_open else sympy.GreaterThan
        out.append(Condition(lower(value[0] - low[0], 0), text, "declaration"))
        out.append(Condition(upper(high[0] - value[0], 0), text, "declaration"))
        return out

    def _conditions(self, nodes, state, results, statement, origin) -> list[Condition]:
        out = []
        for node in nodes:
            evaluator = Evaluator(state, None, self._clock)
            try:
                left = evaluator.evaluate(node.left)
                right = evaluator.evaluate(node.right)
                if not (is_multivector(left) and is_multivector(right)):
                    raise GacalcTypeError("a condition is an equation between multivectors "
                                          "(usually scalars)", node.span)
                difference = left - right
            finally:
                self._flush_notes(evaluator, results, statement)
            text = " ".join(node.span.text.split())
            if node.relation != "=":
                out.extend(_range_conditions(difference, node.relation, text, origin,
                                             node.span, results, self._note(statement, "")))
                continue
            exprs = [expr for _, expr in difference.items()]
            if not exprs:
                results.append(self._note(statement, f"the condition {text} always holds"))
                continue
            for expr in exprs:
                if expr.is_number:
                    raise GacalcMathError(f"the condition {text} can never hold", node.span)
                out.append(Condition(expr, text, origin))
        return out

    def _do_Check(self, statement, state, results, context):
        from gacalc.simplify import decide
        from gacalc.simplify.decision import combine

        given = self._conditions(statement.given, state, results, statement, "given")
        left = self._evaluate(statement.left, state, results, statement, given)
        right = self._evaluate(statement.right, state, results, statement, given)
        if statement.rotation:
            from .rotation_check import check_as_rotation

            return check_as_rotation(self, statement, state, results, given, left, right)
        differences = _differences(left, right, statement)
        conditions = relevant_conditions(state.conditions() + given, differences)
        exprs = [c.expr for c in conditions]
        decision = combine(decide(d, (), self._simplify_budget()) for d in differences)
        used: list[Condition] = []
        if decision.verdict is not True and exprs:
            decision = combine(decide(d, exprs, self._simplify_budget()) for d in differences)
            used = conditions
        outcome = {True: "holds", False: "fails", None: "undecided"}[decision.verdict]
        difference, complete = None, True
        if outcome != "holds":
            simplified = [self._simplified(d, state, given) for d in differences]
            complete = all(s[1] for s in simplified)
            difference = _reassemble(left, right, [s[0] for s in simplified])
        witness = _witness(self, decision, left, right, differences, state, given)
        texts = _unique(c.text for c in used)
        note = ""
        if outcome == "fails":   # say so when the sides differ only in sign (proved)
            from .rotation_check import sign_only_note

            note = sign_only_note(self, left, right, exprs)
        results.append(self._result(CheckResult, statement, outcome=outcome,
                                    difference=difference, conditions=texts,
                                    complete=complete, out_of_time=decision.out_of_time,
                                    reason=decision.reason, witness=witness,
                                    note=note))

    def _do_Assume(self, statement, state, results, context):
        if statement.clear:
            state.assumptions = []
            self._log(state, statement)
            results.append(self._note(statement, "no assumptions are active now"))
            return
        if not statement.conditions:
            active = state.conditions()
            if not active:
                message = "no conditions are active"
            else:
                message = "active conditions: " + "; ".join(_unique(c.text for c in active))
            results.append(self._note(statement, message))
            return
        new = self._conditions(statement.conditions, state, results, statement, "assume")
        state.assumptions = state.assumptions + new
        _check_consistent(state.conditions(), new)
        self._log(state, statement)
        if not statement.silent and new:     # conditions that always hold were said so
            results.append(self._note(statement, "assuming " + "; ".join(
                _unique(c.text for c in new))))

    def _do_Show(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, _, _ = self._simplified(value, state)
        against = None
        if statement.against is not None:
            against = self._evaluate(statement.against, state, results, statement)
        from gacalc.forms import build_report
        from gacalc.forms.report import SECTION_SECONDS

        values = [v for v in (value, against) if v is not None]
        for shown in values:       # the report multiplies the value with itself (norms...)
            limits.check_chain([shown, shown, shown], statement.span, "the report of show")
        conditions = [c.expr for c in relevant_conditions(state.conditions(), values)]
        report = build_report(value, session=self, against=against, conditions=conditions,
                              deadline=self._clock.within(None, MIN_SIMPLIFY_BUDGET),
                              call_seconds=float(self.budget),
                              source=S.unparse(statement.expr),
                              section_seconds=SECTION_SECONDS)
        if against is None:
            from gacalc.forms.kinematics import add_kinematics

            report = add_kinematics(report, value, _time_symbols(state), conditions,
                                    self._simplify_budget())
        from .formula_support import state_variables

        variables, others = state_variables(state)
        if variables:
            from gacalc.forms.formula_items import with_formulas

            report = with_formulas(report, variables, others, conditions,
                                   self._clock.within(None, MIN_SIMPLIFY_BUDGET))
        text = report.to_latex() if statement.latex else report.to_text(self.unicode)
        results.append(self._result(ShowResult, statement, report=report, report_text=text,
                                    latex=statement.latex))

    def _do_FormulaStatement(self, statement, state, results, context):
        from .formula_support import execute_formula

        execute_formula(self, statement, state, results)

    def _do_Emit(self, statement, state, results, context):
        value = self._evaluate(statement.expr, state, results, statement)
        value, _, _ = self._simplified(value, state)
        from gacalc import export

        name = statement.as_name
        if name is None and isinstance(statement.expr, S.Name):
            name = statement.expr.name
        declared = dict(state.declarations)
        payload = kind_of(value).export(value)
        options = {}
        if not statement.components:      # a proved formula, unless components are asked for
            from .formula_support import formula_outcome

            formula = formula_outcome(value, state, self._clock).formula
            if formula is not None:
                options["formula"] = formula
        if statement.target != "latex":    # code takes numbers: r1(t) is the input r1
            from .dependent import inputs_for_emit

            payload, declared = inputs_for_emit(payload, state, declared)
        try:
            code = export.emit(statement.target, payload, name=name,
                               declared=declared, options=options)
        except export.ExportError as error:
            raise GacalcError(f"emit {statement.target}: {error}", statement.span) from None
        path = self._write_emitted(statement, name, code, context)
        results.append(self._result(EmitResult, statement, target=statement.target,
                                    code=code, path=path))

    inline_pictures = False          # a front end that shows pictures itself sets this
    picture_size = (640, 480)        # pixels of a drawn picture

    def _do_Draw(self, statement, state, results, context):
        try:
            from gacalc.pictures.statement import run_draw
        except ModuleNotFoundError as error:    # numpy, which comes with matplotlib
            from gacalc.pictures import MISSING

            raise GacalcError(MISSING if error.name == "numpy" else str(error),
                              statement.span) from None
        run_draw(self, statement, state, results, context)

    def _do_BudgetSetting(self, statement, state, results, context):
        # a session setting: it holds for the statements after this one, those of a file
        # being used too (the clock restarts with the new length); the session keeps it
        # when the statement that set it succeeds (Session._run_one)
        if statement.seconds is not None:
            self._pending_budget = statement.seconds
            self._clock.start(self._seconds())
            restart_clock(self._clock)
        seconds = self._seconds()
        results.append(self._note(statement, (
            f"each statement may run {seconds:g} s (budget SECONDS changes it, budget none "
            "lifts it)") if seconds is not None else
            "statements run without a time limit (budget SECONDS sets one)"))

    def _do_Help(self, statement, state, results, context):
        text = help_text(statement.topic, state.functions)
        if text is None:
            raise GacalcNameError(f"no help on {statement.topic!r}",
                                  statement.span, hint="help lists the topics")
        results.append(self._result(HelpResult, statement, help=wrapped(text, self.width)))


# Helpers ------------------------------------------------------------------------------
_RANGE_RELATIONS = {">": (1, True), ">=": (1, False), "<": (-1, True), "<=": (-1, False)}


def _range_conditions(difference, relation, text, origin, span, results, note) -> list:
    """The range L OP R as a sympy relational d > 0 or d >= 0 (d = +-(L - R))."""
    import sympy

    if any(grade != 0 for grade, _ in difference.items()):
        raise GacalcTypeError(f"a range compares scalars: {text}", span)
    sign, strict = _RANGE_RELATIONS[relation]
    d = sign * difference[0]
    relational = (sympy.StrictGreaterThan if strict else sympy.GreaterThan)(d, 0)
    if relational is sympy.true:
        note.message = f"the condition {text} always holds"
        results.append(note)
        return []
    if relational is sympy.false:
        raise GacalcMathError(f"the condition {text} can never hold", span)
    if not d.is_number:
        return [Condition(relational, text, origin)]
    from gacalc.algebra.signs import certified_sign

    proved = certified_sign(d)
    if proved == 1 or (proved is None and not strict and d.equals(0)):
        note.message = f"the condition {text} always holds"
        results.append(note)
        return []
    raise GacalcMathError(f"the condition {text} can never hold", span)


def _reserved_kind(name: str) -> str | None:
    import re

    if re.fullmatch(r"e[0-9]+", name):
        return "a basis blade name"
    if name in BUILTINS:
        return "a built-in function"
    if name in T.KEYWORDS or name in T.CONSTANTS or name == "ans":
        return "a reserved name"
    return None


def _time_symbols(state: State) -> set:
    """The scalars declared values depend on (t of 'vector r(t)'), and a declared scalar t:
    show reports the angular velocity of a rotor with respect to these."""
    names = {param for params in state.dependence.values() for param in params}
    if state.declarations.get("t") == "scalar":
        names.add("t")
    return {symbol(name) for name in names}


def _unit_text(kind: str, name: str) -> str:
    return {"vector": f"{name} is a unit vector", "bivector": f"{name} is a unit bivector",
            "rotor": f"{name} is a unit rotor"}.get(kind, f"{name} has norm 1")


def _check_consistent(active: list, new: list):
    """Refuse new assumptions that contradict the active conditions they touch
    (the Gröbner basis of the set is {1}); AlgebraError says why."""
    if not new:
        return
    from gacalc.algebra import Multivector
    from gacalc.simplify.conditions import ConditionSet

    import sympy

    probe = Multivector.scalar(sympy.Add(*[sympy.Symbol(str(s), real=True) for condition in new
                                          for s in condition.expr.free_symbols]))
    connected = relevant_conditions(active, [probe])
    ConditionSet.of(tuple(condition.expr for condition in connected))
    _check_ranges([c.expr for c in connected])


def _check_ranges(exprs):
    """Refuse ranges that leave a symbol no value (a > 1 with a < 0)."""
    from gacalc.algebra import AlgebraError
    from gacalc.algebra.signs import box_of, certified_sign

    for symbol, (lo, hi, lo_open, hi_open) in box_of(exprs).items():
        if not (lo.is_finite and hi.is_finite):
            continue
        width = hi - lo
        empty = certified_sign(width) == -1 or (width == 0 and (lo_open or hi_open))
        if empty:
            raise AlgebraError(f"the ranges of {symbol} leave it no value (inconsistent); "
                               "nothing is proved from them")


def _differences(left, right, statement) -> list:
    """L - R as a list of multivectors, all zero when L equals R."""
    differences = kind_of(left).differences(left, right)
    if differences is None:
        raise GacalcTypeError(f"cannot compare {describe(left)} with {describe(right)}",
                              statement.span)
    return differences


def _rebinding_note(state, name: str) -> str:
    """What an assignment replaces when the name was declared or a function (a plain
    value simply changes); values computed before keep the old symbols."""
    kind = state.declarations.get(name)
    if kind == "scalar":
        return (f"{name} was a declared scalar symbol and is now a value; values computed "
                f"before keep the symbol {name}")
    if kind is not None:
        from gacalc.algebra.symbolic import component_names

        components = ", ".join(component_names(kind, name))
        return (f"{name} was a declared {kind} ({components}) and is now a value; values "
                "computed before keep its components")
    function = state.functions.get(name)
    if function is not None:
        return f"{name} was the function {name}({', '.join(function.params)}) and is now a value"
    return ""


def _witness(executor, decision, left, right, differences, state, given):
    """(point text, L - R at the point) of a check that failed at a sample point, or None."""
    if decision.verdict is not False or not decision.witness:
        return None
    from gacalc.simplify.decision import witness_text

    point = decision.point
    at_point = [executor._simplified(d.subs(point), state, given)[0] for d in differences]
    import sympy

    if any(e.has(sympy.zoo, sympy.nan, sympy.oo) for d in at_point
           for e in kind_of(d).scalars(d)):
        return None       # the point proves the sides differ; its value is not shown
    return witness_text(decision), _reassemble(left, right, at_point)


def _reassemble(left, right, differences):
    """The difference in the shape of the compared values."""
    return kind_of(left).reassemble(left, differences)


def _unique(texts) -> list:
    seen, out = set(), []
    for text in texts:
        if text not in seen:
            seen.add(text)
            out.append(text)
    return out
