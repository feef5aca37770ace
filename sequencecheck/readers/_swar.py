"""Eight ASCII digits at a time: SWAR (SIMD within a register) on numpy uint64 arrays.

Each 64-bit word holds eight bytes of text, first character in the lowest byte
(little-endian). Three multiply-add-mask steps turn eight digits into their value
(pairs, then quadruples, then all eight); two nibble tests flag any byte that is
not a digit. Used by the CSV and VCD fast paths for time stamps.
"""

from __future__ import annotations

import numpy as np

__all__ = ["eight_digits"]

_ZEROS_INT = 0x3030303030303030  # "00000000"
_ZEROS = np.uint64(_ZEROS_INT)
_HI = np.uint64(0xF0F0F0F0F0F0F0F0)
_SIX = np.uint64(0x0606060606060606)
_M8, _M16, _M32 = (np.uint64(m) for m in (0x00FF00FF00FF00FF, 0x0000FFFF0000FFFF, 0xFFFFFFFF))
_ALL = 0xFFFFFFFFFFFFFFFF


def eight_digits(word: np.ndarray, keep: int = 8) -> tuple[np.ndarray, np.ndarray]:
    """Values of the last ``keep`` (1-8) characters of each word, and where they are not digits.

    ``word`` is a uint64 array the caller owns: it is overwritten. Bytes before the
    last ``keep`` count as '0'.

    >>> eight_digits(np.frombuffer(b"12345678", dtype="<u8").copy())[0].tolist()
    [12345678]
    >>> v, bad = eight_digits(np.frombuffer(b"xxxxxx42xxxxxx4x", dtype="<u8").copy(), keep=2)
    >>> int(v[0]), bad.tolist()
    (42, [False, True])
    """
    junk = (1 << (8 * (8 - keep))) - 1  # the low bytes come first in the text
    if junk:
        word &= np.uint64(~junk & _ALL)
        word |= np.uint64(_ZEROS_INT & junk)
    nib = word & _HI
    bad = nib != _ZEROS  # high nibble of a digit is 3
    np.add(word, _SIX, out=nib)
    nib &= _HI
    bad |= nib != _ZEROS  # ... and its low nibble at most 9
    word -= _ZEROS
    np.right_shift(word, np.uint64(8), out=nib)
    word *= np.uint64(10)
    word += nib
    word &= _M8
    np.right_shift(word, np.uint64(16), out=nib)
    word *= np.uint64(100)
    word += nib
    word &= _M16
    np.right_shift(word, np.uint64(32), out=nib)
    word *= np.uint64(10000)
    word += nib
    word &= _M32
    return word, bad
