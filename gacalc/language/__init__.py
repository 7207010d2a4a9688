"""The gacalc language: token table, scanner, parser, evaluator and sessions.

Importing this package is cheap (the token table and scanner need no sympy); the
evaluator and Session are loaded on first use::

    from gacalc.language import Session
    results = Session().run("vector a, b\\ncheck a b == a . b + a /\\\\ b")
"""

from __future__ import annotations

from .errors import GacalcError, Source, Span

_LAZY = {
    "Session": "session", "Result": "results", "ValueResult": "results",
    "CheckResult": "results", "NoteResult": "results", "ShowResult": "results",
    "EmitResult": "results", "HelpResult": "results", "DeclarationResult": "results",
    "FileResult": "results", "DrawResult": "results", "reading": "parser",
    "parse": "parser", "read_expression": "parser", "iter_statements": "parser",
    "tokenize": "scanner", "scan": "scanner", "needs_more_input": "scanner",
    "token_patterns": "tokens", "PYGMENTS_TOKEN_TYPES": "tokens",
    "BUILTINS": "builtins",
}

__all__ = ["GacalcError", "Source", "Span", *_LAZY]


def __getattr__(name):
    module_name = _LAZY.get(name)
    if module_name is None:
        raise AttributeError(f"module 'gacalc.language' has no attribute {name!r}")
    import importlib

    module = importlib.import_module(f".{module_name}", __name__)
    return getattr(module, name)
