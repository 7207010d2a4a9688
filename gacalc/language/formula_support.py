"""What the language adds to gacalc.formulas: the session's declared names and conditions
as recognition input, the ``formula`` statement's executor and the ``formula auto``
setting (every result printed as a formula when one is found)."""

from __future__ import annotations

from gacalc.algebra.multivector import Multivector

from .evaluator import State, relevant_conditions

FORMULA_SECONDS = 2.0     # the recognition budget (the issue's: a search stops at 2 s)


def formula_outcome(value, state: State, clock=None, seconds: float = FORMULA_SECONDS):
    """gacalc.formulas.Outcome for a value in the session's state (never raises for a
    value without a formula: the outcome says why)."""
    from gacalc.formulas import Outcome, recognize, variables_of
    from gacalc.simplify.budget import Budget

    if not isinstance(value, Multivector):
        return Outcome(None, "no formula: formulas are for multivectors and scalars")
    variables, others = variables_of(state.declarations, state.values, state.unit_names)
    conditions = [c.expr for c in relevant_conditions(state.conditions(), value)]
    budget = clock.within(seconds) if clock is not None else Budget(seconds)
    return recognize(value, variables, conditions, budget, others)


def state_variables(state: State):
    """(variables, others) of gacalc.formulas.variables_of for a state."""
    from gacalc.formulas import variables_of

    return variables_of(state.declarations, state.values, state.unit_names)


def execute_formula(session, statement, state: State, results: list):
    """formula EXPR: the value (it becomes ans) printed as a proved formula, or one line
    saying why there is none and the components; formula auto / off: the setting."""
    from .results import FormulaResult

    if statement.mode is not None:
        session.formulas = statement.mode == "auto"
        if not statement.silent:
            results.append(session._note(statement, "results print as formulas when one is "
                                         "found (formula off: components)" if session.formulas
                                         else "results print as components"))
        return
    value = session._evaluate(statement.expr, state, results, statement)
    value, complete, _ = session._simplified(value, state)
    state.ans = value
    session._log(state, statement)
    outcome = formula_outcome(value, state, session._clock)
    results.append(session._result(FormulaResult, statement, value=value,
                                   formula=outcome.formula, message=outcome.message))
