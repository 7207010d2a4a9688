"""The basis of Cl(3,0) and the sign rules of its products.

Basis order and orientation are fixed by the project's conventions:
1; e1, e2, e3; e23, e31, e12; e123.  Every product sign is computed here from
the permutation that sorts the concatenated index strings, never typed in.
"""

from __future__ import annotations

from functools import lru_cache

# Each basis element as the ordered tuple of vector indices it is the product of.
BASIS_INDICES: tuple[tuple[int, ...], ...] = (
    (), (1,), (2,), (3,), (2, 3), (3, 1), (1, 2), (1, 2, 3),
)
BASIS_NAMES: tuple[str, ...] = tuple(
    "1" if not ix else "e" + "".join(map(str, ix)) for ix in BASIS_INDICES
)
BASIS_GRADES: tuple[int, ...] = tuple(len(ix) for ix in BASIS_INDICES)
PSEUDOSCALAR = 7


def reduce_indices(indices) -> tuple[int, tuple[int, ...]]:
    """Sort a word of vector indices into ascending order, cancelling e_i e_i = +1.

    Returns (sign, sorted distinct indices).  The sign is (-1)^(number of swaps),
    found by bubble sort so it comes from the permutation itself.
    """
    word = list(indices)
    sign = 1
    changed = True
    while changed:
        changed = False
        i = 0
        while i < len(word) - 1:
            if word[i] > word[i + 1]:
                word[i], word[i + 1] = word[i + 1], word[i]
                sign = -sign
                changed = True
            elif word[i] == word[i + 1]:
                del word[i:i + 2]  # e_i e_i = +1 in Cl(3,0)
                changed = True
                continue
            i += 1
    return sign, tuple(word)


# sorted index tuple -> (basis position, orientation sign of that basis element)
_SORTED_TO_BASIS: dict[tuple[int, ...], tuple[int, int]] = {}
for _pos, _ix in enumerate(BASIS_INDICES):
    _s, _sorted = reduce_indices(_ix)
    _SORTED_TO_BASIS[_sorted] = (_pos, _s)


def basis_of_word(indices) -> tuple[int, int]:
    """(sign, basis position) of the product e_i e_j ... of the given vector indices."""
    sign, word = reduce_indices(indices)
    if any(i not in (1, 2, 3) for i in word):
        raise ValueError("basis indices must be 1, 2 or 3")
    pos, orient = _SORTED_TO_BASIS[word]
    return sign * orient, pos


@lru_cache(maxsize=None)
def _product_table() -> tuple[tuple[tuple[int, int], ...], ...]:
    return tuple(
        tuple(basis_of_word(BASIS_INDICES[i] + BASIS_INDICES[j]) for j in range(8))
        for i in range(8)
    )


PRODUCT_TABLE = _product_table()  # PRODUCT_TABLE[i][j] = (sign, k): e_i e_j = sign e_k


def name_to_index(name: str) -> int:
    return BASIS_NAMES.index(name)
