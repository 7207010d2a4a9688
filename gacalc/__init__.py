"""gacalc: a symbolic calculator for the geometric algebra of 3-D Euclidean space, Cl(3,0)."""

__version__ = "0.1.0"
