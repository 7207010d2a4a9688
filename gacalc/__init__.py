"""gacalc: a symbolic calculator for the geometric algebra of 3-D Euclidean space, Cl(3,0).

The public Python API (stable; everything else is internal)::

    from gacalc import Session, Multivector, parse_value, e1, e2, e3, I
    s = Session()
    R = s.evaluate("rotor(e12, pi/2)")         # values are Multivectors
    x = R * e1 * ~R                        # * geometric product, ~ reverse
    s["x"] = x                             # back into the session

Session, GacalcError, parse_value, session, draw, Multivector, blade, vector, bivector,
the basis blades e1 e2 e3 e23 e31 e12, I (= e123) and ONE.  In IPython:
``%load_ext gacalc`` gives the ``%gac`` and ``%%gac`` magics.

Importing gacalc is cheap: each name loads its module (and sympy) on first use.
"""

__version__ = "0.1.0"

_LAZY = {
    "Session": "gacalc.api", "parse_value": "gacalc.api", "session": "gacalc.api",
    "draw": "gacalc.api",
    "GacalcError": "gacalc.language.errors",
    "Multivector": "gacalc.algebra", "blade": "gacalc.algebra", "vector": "gacalc.algebra",
    "bivector": "gacalc.algebra", "e1": "gacalc.algebra", "e2": "gacalc.algebra",
    "e3": "gacalc.algebra", "e23": "gacalc.algebra", "e31": "gacalc.algebra",
    "e12": "gacalc.algebra", "I": "gacalc.algebra", "ONE": "gacalc.algebra",
}

__all__ = ["__version__", "load_ipython_extension", *_LAZY]


def __getattr__(name):
    module_name = _LAZY.get(name)
    if module_name is None:
        raise AttributeError(f"module 'gacalc' has no attribute {name!r}")
    import importlib

    if module_name == "gacalc.algebra":
        importlib.import_module("gacalc.simplify")   # == and inverses use the simplifier
    value = getattr(importlib.import_module(module_name), name)
    globals()[name] = value           # later look-ups skip this function
    return value


def __dir__():
    return sorted(__all__)


def load_ipython_extension(ipython):
    """``%load_ext gacalc``: the %gac line magic and %%gac cell magic (gacalc.ipython)."""
    from gacalc.ipython import load_ipython_extension as load

    load(ipython)
