"""The ``draw`` statement: evaluate its values, check they are numbers, build and render
the scene.

``draw X, ...`` draws a vector as an arrow, a bivector as an oriented disc, a rotor as
the arc it turns a reference vector through; ``rotate(R, x)`` uses x as the reference and
``reflect(x, n)`` draws x, its image and the mirror plane normal to n.  A value of mixed
grades draws its vector and bivector parts (and says what it left out).
"""

from __future__ import annotations

import os

import numpy as np

from gacalc.algebra.conversion import NotNumericError
from gacalc.language import syntax as S
from gacalc.language.errors import GacalcError, GacalcFileError, GacalcTypeError
from gacalc.language.files import os_reason, resolve
from gacalc.values import describe

from .scene import (Arrow, Plane, Scene, arc_of, disc_of, reference_for, rotor_axis_angle,
                    vector_part)

DEFAULT_NAME = "drawing"
_SPECIAL_CALLS = ("rotate", "reflect")


def run_draw(session, statement, state, results, context):
    """The executor of a Draw node (called by StatementExecutors._do_Draw)."""
    from gacalc.language.results import DrawResult

    entries, notes = [], []
    for node in statement.exprs:
        entries.append(_evaluate(session, node, state, results, statement))
    _require_numbers(entries, statement)
    scene = Scene()
    for entry in entries:
        notes.extend(_add(scene, entry))
    if not any(scene.counts().values()):
        raise GacalcTypeError("nothing to draw: scalars and trivectors have no picture "
                              "(draw shows vectors, bivectors and rotors)", statement.span)
    for message, span in notes:
        results.append(session._note(statement, message) if span is None else
                       _note_at(session, message, span))
    path = _target(session, statement, context)
    fmt = "png" if path is not None and path.lower().endswith(".png") else "svg"
    from .render import MissingMatplotlib, figure_of, image_of

    try:
        figure = figure_of(scene, tuple(session.picture_size))
        image = image_of(figure, fmt)
    except MissingMatplotlib as error:
        raise GacalcError(str(error), statement.span) from None
    if path is not None:
        _write(path, image, statement)
    results.append(session._result(DrawResult, statement, scene=scene, figure=figure,
                                   image=image, format=fmt, path=path))


# Evaluation ----------------------------------------------------------------------------
class _Entry:
    def __init__(self, label, value, span, how="value", parts=(), arg_labels=()):
        self.label, self.value, self.span, self.how, self.parts = label, value, span, how, parts
        self.arg_labels = arg_labels
        self.numbers = None            # components as floats, filled by _require_numbers
        self.part_numbers = ()


def _evaluate(session, node, state, results, statement) -> _Entry:
    label = " ".join(node.span.text.split())

    def value_of(expr):
        value = session._evaluate(expr, state, results, statement)
        value, _, _ = session._simplified(value, state)
        if not _is_multivector(value):
            raise GacalcTypeError(f"draw takes multivectors, not {describe(value)}", expr.span)
        return value

    value = value_of(node)
    if isinstance(node, S.Call) and node.name in _SPECIAL_CALLS and len(node.args) == 2:
        parts = tuple(value_of(arg) for arg in node.args)
        arg_labels = tuple(" ".join(arg.span.text.split()) for arg in node.args)
        return _Entry(label, value, node.span, node.name, parts, arg_labels)
    return _Entry(label, value, node.span)


def _is_multivector(value) -> bool:
    from gacalc.algebra import Multivector

    return isinstance(value, Multivector)


def _require_numbers(entries, statement):
    """Every value as floats, or one error naming every symbol still without a number."""
    unset: set[str] = set()
    for entry in entries:
        for value in (entry.value, *entry.parts):
            unset |= {str(s) for s in value.free_symbols}
    if unset:
        names = sorted(unset)
        example = names[0]
        raise GacalcTypeError(
            f"draw needs numbers; no value for {', '.join(names)}", statement.span,
            hint=f"give each a number first, e.g. subs(X, {example}, 1/2)")
    for entry in entries:
        try:
            entry.numbers = entry.value.to_numpy()
            entry.part_numbers = tuple(p.to_numpy() for p in entry.parts)
        except (NotNumericError, ValueError) as error:
            raise GacalcTypeError(f"draw needs real numbers: {error}", entry.span) from None


# Scene items ---------------------------------------------------------------------------
def _add(scene: Scene, entry: _Entry) -> list:
    """Add the entry's items; notes (message, span) about what could not be drawn."""
    c = entry.numbers
    if entry.how == "rotate":
        return _add_rotation(scene, entry)
    if entry.how == "reflect":
        return _add_reflection(scene, entry)
    grades = entry.value.grades()
    if not grades:
        return [(f"{entry.label} is 0: nothing to draw", entry.span)]
    notes = []
    even_rotor = grades <= {0, 2} and 0 in grades and 2 in grades
    if even_rotor:
        turn = rotor_axis_angle(c)
        axis, angle = turn
        reference = reference_for(axis)
        arc = arc_of(reference, axis, angle, entry.label)
        scene.arcs.append(arc)
        scene.arrows.append(Arrow(np.zeros(3), reference, "reference", "reference"))
        scene.arrows.append(Arrow(np.zeros(3), arc.points[-1], "turned", "image"))
        return notes
    if 1 in grades:
        scene.arrows.append(Arrow(np.zeros(3), vector_part(c), entry.label))
    if 2 in grades:
        disc = disc_of(c, entry.label)
        if disc is not None:
            scene.discs.append(disc)
    left_out = [name for grade, name in ((0, "scalar"), (3, "trivector")) if grade in grades]
    if left_out:
        what = " and ".join(left_out)
        if grades <= {0, 3}:
            notes.append((f"{entry.label} has only {what} parts, which draw cannot show",
                          entry.span))
        else:
            parts = "parts are" if len(left_out) > 1 else "part is"
            notes.append((f"the {what} {parts} of {entry.label} not drawn", entry.span))
    return notes


def _add_rotation(scene: Scene, entry: _Entry) -> list:
    rotor, x = entry.part_numbers
    x = vector_part(x)
    image = vector_part(entry.numbers)
    turn = rotor_axis_angle(rotor) if entry.parts[0].grades() <= {0, 2} else None
    scene.arrows.append(Arrow(np.zeros(3), x, _text(entry, 1), "reference"))
    scene.arrows.append(Arrow(np.zeros(3), image, entry.label, "image"))
    if turn is None:
        return [(f"{_text(entry, 0)} is no rotation: only the vectors are drawn", entry.span)]
    axis, angle = turn
    scene.arcs.append(arc_of(x, axis, angle, _text(entry, 0)))
    return []


def _add_reflection(scene: Scene, entry: _Entry) -> list:
    x, n = (vector_part(p) for p in entry.part_numbers)
    length = float(np.linalg.norm(n))
    scene.arrows.append(Arrow(np.zeros(3), x, _text(entry, 0), "reference"))
    scene.arrows.append(Arrow(np.zeros(3), vector_part(entry.numbers), entry.label, "image"))
    if length == 0:
        return [("the normal of the mirror is 0: no plane to draw", entry.span)]
    reach = max(float(np.linalg.norm(x)), 1.0)
    scene.planes.append(Plane(n / length, 0.8 * reach, f"mirror normal to {_text(entry, 1)}"))
    return []


def _text(entry: _Entry, index: int) -> str:
    return entry.arg_labels[index]


# Files ---------------------------------------------------------------------------------
def _target(session, statement, context) -> str | None:
    """Where the picture goes: the ``to`` path, nowhere when the front end shows pictures
    itself (a notebook), else a new drawing-N.svg next to the session's files."""
    if statement.path is not None:
        path = resolve(statement.path, statement, context)
        if not path.lower().endswith((".svg", ".png")):
            raise GacalcFileError("draw writes .svg or .png files", statement.path_span)
        return path
    if session.inline_pictures:
        return None
    folder = session.emit_dir or context.base_dir
    n = 1
    while os.path.exists(os.path.join(folder, f"{DEFAULT_NAME}-{n}.svg")):
        n += 1
    return os.path.abspath(os.path.join(folder, f"{DEFAULT_NAME}-{n}.svg"))


def _write(path: str, image: bytes, statement):
    """Through a temporary file and os.replace: the path holds an old picture or the new
    one, never half of one."""
    import tempfile

    folder = os.path.dirname(path)
    temporary = None
    try:
        descriptor, temporary = tempfile.mkstemp(dir=folder, suffix=".tmp",
                                                 prefix="." + os.path.basename(path) + ".")
        with os.fdopen(descriptor, "wb") as stream:
            stream.write(image)
        os.chmod(temporary, 0o644)
        os.replace(temporary, path)
    except OSError as error:
        if temporary is not None and os.path.exists(temporary):
            os.unlink(temporary)
        raise GacalcFileError(f"cannot write {path}: {os_reason(error)}",
                              statement.path_span or statement.span) from None


def _note_at(session, message, span):
    from gacalc.language.results import NoteResult

    return NoteResult(message=message, span=span, unicode=session.unicode,
                      width=session.width)
