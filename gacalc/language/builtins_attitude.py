"""Built-ins of attitude conventions: Euler / Tait-Bryan angles and rotation vectors (the
mathematics is in gacalc.algebra.attitude).

An axis sequence is a word in quotes, "zyx"; the convention an optional last word,
"intrinsic" (the default: about the axes as they move; yaw-pitch-roll is "zyx") or
"extrinsic" (about the fixed axes, in the order written).
"""

from __future__ import annotations

from .builtins import builtin

CONVENTIONS = ("intrinsic", "extrinsic")


def _attitude():
    from gacalc.algebra import attitude

    return attitude


def _sequence(ctx, index: int, convention_index: int | None):
    """The AxisSequence of the word at ``index`` and the optional convention word."""
    from gacalc.algebra import AlgebraError

    word = ctx.word(index, '"zyx"')
    intrinsic = True
    if convention_index is not None:
        convention = ctx.word(convention_index, '"intrinsic" or "extrinsic"')
        if convention.strip().lower() not in CONVENTIONS:
            ctx.fail(f'the convention is "intrinsic" (about the moving axes, the default) or '
                     f'"extrinsic" (about the fixed axes), not "{convention}"',
                     convention_index)
        intrinsic = convention.strip().lower() == "intrinsic"
    try:
        return _attitude().axis_sequence(word, intrinsic)
    except AlgebraError as error:
        ctx.fail(str(error), index)


def _no_words(ctx, first: int, last: int):
    for index in range(first, last):
        if ctx.is_word(index):
            ctx.fail(f'"{ctx.args[index]}" is a word: an angle goes here', index)


def _lock_note(ctx, sequence, result):
    from gacalc.printing.text import scalar_text

    ends = "0 or pi" if sequence.proper else "pi/2 or -pi/2"
    if result.locked is not None:
        ctx.note(f"gimbal lock: the middle angle is at {ends.split(' or ')[0 if result.locked > 0 else 1]}"
                 f", so the first and third axes line up and only one combination of "
                 f"their angles is fixed; the third angle was set to 0")
    elif result.condition is not None:
        ctx.note(f"gimbal lock where {scalar_text(result.condition)} = 1 or -1 (the middle "
                 f"angle at {ends}); there the third angle is taken as 0")


@builtin('euler_angles(R, "zyx", ["intrinsic"])', "angles (a, b, c) of a rotor about the "
         "axes of a sequence such as \"zyx\" (yaw, pitch, roll), intrinsic (the default) or "
         "\"extrinsic\"; gimbal lock is noted (help attitude)", 'euler_angles(rotor(e3, pi/3), "zyx")',
         "attitude", min_args=2, max_args=3, chain=(0, 0, 0), words=True)
def _euler_angles(ctx, r, sequence, convention=None):
    from gacalc.algebra import Multivector
    from gacalc.values.sequence import value_list

    sequence = _sequence(ctx, 1, 2 if convention is not None else None)
    if ctx.is_word(0):
        ctx.fail("the first argument is the rotor; the axis sequence comes second", 0)
    result = _attitude().euler_angles(ctx.multivector(0), sequence, ctx.conditions())
    _lock_note(ctx, sequence, result)
    return value_list(Multivector.scalar(angle) for angle in result.angles)


@builtin('from_euler_angles("zyx", a, b, c, ["intrinsic"])', "rotor of three angles about "
         "the axes of a sequence, intrinsic (the default: R = R1(a) R2(b) R3(c)) or "
         "\"extrinsic\" (R = R3(c) R2(b) R1(a)); the angles may be one list (a, b, c)",
         'from_euler_angles("zyx", pi/2, 0, 0)', "attitude", min_args=2, max_args=5,
         words=True)
def _from_euler_angles(ctx, *args):
    from gacalc.values import kind_of
    from gacalc.values.sequence import LIST

    convention = len(args) - 1 if len(args) in (3, 5) and ctx.is_word(len(args) - 1) else None
    count = len(args) - 1 - (convention is not None)
    sequence = _sequence(ctx, 0, convention)
    if count == 1 and kind_of(args[1]) is LIST:
        angles = args[1]
        if len(angles) != 3:
            ctx.fail(f"expected three angles, not a list of {len(angles)}", 1)
        from gacalc.algebra import Multivector

        values = []
        for item in angles:
            if not (isinstance(item, Multivector) and (item.is_scalar() or item.is_zero())):
                ctx.fail("the angles must be scalars", 1)
            values.append(item.scalar_part())
    elif count == 3:
        _no_words(ctx, 1, 4)
        values = [ctx.scalar(index) for index in (1, 2, 3)]
    else:
        ctx.fail('expected the sequence, then three angles a, b, c (or a list (a, b, c)), '
                 'then optionally "intrinsic" or "extrinsic"')
    return _attitude().from_euler_angles(sequence, values)


@builtin("rotation_vector(R)", "rotation vector theta n of a rotor (|theta| <= pi, right-hand "
         "rule about n); R and -R give the same", "rotation_vector(rotor(e3, pi/2))",
         "attitude", chain=(0, 0, 0))
def _rotation_vector(ctx, r):
    result = _attitude().rotation_vector(ctx.multivector(0), ctx.conditions())
    if result.note:
        ctx.note(result.note)
    return result.vector


@builtin("from_rotation_vector(v)", "rotor of a rotation vector v = theta n: exp(-v I/2) = "
         "rotor(n, theta)", "from_rotation_vector(pi/2 e3)", "attitude", chain=(0, 0, 0))
def _from_rotation_vector(ctx, v):
    return _attitude().from_rotation_vector(ctx.vector(0))
