"""Long scalars that repeat across a report are named once: ``D = ...`` then ``D``.

The same polynomial typically stands in the inverse's denominator, in its condition and
under the norm's square root.  The text renderer asks ``name_repeats`` for the names:
every parenthesised group (or condition) of at least MIN_CHARS characters that occurs in
two or more items gets a name (D, then D1, D2, ... avoiding every name the report uses),
and the items refer to it.  The definition line ``D = ...`` is valid input, so a report
pasted back still reads: D is assigned before it is used.
"""

from __future__ import annotations

import re

MIN_CHARS = 30


def _groups(text: str):
    """The contents of balanced parenthesised groups in one line of text."""
    stack = []
    for index, char in enumerate(text):
        if char == "(":
            stack.append(index)
        elif char == ")" and stack:
            start = stack.pop()
            group = text[start + 1:index]
            if not _has_top_level_comma(group):    # f(x, y)'s arguments are no scalar
                yield group


def _has_top_level_comma(text: str) -> bool:
    depth = 0
    for char in text:
        if char in "([":
            depth += 1
        elif char in ")]":
            depth -= 1
        elif char == "," and depth == 0:
            return True
    return False


def name_repeats(texts: list[str]) -> list[tuple[str, str]]:
    """[(name, scalar text)] for the long groups found twice or more in ``texts`` (an
    inverse's denominator and its condition count as two)."""
    seen: dict[str, list] = {}
    for position, text in enumerate(texts):
        for line in text.split("\n"):
            for group in _groups(line):
                if len(group) >= MIN_CHARS and not group.lstrip().startswith("#"):
                    seen.setdefault(group, []).append(position)
    repeated = [g for g, where in seen.items() if len(where) >= 2]
    repeated.sort(key=len, reverse=True)
    chosen = []
    for group in repeated:           # a group inside a longer named one is left alone
        if not any(group in longer for longer in chosen):
            chosen.append(group)
    taken = set(re.findall(r"[A-Za-z_][A-Za-z0-9_]*", "\n".join(texts)))
    names, counter = [], 0
    for group in chosen:
        while True:
            name = "D" if counter == 0 else f"D{counter}"
            counter += 1
            if name not in taken:
                break
        names.append((name, group))
    return names


def use_names(text: str, names) -> str:
    """``text`` with each named group replaced by its name (a call keeps its brackets)."""
    for name, group in names:
        body = re.escape(group)
        text = re.sub(r"(?<=[\w])\(" + body + r"\)", f"({name})", text)
        text = re.sub(r"\(" + body + r"\)", name, text)
        text = re.sub(r"(?<=where )" + body + r"(?= (!=|\u2260) 0)", name, text)
    return text
