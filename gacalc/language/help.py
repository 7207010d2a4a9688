"""Help on statements and topics (``help``, ``help NAME``), and the overview.

Functions document themselves in their registration (gacalc.language.builtins) and
export targets in theirs (gacalc.export.targets); this module holds the rest and puts
the pieces together.
"""

from __future__ import annotations

import re
import textwrap

from gacalc.export import targets as export_targets

from .builtins import BUILTINS

_OPERATORS_HELP = """\
operators, loosest to tightest:
  A + B   A - B                 sum, difference
  A * B   A B   A / B           geometric product (also side by side), A B^-1
  A /\\ B  A _| B  A |_ B  A . B outer product, left and right contraction,
                                inner product (Unicode: ∧ ⌋ ⌊ ·); one level,
                                tighter than the geometric product; mixing two
                                of them needs parentheses
  -A                            negation
  A~  A^k  A^-1  A²             reverse (also †), integer power, inverse
  <A>k  <A>                     grade-k part, scalar part
  f(x, y)  ( ... )              call, grouping
  example: a . b c is (a . b) c"""

def _emit_help() -> tuple[str, str]:
    """The emit topic, from the export-target table (a new target appears by itself)."""
    targets = export_targets.TARGETS
    # every target of the table, a late-registered one without a help line too
    lines = [t.help or f"emit {t.name} EXPR" for t in targets.values()]
    lines.append("emit TARGET components EXPR   the components, even when a formula is found")
    lines.append("  example: vector a, b; emit python a /\\ b as wedge")
    return (f"code for a value: emit {'|'.join(targets)} EXPR [as NAME] [to \"file\"]",
            "\n".join(lines))


HELP_TOPICS: dict[str, tuple[str, str]] = {
    "check": ("check an identity: check L == R [as rotation] [given C = D, ...]",
              "check L == R [given C = D, ...]\n"
              "  reports held, FAILED (with the simplified L - R, and its value at a point\n"
              "  where the sides differ when one is found) or undecided (saying why: the\n"
              "  time budget ran out, or what the method could not decide)\n"
              "  example: vector a, b; check a b == a . b + a /\\ b\n"
              "check L == R as rotation [given C = D, ...]\n"
              "  rotors L and R are the same rotation: L R~ is 1 or -1 (R and -R turn\n"
              "  every vector alike); says which sign it found; unit quaternions are\n"
              "  compared through their rotors (q and -q); refuses other values\n"
              "  example: check rotor(e12, t + 2 pi) == rotor(e12, t) as rotation"),
    "given": ("side conditions of one check", "check L == R given C = D, E = F\n"
              "  example: vector a, b; check (a + b)^2 == a^2 + b^2 given a . b = 0"),
    "assume": ("session-wide side conditions: assume C = D, ... / assume none",
               "assume C = D, ...   adds conditions used by every later simplification\n"
               "assume none         drops them (declaration conditions stay)\n"
               "assume              lists the active conditions\n"
               "  example: vector a, b; assume a . b = 0"),
    "show": ("derived forms of a value: show EXPR [against B], show latex EXPR",
             "show EXPR            the value's grades, norms and what it is (rotor, "
             "blade, ...)\n"
             "show EXPR against B  the same, relative to B\n"
             "show latex EXPR      the report in LaTeX\n"
             "  example: show rotor(e12, pi/3)"),
    "formula": ("a value as a formula in the declared vectors: formula EXPR",
                "formula EXPR   the value written with dot products, cross products and\n"
                "               wedges of the declared vectors, proved equal by expanding it\n"
                "               back (valid input); otherwise one line says why, and the\n"
                "               components follow\n"
                "formula auto   print every result as a formula when one is found\n"
                "formula off    print components again (F3 in the REPL switches)\n"
                "  example: vector a, b, c; formula a _| (b /\\ c)"),
    "budget": ("the time each statement may take: budget SECONDS / budget none / budget",
               "budget SECONDS   each later statement is abandoned after this many seconds\n"
               "                 of wall-clock time (the session stays as it was)\n"
               "budget none      no time limit (Ctrl-C still stops a statement)\n"
               "budget           prints the budget in force\n"
               "  the default is 10 s in the interactive calculator and 30 s for scripts\n"
               "  (--statement-budget SECONDS sets it at start)\n"
               "  example: budget 5"),
    "against": ("compare a shown value with another: show EXPR against B",
                "  example: show e1 + e2 against e12"),
    "as": ("the function name of emitted code", "  example: emit c a b as product"),
    "to": ("the file emitted code is written to", "  example: emit c a b to \"ab.c\""),
    "use": ("run the statements of a file: use \"file.gac\"",
            "use \"file.gac\"  paths are relative to the file that uses them\n"
            "  example: use \"mirrors.gac\""),
    "save": ("save the session as a script: save \"file.gac\" [force]",
             "save \"file.gac\"        writes a script that re-creates names, functions,\n"
             "                       declarations and conditions; it overwrites only a\n"
             "                       file saved by gacalc\n"
             "save \"file.gac\" force  overwrites any file\n"
             "  example: save \"session.gac\""),
    "draw": ("a picture of numeric values: draw X, ... [to \"file.svg\"|\"file.png\"]",
             "draw X, ...            vectors as arrows, bivectors as oriented discs (area\n"
             "                       |B|, arrow u -> v for B along u /\\ v), rotors as the arc\n"
             "                       they turn a reference vector through\n"
             "draw rotate(R, x)      x, its image and the arc between them\n"
             "draw reflect(x, n)     x, its image and the mirror plane normal to n\n"
             "draw ... to \"f.svg\"    writes the picture (.svg or .png); without 'to' a\n"
             "                       notebook shows it and a terminal writes drawing-N.svg\n"
             "values need numbers: subs(X, t, 1/2) gives a symbol one (needs matplotlib:\n"
             "pip install 'gacalc[draw]')\n"
             "  example: draw reflect(e1 + e2, e1), rotor(e12, pi/3)"),
    "help": ("help, help NAME", "help        this overview\nhelp NAME   one function, "
             "statement or topic (operators, names)\n  example: help rotor"),
    "scalar": ("declare real scalar symbols: scalar t, u", "  example: scalar theta"),
    "vector": ("declare symbolic vectors: vector a, b [unit]",
               "vector a     a = a1*e1 + a2*e2 + a3*e3\n"
               "vector n unit  adds the condition n1^2 + n2^2 + n3^2 = 1\n"
               "vector r(t)  components r1(t), r2(t), r3(t), functions of t (help calculus)\n"
               "  example: vector n unit"),
    "bivector": ("declare symbolic bivectors: bivector B [unit]",
                 "bivector B   B = B23*e23 + B31*e31 + B12*e12\n  example: bivector B unit"),
    "multivector": ("declare general multivectors: multivector M",
                    "multivector M   components M0 M1 M2 M3 M23 M31 M12 M123\n"
                    "  example: multivector M"),
    "calculus": ("derivatives: diff, nabla, div, curl, ddir, jacobian, angular_velocity, "
                 "series",
                 "diff(X, t) [diff(X, t, k)]  derivative in a scalar symbol t\n"
                 "vector r(t)   components r1(t), r2(t), r3(t): functions of t (also scalar\n"
                 "              u(t), rotor R(t)); diff(r1(t), t) is the derivative of r1\n"
                 "nabla(F, x)   vector derivative sum e_i dF/dx_i for a declared vector x\n"
                 "              (div(F, x), curl(F, x) Gibbs vector, ddir(F, x, u) = (u . nabla) F)\n"
                 "jacobian(F, v)  dF_i/dv_j for a declared vector v or a list (s1, s2, ...)\n"
                 "angular_velocity(R, t)  Omega with dR/dt = -1/2 Omega R (space frame);\n"
                 "              angular_velocity_vector(R, t) is w with Omega = w I, and\n"
                 "              d/dt (R x R~) = cross(w, R x R~)\n"
                 "series(X, s, s0, n)  Taylor polynomial through (s - s0)^n\n"
                 "  example: scalar w, t; angular_velocity(rotor(e12, w t), t)"),
    "attitude": ("Euler / Tait-Bryan angles and rotation vectors: euler_angles, "
                 "from_euler_angles, rotation_vector, from_rotation_vector",
                 "euler_angles(R, \"zyx\")   the angles (a, b, c) of a rotor, a list; angles in\n"
                 "              radians, rotations active (R x R~), rotor(e3, t) = exp(-e12 t/2)\n"
                 "sequences: \"xyz\" ... (six Tait-Bryan) and \"zxz\" ... (six proper Euler)\n"
                 "\"intrinsic\" (the default) turns about the moving axes, R = R1(a) R2(b) R3(c);\n"
                 "\"extrinsic\" about the fixed axes in the order written, R = R3(c) R2(b) R1(a)\n"
                 "yaw-pitch-roll is \"zyx\" intrinsic; ranges: a, c in (-pi, pi], b in\n"
                 "              [-pi/2, pi/2] (Tait-Bryan) or [0, pi] (proper Euler)\n"
                 "gimbal lock (b at +-pi/2, or 0, pi): a note; the third angle is set to 0\n"
                 "from_euler_angles(\"zyx\", a, b, c [, \"extrinsic\"])   the rotor (or a list (a, b, c))\n"
                 "rotation_vector(R)   theta n with |theta| <= pi; from_rotation_vector(v) = exp(-v I/2)\n"
                 "  example: euler_angles(from_euler_angles(\"zyx\", pi/3, pi/4, pi/6), \"zyx\")"),
    "matrix3": ("declare symbolic 3x3 matrices: matrix3 M",
                "matrix3 M   entries M11 M12 M13 M21 ... M33 (row, column); linmap(M) is\n"
                "            the linear map with that matrix\n"
                "  example: matrix3 M"),
    "unit": ("after a declaration: the declared values have norm 1",
             "  example: vector n unit"),
    "operators": ("operators and their precedence", _OPERATORS_HELP),
    "I": ("the pseudoscalar I = e123",
          "I is e123, the unit pseudoscalar: I^2 = -1, and it commutes with everything.\n"
          "dual(A) = A I^-1. In pauli(...) it is i times the identity; in matrix entries\n"
          "the complex unit is written i (so the two never look alike).\n"
          "  example: I I"),
    "i": ("the complex unit of matrix entries",
          "i is the complex unit in matrix literals: [i, 1; 1, -i] is pauli(e1 + e12).\n"
          "Outside [ ] it is an ordinary name; the pseudoscalar is I (help I).\n"
          "  example: from_pauli([i, 1; 1, -i])"),
    "pi": ("the number pi", "pi is exact (numeric(pi) gives digits)\n  example: cos(pi/3)"),
    "ans": ("the last result", "ans is the value of the last expression or assignment\n"
            "  example: e1 + e2; ans ans"),
    "quit": ("leave the interactive calculator: quit, exit or Ctrl-D",
             "quit (or exit, or Ctrl-D) leaves the interactive calculator; the input history\n"
             "is kept for the next session. In a script, and once you assign it, quit is an\n"
             "ordinary name.\n"
             "  example: quit"),
    "in": ("the range of a declared scalar: scalar a in (low, high)",
           "scalar a in (0, pi)    declares a with 0 < a < pi; [ ] ends are closed\n"
           "  example: scalar a in (0, pi)"),
    "none": ("drop the assumptions: assume none", "  example: assume none"),
    "force": ("overwrite any file: save \"file.gac\" force",
              "  example: save \"session.gac\" force"),
    "auto": ("print results as formulas: formula auto", "  example: formula auto"),
    "off": ("print components again: formula off", "  example: formula off"),
    "components": ("emit the components: emit TARGET components EXPR",
                   "  example: vector a, b; emit c components a /\\ b"),
    "names": ("names, numbers and symbols",
              "names: a letter, then letters, digits and inner underscores (Greek letters\n"
              "allowed: θ is theta). A name never assigned is a real scalar symbol.\n"
              "Numbers are exact: 0.5 is 1/2; 2e1 is 2 times e1. Blades: e1, e2, e3, e12,\n"
              "e123 (any index order: e21 = -e12); I is e123; pi; ans is the last result.\n"
              "  example: x = 0.5 e1 + 2e2"),
}
_DECLARATION_HELP_ROTOR = ("declare a symbolic unit rotor: rotor R",
                           "rotor R   R = R0 + R23*e23 + R31*e31 + R12*e12 with "
                           "R0^2 + R23^2 + R31^2 + R12^2 = 1\n  example: rotor R")
_OPERATOR_WORDS = {"/\\", "∧", "_|", "⌋", "|_", "⌊", ".", "·", "⋅", "~", "†", "^", "<",
                   ">", "*", "+", "-", "/", "==", "="}


_ALIASES = {"exit": "quit"}


def topic_entry(topic: str) -> tuple[str, str] | None:
    """(one-line summary, text) of a statement or topic, or None."""
    if topic == "emit":
        return _emit_help()
    target = export_targets.target(topic)
    if target is not None:              # help latex, help numpy: that target's line
        return (f"an emit target: emit {topic} EXPR",
                f"{target.help or f'emit {topic} EXPR'}\n  more: help emit")
    if re.fullmatch(r"e[1-3]+", topic):    # a basis blade: how blades are named
        return HELP_TOPICS["names"]
    return HELP_TOPICS.get(_ALIASES.get(topic, topic))


def help_text(topic: str | None, functions: dict | None = None) -> str | None:
    """The help text of a topic (None: the overview), or None when there is none."""
    functions = functions or {}
    if topic is None:
        return _overview()
    if topic in _OPERATOR_WORDS:
        topic = "operators"
    lines = []
    if topic in BUILTINS:
        function = BUILTINS[topic]
        lines.append(f"{function.signature}  {function.help}\n  example: {function.example}")
    if topic in functions:
        lines.append(f"{functions[topic].text}  (your function)")
    if topic == "rotor":
        lines.append(_DECLARATION_HELP_ROTOR[1])
    elif topic_entry(topic) is not None:
        lines.append(topic_entry(topic)[1])
    return "\n".join(lines) if lines else None


def _overview() -> str:
    categories: dict[str, list[str]] = {}
    for name in sorted(BUILTINS):
        categories.setdefault(BUILTINS[name].category, []).append(name)
    lines = ["statements:",
             "  EXPR   NAME = EXPR   f(x, y) = EXPR   (a trailing ';' hides the result)",
             "  scalar | vector | bivector | rotor | multivector | matrix3 NAME[(t)], ... [unit]",
             "  check L == R [as rotation] [given C = D, ...]",
             "  assume C = D, ... | assume none",
             "  show [latex] EXPR [against B]      formula EXPR | formula auto | off",
             "  emit "
             f"{'|'.join(export_targets.TARGETS)} EXPR [as NAME] [to \"file\"]",
             "  use \"file\"   save \"file\" [force]   help [NAME]   budget [SECONDS | none]",
             "  draw X, ... [to \"file.svg\"]",
             "functions:"]
    for category, names in categories.items():
        lines.append(f"  {category + ':':17}{', '.join(names)}")
    lines.append("more: help operators, help names, help calculus, help NAME")
    return "\n".join(lines)


# "name    description" or "topic: text": where the description starts
_COLUMN = re.compile(r"^(\s*\S.*?\s{2,})\S|^(\s*\S+:\s+)\S")


def wrapped(text: str, width: int) -> str:
    """Help text with lines longer than ``width`` broken at word boundaries (textwrap);
    a continuation lines up under the description column of a "NAME   text" line, or
    under the line's own indentation."""
    out = []
    for line in text.split("\n"):
        if len(line) <= width:
            out.append(line)
            continue
        column = _COLUMN.match(line)
        indent = len(column.group(1) or column.group(2)) if column \
            else len(line) - len(line.lstrip())
        if indent > width // 2:
            indent = len(line) - len(line.lstrip()) + 2
        out.extend(textwrap.wrap(line, width, subsequent_indent=" " * indent,
                                 break_long_words=False, break_on_hyphens=False))
    return "\n".join(out)
