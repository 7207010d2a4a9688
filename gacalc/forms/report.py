"""The derived-forms report of a value, as structured data (what `show` prints).

A report is a title, a kind and a list of labelled items; each item holds a value
(Multivector, sympy Expr, sympy Matrix, a (w, x, y, z) tuple, or plain text), an optional
note, and optionally the condition (an Expr that must be nonzero) under which it holds.
Every value goes through gacalc.simplify with the session's side conditions; when a
simplification runs out of its time budget the value stays correct but unsimplified and
the report says so (``complete`` is False).

Printing is gacalc.forms.render's job; nothing here formats values for a screen, except
the short expressions quoted inside notes (written as gacalc input text).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field
from fractions import Fraction

from gacalc.lazy import sympy

from gacalc.algebra import AlgebraError, Multivector, NotInvertibleError

# Section names: the renderers print one heading per section, in this order.
VALUE, INVOLUTIONS, MEASURES, KIND, FORMS, AGAINST = (
    "value", "involutions", "measures", "classification", "forms", "against")

GRADE_LABELS = {0: "scalar part", 1: "vector part", 2: "bivector part", 3: "trivector part"}
QUATERNION_NOTE = "Hamilton: i = -e23, j = -e31, k = -e12"

REPORT_BUDGET = 30.0    # seconds for a whole report made without a session's deadline
# In a session's show, each section of the report (value, involutions, measures,
# classification and forms) gets SECTION_SECONDS and the inverse, the costly measure,
# INVERSE_SECONDS of its section; past it the section is named with one line saying how
# to get its forms one by one.  Measured on 2 cores, unloaded: the slowest section of the
# reports in the test suite (the classification of a symbolic rotor without its unit
# condition) takes 0.25 s.  build_report without section_seconds (library use, tests)
# has no per-section limit, so its result never depends on the machine's load.
SECTION_SECONDS = 1.0
INVERSE_SECONDS = 0.5
# Yaw, pitch, roll of a rotor: its own share of SECTION_SECONDS after the forms (an exact
# radical rotor takes a few tenths of a second), so it never crowds the forms out.
ATTITUDE_SHARE = 0.6
# An item with more terms than this (more than a screen of text) is named, not printed.
ITEM_TERMS = 160


@dataclass(frozen=True)
class ReportItem:
    """One labelled line of a report.

    value: Multivector, sympy Expr, sympy Matrix, tuple (quaternion w, x, y, z) or str
    (a verdict in words).  condition: a sympy Expr that must be nonzero for the value
    to hold (None when it holds everywhere).
    """

    label: str
    value: object
    note: str = ""
    section: str = ""
    condition: object = None
    # the same value and condition as coordinate-free formulas (gacalc.forms.formula_items)
    formula: object = None
    condition_formula: object = None
    # Set when the value (or its condition) is too long to read: the renderers print
    # this line instead; the value itself stays in the report for programs.
    omitted: str = ""
    condition_omitted: str = ""

    @property
    def is_text(self) -> bool:
        return isinstance(self.value, str)

    def to_dict(self) -> dict:
        return {"label": self.label, "value": self.value, "note": self.note,
                "section": self.section, "condition": self.condition}


@dataclass
class Report:
    """title: a one-line heading; kind: the classification ('rotor', 'vector', ...)."""

    title: str
    kind: str
    items: list = field(default_factory=list)
    complete: bool = True

    def labels(self) -> list:
        return [item.label for item in self.items]

    def item(self, label: str) -> ReportItem:
        for it in self.items:
            if it.label == label:
                return it
        raise KeyError(label)

    def __getitem__(self, label: str):
        return self.item(label).value

    def __contains__(self, label: str) -> bool:
        return any(it.label == label for it in self.items)

    def get(self, label: str, default=None):
        return self[label] if label in self else default

    def to_dict(self) -> dict:
        return {"title": self.title, "kind": self.kind, "complete": self.complete,
                "items": [it.to_dict() for it in self.items]}

    # renderings (gacalc.forms.render), named so a session can ask for a mode by name
    def to_text(self, unicode: bool = False) -> str:
        from .render import render_text

        return render_text(self, unicode)

    def to_unicode(self) -> str:
        return self.to_text(unicode=True)

    def to_latex(self) -> str:
        from .render import render_latex

        return render_latex(self)


# ---------------------------------------------------------------------------
# simplification with the session's conditions, remembering budget overruns


class _Simplifier:
    """gacalc.simplify with the session's conditions, under one deadline for the report.

    Each call gets ``call_seconds`` (the session's --budget; the simplifier's default
    without a session) but never runs past the report's deadline (the statement's,
    passed down by the session; REPORT_BUDGET without one), so a large symbolic value
    yields a correct report marked incomplete in bounded time rather than dozens of
    full-length attempts.
    """

    def __init__(self, conditions, deadline=None, call_seconds=None):
        from gacalc.simplify import DEFAULT_BUDGET, Budget

        self.source = "X"      # the shown expression, for the hints of omitted items
        self.section_seconds = None   # each section's limit (None: only the deadline)
        self.conditions = tuple(conditions or ())
        self.complete = True
        self.deadline = deadline if deadline is not None else Budget(REPORT_BUDGET)
        self.call_seconds = DEFAULT_BUDGET if call_seconds is None else call_seconds

    def budget(self):
        return self.deadline.within(self.call_seconds)

    def mv(self, x: Multivector) -> Multivector:
        from gacalc.simplify import simplify

        result = simplify(x, self.conditions, budget=self.budget())
        if not result.complete:
            self.complete = False
        return result.value

    def scalar(self, e):
        e = sympy.Integer(0) if e is None else e
        return self.mv(Multivector({0: e}))[0] if _is_real_coefficient(e) else e

    def complex_scalar(self, e):
        re, im = sympy.expand_complex(e).as_real_imag()
        return self.scalar(re) + sympy.I * self.scalar(im)

    def matrix(self, m, complex_entries=False):
        f = self.complex_scalar if complex_entries else self.scalar
        return sympy.ImmutableMatrix(m.shape[0], m.shape[1], [f(x) for x in m])

    def zero(self, x) -> bool | None:
        """True / False / None: does x (Multivector or Expr) vanish under the conditions?"""
        return self.zero_decision(x).verdict

    def zero_decision(self, x):
        """The same with its grounds (gacalc.simplify.decision.Decision: out_of_time says
        whether the budget ran out)."""
        from gacalc.simplify import decide
        from gacalc.simplify.decision import ZERO

        mv = x if isinstance(x, Multivector) else Multivector({0: x})
        if mv.is_zero():
            return ZERO
        return decide(mv, self.conditions, budget=self.budget())

    def sqrt(self, e):
        return sympy.sqrt(self.scalar(e))


def _is_real_coefficient(e) -> bool:
    return not (isinstance(e, sympy.Basic) and e.has(sympy.I))


def _text(e) -> str:
    """A scalar Expr as gacalc input text (for quoting inside a note)."""
    texts = Multivector({0: e}).coefficient_texts()
    return texts[0][1] if texts else "0"


def _condition(e, s: _Simplifier):
    """The condition 'e != 0' reduced under the session's conditions; None when it always
    holds.  ``e`` is a sympy Expr or a scalar Multivector (reduced as it is, and only the
    result written out as an Expr: a long polynomial is not converted out and back)."""
    if e is None:
        return None
    if isinstance(e, Multivector):
        e = s.mv(e)[0]
    else:
        e = s.scalar(e)
    if e.is_number and e != 0:
        return None
    return e


# ---------------------------------------------------------------------------
# the report


def build_report(value, session=None, against=None, conditions=(), deadline=None,
                 call_seconds=None, source=None, section_seconds=None) -> Report:
    """The derived forms of value (optionally relative to the blade `against`).

    value: Multivector, a scalar (int, Fraction, sympy Expr), a sympy Matrix or a
    sympy Quaternion (the last two are reported as they are).  conditions: sympy Exprs
    equal to zero (side conditions active in the session).  session is accepted for
    display settings only; the report does not depend on it.  deadline: a
    gacalc.simplify.Budget the whole report keeps to (the statement's); call_seconds:
    the budget of one simplification (the session's --budget).  source: the shown
    expression as input text, quoted in the lines that say how to get an omitted form.
    """
    from gacalc.values import kind_of

    s = _Simplifier(conditions, deadline, call_seconds)
    s.source = source or "X"
    s.section_seconds = section_seconds
    kind = kind_of(value)
    if kind is None:
        value = _as_multivector(value)
        kind = kind_of(value)
    return kind.report(value, s, against)


def multivector_report(x: Multivector, s: _Simplifier, against=None) -> Report:
    """The report of a multivector (the value kind of multivectors asks for it)."""
    builder = _Builder(x, s)
    report = builder.build()
    report.items[1:1] = numeric_items(builder.x)
    if against is not None:
        report.items.extend(_against_items(builder.x, _as_multivector(against), s))
        report.title += " against a " + _grade_name(_as_multivector(against))
    report.complete = s.complete
    if not report.complete:
        report.items.insert(1, ReportItem(
            "simplification", "incomplete",
            "some values ran out of the time budget: correct, but not in simplest form", VALUE))
    return report


def numeric_items(value) -> list:
    """A 'numeric value' item when the exact value is too long to read (none otherwise)."""
    from gacalc.printing.text import LONG_EXACT_CHARS, NOTE_DIGITS, numeric_value, value_text

    if len(value_text(value)) <= LONG_EXACT_CHARS:
        return []
    approx = numeric_value(value)
    if approx is None:
        return []
    return [ReportItem("numeric value", approx, f"{NOTE_DIGITS} digits", VALUE)]


def _as_multivector(value) -> Multivector:
    if isinstance(value, Multivector):
        return value
    if isinstance(value, (int, Fraction, sympy.Expr)) and not isinstance(value, bool):
        return Multivector.scalar(value)
    raise AlgebraError(f"show needs a multivector, a matrix or a quaternion; got {type(value).__name__}")


def _grade_name(b: Multivector) -> str:
    grades = b.grades()
    if len(grades) != 1:
        return "multivector"
    return ("scalar", "vector", "bivector", "trivector")[next(iter(grades))]


@dataclass
class _Parts:
    present: tuple        # grades whose part does not vanish (or might not)
    undecided: tuple      # grades whose vanishing could not be decided
    out_of_time: bool = False    # some of them because the time budget ran out


# Per label: the statement that computes an omitted form by itself ({} is the source).
_HINTS = {
    "value": "{}", "reverse": "rev({})", "grade involution": "involute({})",
    "Clifford conjugate": "conjugate({})", "norm2": "norm2({})", "norm": "norm({})",
    "inverse": "inverse({})", "dual": "dual({})", "Pauli matrix": "pauli({})",
    "rotation matrix": "matrix({})", "quaternion": "quaternion({})", "log": "log({})",
    "scalar part": "grade({}, 0)", "vector part": "grade({}, 1)",
    "bivector part": "grade({}, 2)", "trivector part": "grade({}, 3)",
}
_SECTION_HINTS = {
    VALUE: "{} and grade({}, k) print its value and parts",
    INVOLUTIONS: "rev({}), involute({}) and conjugate({}) compute them one by one",
    MEASURES: "norm2({}), norm({}), inverse({}) and dual({}) compute them one by one",
    KIND: "angle({}), plane({}), matrix({}) and pauli({}) compute the forms one by one",
}


class _Builder:
    def __init__(self, x: Multivector, s: _Simplifier):
        self.x = x
        self.s = s
        self.items: list = []
        self._norm2 = None
        self._attitude_pending = None    # (rotor, label prefix) once the forms know one

    def add(self, section, label, value, note="", condition=None):
        self.items.append(ReportItem(label, value, note, section, condition))

    @property
    def norm2(self):
        if self._norm2 is None:
            self._norm2 = self.s.scalar(self.x.norm2())
        return self._norm2

    # -- sections under their own budget ---------------------------------------------

    def _section(self, section: str, compute, label: str | None = None,
                 hint: str | None = None, share: float = 1.0):
        """compute() under SECTION_SECONDS (and the report's deadline); on time-out its
        items are replaced by one line naming the section and how to get its forms."""
        from gacalc.simplify.budget import BudgetExceeded, time_limit

        s = self.s
        if s.section_seconds is None:
            return compute()
        outer = s.deadline
        budget = outer.within(s.section_seconds * share)
        start = len(self.items)
        s.deadline = budget
        try:
            with time_limit(budget):
                return compute()
        except BudgetExceeded:
            del self.items[start:]
            hint = (hint or _SECTION_HINTS[section]).format(*[s.source] * 4)
            self.add(section, label or section, "omitted",
                     f"took more than {s.section_seconds * share:g} s; {hint}")
            s.complete = False
            return None
        finally:
            s.deadline = outer

    def _shorten(self):
        """Items too long to read are named with their size and the statement for them."""
        for position, item in enumerate(self.items):
            if isinstance(item.value, str):
                continue
            terms = _terms(item.value)
            if terms > ITEM_TERMS:
                hint = _HINTS.get(item.label)
                how = f"; {hint.format(self.s.source)} prints it" if hint else ""
                self.items[position] = dataclasses.replace(
                    item, omitted=f"{terms} terms, too long to read here{how}")
            elif item.condition is not None and _terms(item.condition) > ITEM_TERMS:
                terms = _terms(item.condition)
                self.items[position] = dataclasses.replace(
                    item, condition_omitted=f"valid where a polynomial of {terms} terms "
                    "is nonzero")

    # -- the common part -------------------------------------------------------

    def build(self) -> Report:
        s = self.s
        parts = self._section(VALUE, self._value_section)
        if parts is None:        # undecided which parts vanish: all are kept
            grades = tuple(sorted(self.x.grades()))
            parts = _Parts(grades, grades)
        self._section(INVOLUTIONS, self._involutions)
        self._section(MEASURES, self._measures)
        kind = self._section(KIND, lambda: self._classify(parts))
        if kind is None:
            kind = "undecided"
        if self._attitude_pending is not None:
            r, prefix = self._attitude_pending
            self._section(FORMS, lambda: self._attitude_item(r, prefix),
                          label=prefix + "yaw, pitch, roll", share=ATTITUDE_SHARE,
                          hint='euler_angles({}, "zyx") computes them')
        self._shorten()
        order = (VALUE, INVOLUTIONS, MEASURES, KIND, FORMS, AGAINST)
        self.items.sort(key=lambda it: order.index(it.section))
        title = {"zero": "zero", "undecided": "a multivector of undecided kind"}.get(
            kind, ("an " if kind[0] in "aeiou" else "a ") + kind)
        return Report(title, kind, self.items, s.complete)

    def _value_section(self) -> _Parts:
        self.x = self.s.mv(self.x)
        parts = self._parts()
        if len(parts.present) < len(self.x.grades()):  # a part shown to vanish is dropped
            self.x = sum((self.x.grade(k) for k in parts.present), Multivector({}))
        x = self.x
        self.add(VALUE, "value", x)
        if len(parts.present) > 1:
            for k in parts.present:
                self.add(VALUE, GRADE_LABELS[k], x.grade(k))
        self.add(VALUE, "grades", _grades_text(parts))
        return parts

    def _involutions(self):
        x = self.x
        self.add(INVOLUTIONS, "reverse", x.rev())
        self.add(INVOLUTIONS, "grade involution", x.involute())
        self.add(INVOLUTIONS, "Clifford conjugate", x.conjugate())

    def _measures(self):
        x = self.x
        self.add(MEASURES, "norm2", self.norm2, "<X X~>")
        self.add(MEASURES, "norm", sympy.sqrt(self.norm2))
        # the inverse is the costly measure: its own budget, so the others still show
        self._section(MEASURES, self._inverse, "inverse", "inverse({}) computes it",
                      INVERSE_SECONDS / SECTION_SECONDS)
        self.add(MEASURES, "dual", x.dual(), "X I^-1")

    def _parts(self) -> _Parts:
        present, undecided, out_of_time = [], [], False
        for k in sorted(self.x.grades()):
            decision = self.s.zero_decision(self.x.grade(k))
            if decision.verdict is True:
                continue
            present.append(k)
            if decision.verdict is None:
                undecided.append(k)
                out_of_time = out_of_time or decision.out_of_time
        return _Parts(tuple(present), tuple(undecided), out_of_time)

    def _inverse(self):
        x, s = self.x, self.s
        # A A-bar = a + b I is central; no inverse where a^2 + b^2 = 0 (decided here under
        # the session's conditions, which the core does not see)
        # a^2 + b^2 in the coefficient domain: through sympy expressions this was most of
        # the time of `show A B` (a degree-8 polynomial converted out and back)
        squares = [c * c for c in x.central_norm() if c is not None]
        norm = sum(squares[1:], squares[0]) if squares else None
        d = s.mv(Multivector.from_coefs([norm] + [None] * 7))
        if s.zero(d) is True:
            self.add(MEASURES, "inverse", "none",
                     "not invertible: a^2 + b^2 = 0 where X*conjugate(X) = a + b*I")
            return
        try:
            inv, cond = x.inverse_with_condition(as_value=True)
        except NotInvertibleError as exc:
            self.add(MEASURES, "inverse", "none", str(exc))
            return
        cond = _condition(cond, s)
        if cond is not None and s.zero(cond) is True:
            self.add(MEASURES, "inverse", "none",
                     f"not invertible under the side conditions ({_text(cond)} = 0 there)")
            return
        self.add(MEASURES, "inverse", s.mv(inv), condition=cond)

    # -- classification ----------------------------------------------------------

    def _classify(self, parts: _Parts) -> str:
        present = set(parts.present)
        if parts.undecided:
            self.add(KIND, "kind", "undecided",
                     "whether the grade " + ", ".join(map(str, parts.undecided))
                     + " part vanishes could not be decided"
                     + (" within the report's time budget" if parts.out_of_time else ""))
            return "undecided"
        if not present:
            self.add(KIND, "kind", "zero")
            return "zero"
        if len(present) == 1:
            k = next(iter(present))
            kind = ("scalar", "vector", "bivector", "trivector")[k]
            self.add(KIND, "kind", kind)
            if k > 0:
                self.add(KIND, "blade", "yes",
                         "in 3-D every homogeneous element is a blade")
            getattr(self, "_" + kind)()
            return kind
        if present <= {0, 2}:
            return self._even_element()
        if present <= {1, 3}:
            return self._odd_element()
        self.add(KIND, "kind", "general", "mixed parity: neither a versor nor a blade")
        self._general()
        return "general"

    def _versor_scale(self):
        """V V~ as (scalar, verdict): verdict True when it is a nonzero scalar, None undecided."""
        x, s = self.x, self.s
        vv = s.mv(x * x.rev())
        rest = vv - Multivector({0: vv[0]})
        if s.zero(rest) is not True:
            return vv[0], None
        zero = s.zero(vv[0])
        return vv[0], (None if zero is None else not zero)

    def _maps_vectors(self, images) -> bool | None:
        verdicts = [self.s.zero(img - img.grade(1)) for img in images]
        if all(v is True for v in verdicts):
            return True
        return False if any(v is False for v in verdicts) else None

    def _images(self, versor: Multivector):
        from gacalc.algebra.versors import apply_versor

        return [self.s.mv(apply_versor(versor, Multivector({k: 1}))) for k in (1, 2, 3)]

    def _versor_verdict(self, parity: str, images=None):
        """(is a versor, the 'versor' item): V V~ a nonzero scalar, V X^ V^-1 keeps vectors."""
        n2, nonzero = self._versor_scale()
        if nonzero is False:
            return False, ReportItem("versor", "no", "V V~ = 0", KIND)
        if nonzero is None:
            return False, ReportItem("versor", "undecided",
                                     "whether V V~ is a nonzero scalar could not be decided", KIND)
        maps = self._maps_vectors(images if images is not None else self._images(self.x))
        if maps is False:
            return False, ReportItem("versor", "no", "V X^ V^-1 does not map vectors to vectors", KIND)
        if maps is None:
            return False, ReportItem("versor", "undecided",
                                     "whether V X^ V^-1 maps vectors to vectors could not be decided", KIND)
        note = f"V V~ = {_text(n2)}, a nonzero scalar; V X^ V^-1 maps vectors to vectors"
        return True, ReportItem("versor", f"yes ({parity})", note, KIND, _condition(n2, self.s))

    def _versor_facts(self, parity: str, images=None) -> bool:
        ok, item = self._versor_verdict(parity, images)
        self.items.append(item)
        return ok

    def _even_element(self) -> str:
        x, s = self.x, self.s
        unit = s.zero(x * x.rev() - 1)
        if unit is True:
            self.add(KIND, "kind", "rotor", "even, R R~ = 1")
            self._rotor_forms(x)
            return "rotor"
        ok, verdict = self._versor_verdict("even")
        if not ok:
            self.add(KIND, "kind", "general", "even, but not shown to be a versor")
            self.items.append(verdict)
            self._general()
            return "general"
        note = "R R~ = 1 could not be decided" if unit is None else "V V~ is not 1"
        self.add(KIND, "kind", "even versor", note + "; V/|V| is a rotor")
        self.items.append(verdict)
        norm = sympy.sqrt(self.norm2)
        self.add(FORMS, "scale |V|", norm)
        cond = _condition(self.norm2, s)
        unit_rotor = s.mv(x / norm)
        self.add(FORMS, "rotor V/|V|", unit_rotor, condition=cond)
        # the angle and plane read from V itself: atan2 does not see the positive scale
        self._rotor_forms(unit_rotor, prefix="rotor ", source=x)
        return "even versor"

    def _odd_element(self) -> str:
        images = self._images(self.x)
        ok, verdict = self._versor_verdict("odd", images)
        if not ok:
            self.add(KIND, "kind", "general", "odd, but not shown to be a versor")
            self.items.append(verdict)
            self._general()
            return "general"
        self.add(KIND, "kind", "odd versor", "vector + trivector")
        self.items.append(verdict)
        self._rotary_reflection(images)
        return "odd versor"

    # -- per kind ----------------------------------------------------------------------

    def _scalar(self):
        pass  # nothing beyond the common part

    def _vector(self):
        x, s = self.x, self.s
        norm = sympy.sqrt(self.norm2)
        cond = _condition(self.norm2, s)
        self.add(FORMS, "magnitude", norm)
        self.add(FORMS, "direction", s.mv(x / norm), "unit vector", cond)
        self.add(FORMS, "plane (dual)", x.dual(), "the bivector of the plane normal to it")
        images = self._images(x)
        self._versor_facts("odd", images)
        self.add(FORMS, "acts as", "reflection",
                 "x -> -v x v^-1, in the plane through the origin normal to v", cond)
        self.add(FORMS, "mirror normal", s.mv(x / norm), condition=cond)
        self.add(FORMS, "reflection matrix", _matrix_of(images), "columns are the images of e1, e2, e3")

    def _bivector(self):
        x, s = self.x, self.s
        norm = sympy.sqrt(self.norm2)
        cond = _condition(self.norm2, s)
        self.add(FORMS, "square", s.scalar((x * x)[0]), "B B = -|B|^2")
        self.add(FORMS, "area", norm, "magnitude |B|")
        self.add(FORMS, "unit plane", s.mv(x / norm), condition=cond)
        self.add(FORMS, "normal axis (dual)", x.dual(), "B I^-1; right-hand normal, length |B|")
        unit = s.zero(self.norm2 - 1)
        if unit is True:
            self.add(KIND, "rotor", "yes", "a unit bivector is the rotor of a half turn (angle pi)")
        else:
            self._versor_facts("even")
            self.add(FORMS, "acts as", "half turn", "as a versor: rotation by pi in its plane")

    def _trivector(self):
        self._versor_facts("odd")
        self.add(FORMS, "volume (dual)", self.x.dual(), "oriented volume: X = (volume) I")
        self.add(FORMS, "acts as", "point reflection", "as a versor: x -> -x")

    def _general(self):
        from gacalc.algebra.representations import pauli

        x, s = self.x, self.s
        self.add(FORMS, "Pauli matrix", s.matrix(pauli(x), complex_entries=True),
                 "e1, e2, e3 -> sigma_x, sigma_y, sigma_z; e123 -> i")
        self.add(FORMS, "central part", x.grade(0) + x.grade(3),
                 "scalar + pseudoscalar: commutes with everything")

    # -- rotors ---------------------------------------------------------------------------

    def _rotor_forms(self, r: Multivector, prefix="", source=None):
        from gacalc.algebra.representations import pauli, quaternion, rotation_matrix

        s = self.s
        angle, plane, note, cond = rotor_angle_plane(r if source is None else source, s)
        self.add(FORMS, prefix + "angle", angle, note, cond)
        if plane is None:
            self.add(FORMS, prefix + "plane", "none", "the identity rotation has no plane")
        else:
            self.add(FORMS, prefix + "plane", plane, "unit bivector P, R = exp(-P*angle/2)", cond)
            self.add(FORMS, prefix + "axis", s.mv(plane.dual()), "unit vector, right-hand rule", cond)
        self.add(FORMS, prefix + "rotation matrix", s.matrix(rotation_matrix(r, s.conditions)),
                 "of x -> R x R~, columns are the images of e1, e2, e3")
        q = quaternion(r)
        self.add(FORMS, prefix + "quaternion", tuple(s.scalar(c) for c in (q.a, q.b, q.c, q.d)),
                 QUATERNION_NOTE)
        self._attitude_pending = (r, prefix)     # computed under its own budget (build)
        self.add(FORMS, prefix + "Pauli matrix", s.matrix(pauli(r), complex_entries=True),
                 "e1, e2, e3 -> sigma_x, sigma_y, sigma_z; e123 -> i")
        if plane is not None:
            log = s.mv(plane.scale(-angle / 2))
            self.add(FORMS, prefix + "log", log, "-P*angle/2, exp(log) = R", cond)
        else:
            self.add(FORMS, prefix + "log", Multivector({}), "R = 1" if angle == 0 else
                     "R = -1 = exp(-P pi) for any unit bivector P")
        self.add(FORMS, prefix + "same rotation", s.mv(-r),
                 "-R: the same rotation, by 2*pi - angle about the opposite axis")

    def _attitude_item(self, r: Multivector, prefix: str):
        """Yaw, pitch, roll: the intrinsic zyx angles a gimbal reads (help attitude); the
        exact-angle search of euler_angles runs for the (quick) middle angle only, to stay
        within the section budget."""
        from gacalc.algebra.attitude import axis_sequence, euler_angles
        from gacalc.printing.text import scalar_text
        from gacalc.values.sequence import value_list

        s = self.s
        result = euler_angles(r, axis_sequence("zyx"), s.conditions, exact="middle")
        note = "intrinsic zyx, R = rotor(e3, yaw) rotor(e2, pitch) rotor(e1, roll)"
        if result.locked is not None:
            note += "; gimbal lock: roll set to 0"
        elif result.condition is not None:
            note += f"; gimbal lock where {scalar_text(result.condition)} = +-1"
        angles = value_list(Multivector.scalar(s.scalar(a)) for a in result.angles)
        self.add(FORMS, prefix + "yaw, pitch, roll", angles, note)

    def _rotary_reflection(self, images):
        """V = v + b I: with V/|V| = cos(t/2) n - sin(t/2) I it is the rotation by t about n
        (rotor(n, t) n, right-hand rule) after the reflection in the plane normal to n."""
        x, s = self.x, self.s
        v, b = x.grade(1), x[7]
        vnorm = s.sqrt(v.norm2())
        cond = _condition(v.norm2(), s)
        n = s.mv(v / vnorm)
        angle = s.scalar(2 * sympy.atan2(-b, vnorm))
        self.add(FORMS, "acts as", "rotary reflection",
                 "reflection in the plane normal to n, then rotation about n by the angle")
        self.add(FORMS, "mirror normal", n, "n = <V>1 / |<V>1|", cond)
        self.add(FORMS, "rotation angle", angle,
                 "2*atan2(-b, |<V>1|) with <V>3 = b I; right-hand rule about n", cond)
        self.add(FORMS, "map matrix", _matrix_of(images),
                 "of x -> V x^ V^-1, determinant -1")


def _terms(value) -> int:
    """The number of terms of a value, counted without printing it (flint lengths for
    multivectors; sum terms of sympy expressions and entries)."""
    if isinstance(value, Multivector):
        shared = value.shared_denominator()
        if shared is not None:       # printed once: (numerator)/(denominator)
            return _terms(shared[0]) + _terms(shared[1])
        total = 0
        for coef in value.coefs():
            if coef is None:
                continue
            if coef.expr is not None:
                total += len(sympy.Add.make_args(coef.expr))
            else:
                total += len(coef.num) + (len(coef.den) if coef.den is not None else 0)
        return total
    if isinstance(value, sympy.MatrixBase):
        return sum(_terms(entry) for entry in value)
    if isinstance(value, tuple):
        return sum(_terms(entry) for entry in value)
    if isinstance(value, sympy.Basic):
        return _expr_terms(value)
    return 1


def _expr_terms(expr) -> int:
    """Terms of a sympy scalar: summands, counted through products and powers of sums."""
    if expr.is_Add:
        return sum(_expr_terms(term) for term in expr.args)
    if expr.is_Mul:
        return max([1] + [_expr_terms(factor) for factor in expr.args])
    if expr.is_Pow:
        return _expr_terms(expr.base)
    return 1


def _matrix_of(images) -> sympy.ImmutableMatrix:
    return sympy.ImmutableMatrix([[img[k] for img in images] for k in (1, 2, 3)])


def _grades_text(parts: _Parts) -> str:
    if not parts.present:
        return "none (zero)"
    grades = parts.present
    if all(g % 2 == 0 for g in grades):
        parity = "even"
    elif all(g % 2 == 1 for g in grades):
        parity = "odd"
    else:
        parity = "mixed parity"
    if parts.undecided:
        parity += "; whether grade " + ", ".join(map(str, parts.undecided)) + " vanishes is undecided"
    return ", ".join(map(str, grades)) + f" ({parity})"


# ---------------------------------------------------------------------------
# angle and plane of a rotor


def rotor_angle_plane(r: Multivector, s: _Simplifier | None = None):
    """(angle, unit plane or None, note, condition) of a unit rotor R = a + B.

    R = cos(t/2) - sin(t/2) P = exp(-P t/2).  In the half-angle form, with a symbolic t,
    t is read off directly; it is then the principal angle 2*atan2(|B|, a) (in [0, 2*pi])
    only while 0 <= t <= 2*pi, and the note says so.  Otherwise t = 2*atan2(|B|, a) and
    P = -B/|B| (undefined where |B| = 0, the condition).
    """
    s = s or _Simplifier(())
    a, bpart = s.scalar(r[0]), r.grade(2)
    if s.zero(bpart) is True:
        if s.zero(a - 1) is True:
            return sympy.Integer(0), None, "identity rotation", None
        return 2 * sympy.pi, None, "R = -1: a full turn of the rotor, the identity rotation", None
    half = _half_angle(a, bpart, s)
    if half is not None:
        u, plane = half
        angle = s.scalar(2 * u)
        principal = s.scalar(2 * sympy.atan2(sympy.sqrt(s.scalar(-(bpart * bpart)[0])), a))
        if s.zero(principal - angle) is True:   # proved under the stated ranges
            note = ("read off R = cos(angle/2) - sin(angle/2)*P; equal to the principal "
                    "value 2*atan2(|<R>2|, <R>0) under the stated range")
        else:
            note = (f"read off R = cos(angle/2) - sin(angle/2)*P, assuming the range "
                    f"0 <= {_text(angle)} <= 2*pi; only there is it the principal value "
                    f"2*atan2(|<R>2|, <R>0) (state a range to prove it, e.g. "
                    f"scalar t in (0, 2 pi))")
        return angle, plane, note, None
    b2 = s.scalar(-(bpart * bpart)[0])
    bnorm = sympy.sqrt(b2)
    angle = s.scalar(2 * sympy.atan2(bnorm, a))
    angle = _as_pi_multiple(angle, a, bnorm, s)
    plane = s.mv(-bpart / bnorm)
    return angle, plane, "principal value 2*atan2(|<R>2|, <R>0), in [0, 2*pi]", _condition(b2, s)


def _as_pi_multiple(angle, a, bnorm, s: _Simplifier):
    """An exact numeric angle as a rational multiple of pi when that is provably it.

    atan2 of nested radicals (cos(pi/10) = sqrt(5/8 + sqrt(5)/8)) does not close by
    itself; a candidate q*pi from the numeric value is kept only when cos(q*pi/2) = a
    and sin(q*pi/2) = |B| are decided exactly.
    """
    if not angle.is_number or angle.has(sympy.Float) or not angle.has(sympy.atan, sympy.atan2):
        return angle
    q = Fraction(float(sympy.N(angle / sympy.pi, 30))).limit_denominator(720)
    candidate = sympy.Rational(q.numerator, q.denominator) * sympy.pi
    half = candidate / 2
    if s.zero(sympy.cos(half) - a) is True and s.zero(sympy.sin(half) - bnorm) is True:
        return candidate
    return angle


def _half_angle(a, bpart: Multivector, s: _Simplifier):
    """(u, P) when a = cos(u) with a symbolic u and B = -sin(u) P for a unit bivector P."""
    if not isinstance(a, sympy.cos) or not a.free_symbols:
        return None
    u = a.args[0]
    plane = s.mv(-bpart / sympy.sin(u))
    if any(u.free_symbols & c.free_symbols for _, c in plane.items()):
        return None
    if s.zero(plane * plane + 1) is not True:
        return None
    return u, plane


# ---------------------------------------------------------------------------
# x against a blade B


def _against_items(x: Multivector, blade: Multivector, s: _Simplifier):
    from gacalc.algebra.versors import project, reject

    items = []

    def add(label, value, note="", condition=None):
        items.append(ReportItem(label, value, note, AGAINST, condition))

    blade = s.mv(blade)
    add("blade B", blade)
    try:
        proj = s.mv(project(x, blade))
        rej = s.mv(reject(x, blade))
    except AlgebraError as exc:
        add("projection", "none", str(exc))
        return items
    b2 = s.scalar(blade.norm2())
    cond = _condition(b2, s)
    add("projection", proj, "(x _| B) B^-1", cond)
    add("rejection", rej, "x - projection", cond)
    p2, r2 = s.scalar(proj.norm2()), s.scalar(rej.norm2())
    add("|projection|", sympy.sqrt(_shorter(p2)), condition=cond)
    add("|rejection|", sympy.sqrt(_shorter(r2)), condition=cond)
    if x.grades() != {1}:
        add("angle", "none", "the angle is reported for a vector x")
        return items
    x2 = s.scalar(x.norm2())
    angle_cond = _condition_product((x2, b2), s)
    if blade.grades() == {1}:
        dot = s.scalar(x.scalar_product(blade)[0])
        cosine = dot / (sympy.sqrt(x2) * sympy.sqrt(b2))
        add("angle", s.scalar(sympy.acos(cosine)), "acos(x.B / (|x| |B|)), in [0, pi]", angle_cond)
        _rotor_between_item(add, x, blade, (x2, b2, dot), s, angle_cond)
    else:
        add("angle", s.scalar(sympy.acos(sympy.sqrt(p2) / sympy.sqrt(x2))),
            "acos(|projection| / |x|): between x and the subspace, in [0, pi/2]", angle_cond)
    return items


def _shorter(e):
    """e or its factored form, whichever prints shorter (|x.b|^2/|b|^2 factors nicely)."""
    factored = sympy.factor(e)
    return factored if len(str(factored)) < len(str(e)) else e


def _condition_product(factors, s: _Simplifier):
    """'f1 f2 ... != 0' kept as a product of the simplified factors (None if always true)."""
    kept = [c for c in (_condition(f, s) for f in factors) if c is not None]
    return sympy.Mul(*kept) if kept else None


def _rotor_between_item(add, a, b, measures, s, cond):
    """The rotor in the plane of a and b turning a's direction into b's.

    Numeric vectors go through gacalc.algebra.rotors.rotor_between (which also picks a
    plane for opposite vectors).  For symbolic ones the closed form
    R = (|a||b| + b a) / sqrt(2 |a||b| (|a||b| + a.b)) reads better than normalising
    the normalised vectors' 1 + b a; it holds wherever a and b are not opposite.
    """
    from gacalc.algebra.rotors import rotor_between

    label = "rotor x -> B"
    note = "R x R~ points along B"
    if a.free_symbols or b.free_symbols:
        a2, b2, dot = measures
        m = s.scalar(sympy.sqrt(a2) * sympy.sqrt(b2))
        versor = s.mv(Multivector({0: m}) + b * a)
        scale2 = s.scalar(2 * m * (m + dot))
        cond = _condition_product((m + dot,), s)
        if m == 1:  # unit vectors (under the side conditions): the normalised form is short
            add(label, s.mv(versor / sympy.sqrt(scale2)), note + "; x and B not opposite", cond)
        else:
            add(label + " (unnormalized)", versor,
                f"|x||B| + B x; divide by sqrt({_text(scale2)}) for the rotor; {note}", cond)
        return
    try:
        r, arbitrary = rotor_between(a, b)
    except AlgebraError as exc:
        add(label, "none", str(exc))
        return
    if arbitrary:
        note += "; x and B are opposite, so this plane is one choice of many"
    add(label, s.mv(r), note, cond)
