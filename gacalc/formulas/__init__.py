"""Results as coordinate-free formulas over the declared vectors.

``recognize(value, variables, conditions)`` looks for an expression of a multivector in
dot products, cross products, wedges and I of the declared vectors (and of the duals of
declared bivectors), with coefficients in the remaining scalars, and proves it equal by
expanding it back.  The method is the first fundamental theorem of invariant theory for
the rotation group (Weyl, The Classical Groups): every SO(3)-equivariant polynomial in
vectors is a combination of products of dot products times a vector, a cross product, a
wedge or I, with the triple product for the pseudoscalar parts.

Modules: ``variables`` (what a declared name contributes), ``terms`` (the formula as data:
text, LaTeX, evaluation back to a multivector), ``basis`` (the candidate basis of one grade
and degree), ``engine`` (the exact linear solve, side conditions, verification, budget).
The algebra core never imports this package.
"""

from .engine import Outcome, recognize, RECOGNITION_SECONDS
from .terms import Formula, Term
from .variables import Variable, variables_of

__all__ = ["recognize", "Outcome", "Formula", "Term", "Variable", "variables_of",
           "RECOGNITION_SECONDS"]
