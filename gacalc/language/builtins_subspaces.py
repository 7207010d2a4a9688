"""Built-ins for subspaces, frames and linear maps (the mathematics is in
gacalc.algebra.subspaces and gacalc.algebra.outermorphism).

Where a result holds only where some expression is nonzero (a symbolic frame that might
be flat, a plane that might vanish) the call adds a note "... is valid where X != 0", as
the inverse does; where the expression is certainly zero the call is an error that says so.
"""

from __future__ import annotations

from .builtins import builtin


def _subspaces():
    from gacalc.algebra import subspaces

    return subspaces


def _linear_map():
    from gacalc.algebra.outermorphism import LinearMap

    return LinearMap


def _kinds():
    from gacalc.values import kind_of
    from gacalc.values.linmap import LINMAP
    from gacalc.values.matrix import MATRIX

    return kind_of, LINMAP, MATRIX


def _note_conditions(ctx, what: str, conditions):
    from gacalc.printing.text import scalar_text

    for condition in conditions:
        ctx.note(f"{what} is valid where {scalar_text(condition)} != 0")


def _as_list(ctx, values):
    from gacalc.values.sequence import value_list

    return value_list(values)


def _linear_map_argument(ctx, index: int):
    kind_of, LINMAP, _ = _kinds()
    value = ctx.args[index]
    if kind_of(value) is not LINMAP:
        from gacalc.values import describe

        ctx.fail(f"expected a linear map (from linmap(...)), not {describe(value)}", index)
    return value


# Subspaces --------------------------------------------------------------------------
@builtin("is_blade(A)", "1 when A is a blade (a single grade, or 0), else 0",
         "is_blade(e1 /\\ (e2 + e3))", "subspaces")
def _is_blade(ctx, a):
    from gacalc.algebra import Multivector

    value = ctx.multivector(0)
    answer, undecided = _subspaces().is_blade(value, ctx.conditions())
    if undecided and not answer:
        grades = ", ".join(str(k) for k in undecided)
        ctx.note(f"is_blade took the parts of grades {grades} as nonzero (it could not "
                 "decide whether they vanish)")
    elif not answer and value.free_symbols:
        ctx.note("is_blade answers for general values of the symbols (special values "
                 "can make all but one grade vanish)")
    return Multivector.scalar(1 if answer else 0)


@builtin("join(A, B)", "smallest subspace containing the blades A and B: A /\\ B, the "
         "containing blade, or I for two different planes", "join(e1, e2)", "subspaces",
         chain=(0, 1, 1, 1))
def _join(ctx, a, b):
    result, conditions = _subspaces().join(ctx.multivector(0), ctx.multivector(1),
                                           ctx.conditions())
    _note_conditions(ctx, "the join", conditions)
    return result


@builtin("meet(A, B)", "common subspace of the blades A and B: (B _| J^-1) _| A with "
         "J = join(A, B); two planes meet in their line", "meet(e12, e23)", "subspaces",
         chain=(0, 1, 1, 1, 0))
def _meet(ctx, a, b):
    result, conditions = _subspaces().meet(ctx.multivector(0), ctx.multivector(1),
                                           ctx.conditions())
    _note_conditions(ctx, "the meet", conditions)
    return result


@builtin("factor(B)", "orthogonal vectors whose outer product is the blade B, as a list",
         "factor(e12 + e23)", "subspaces",
         chain=(0, 0, 0))
def _factor(ctx, b):
    vectors, conditions = _subspaces().factor(ctx.multivector(0), ctx.conditions())
    _note_conditions(ctx, "the factorisation", conditions)
    return _as_list(ctx, vectors)


# Frames -----------------------------------------------------------------------------
@builtin("reciprocal(a, b, c)", "reciprocal frame a^i . a_j = delta: (b /\\ c) I^-1 / "
         "((a /\\ b /\\ c) I^-1) and cyclically, as a list F (F[1], F[2], F[3])",
         "reciprocal(e1, e1 + e2, e3)", "frames",
         chain=(0, 1, 2))
def _reciprocal(ctx, a, b, c):
    frame, conditions = _subspaces().reciprocal(ctx.vector(0), ctx.vector(1), ctx.vector(2),
                                                ctx.conditions())
    _note_conditions(ctx, "the reciprocal frame", conditions)
    return _as_list(ctx, frame)


@builtin("frame_matrix(a, b, c)", "3x3 matrix with columns a, b, c (it maps e1, e2, e3 "
         "to the frame)", "frame_matrix(e1, e1 + e2, e3)", "frames")
def _frame_matrix(ctx, a, b, c):
    return _subspaces().frame_matrix(ctx.vector(0), ctx.vector(1), ctx.vector(2))


# Linear maps ------------------------------------------------------------------------
@builtin("linmap(M)", "linear map of a 3x3 matrix (on column vectors), of nine entries "
         "row by row, or of the images of e1, e2, e3; f(X) applies its outermorphism",
         "linmap(2, 1, 0, 0, 3, 1, 1, 0, 4)(e1 /\\ e2)", "linear maps",
         min_args=1, max_args=9)
def _linmap(ctx, *args):
    LinearMap = _linear_map()
    if len(args) == 3:
        return LinearMap.from_images([ctx.vector(i) for i in range(3)])
    if len(args) not in (1, 9):
        ctx.fail("expected a 3x3 matrix value, the images of e1, e2, e3, or nine entries "
                 "row by row")
    return LinearMap(ctx.matrix_argument(args, 3, 3, "linmap"))


@builtin("det(f)", "determinant of a linear map (f(I) = det(f) I) or of a square matrix",
         "det(linmap(2, 1, 0, 0, 3, 1, 1, 0, 4))", "linear maps")
def _det(ctx, f):
    from gacalc.algebra import Multivector

    kind_of, LINMAP, MATRIX = _kinds()
    value = ctx.args[0]
    if kind_of(value) is MATRIX and value.rows == value.cols:
        return Multivector.scalar(value.det())
    return Multivector.scalar(_linear_map_argument(ctx, 0).det())


@builtin("adjoint(f)", "adjoint of a linear map: adjoint(f)(a) . b = a . f(b) (the "
         "transposed matrix)", "adjoint(linmap(1, 2, 0, 0, 1, 0, 0, 0, 1))", "linear maps")
def _adjoint(ctx, f):
    return _linear_map_argument(ctx, 0).adjoint()
