"""Printers of gacalc values as text (LaTeX, Python and C live in gacalc.export)."""

from .text import (describe_value, matrix_text, multivector_text, quaternion_text,
                   scalar_text, unicode_text, value_text)

__all__ = ["describe_value", "matrix_text", "multivector_text", "quaternion_text",
           "scalar_text", "unicode_text", "value_text"]
