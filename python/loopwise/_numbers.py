"""Numbers across the boundary: Python numbers written as the decimal text
the library reads, and the library's decimal text read back as mpmath
numbers (when mpmath is importable) at a precision that keeps every digit.
"""

from __future__ import annotations

import decimal
import numbers
from typing import Any, Optional, Union

from ._native import InputError

try:
    import mpmath as _mpmath  # type: ignore[import-untyped]
except ImportError:  # mpmath is optional: without it values stay decimal text
    _mpmath = None

#: Arguments larger than this cannot be a loop count, digits or a weight;
#: they are refused here before they overflow the native 64-bit integer.
_LARGEST_WHOLE = 2**62


def have_mpmath() -> bool:
    """Whether mpmath is importable (values then come back as ``mpmath.mpf``)."""
    return _mpmath is not None


def whole(name: str, value: Any) -> int:
    """``value`` as a Python int, or :class:`InputError` naming the argument."""
    if isinstance(value, bool) or not isinstance(value, numbers.Integral):
        raise InputError(f"{name} must be a whole number, got {value!r}")
    v = int(value)
    if abs(v) > _LARGEST_WHOLE:
        raise InputError(f"{name}={v} is out of range")
    return v


def optional_whole(name: str, value: Any) -> Optional[int]:
    """Like :func:`whole`, with ``None`` passed through."""
    return None if value is None else whole(name, value)


def _terminating(q: Any, name: str) -> str:
    """An exact decimal for a fraction whose denominator has only the prime
    factors 2 and 5; any other fraction would need rounding, which is refused."""
    num, den = int(q.numerator), int(q.denominator)
    twos = fives = 0
    rest = den
    while rest % 2 == 0:
        rest //= 2
        twos += 1
    while rest % 5 == 0:
        rest //= 5
        fives += 1
    if rest != 1:
        raise InputError(
            f"{name}={q} has no finite decimal expansion; write it as a decimal with the digits you mean"
        )
    places = max(twos, fives)
    scaled = abs(num) * 10**places // den
    sign = "-" if num < 0 else ""
    digits = str(scaled).rjust(places + 1, "0")
    return f"{sign}{digits[:-places]}.{digits[-places:]}" if places else f"{sign}{digits}"


def number_text(name: str, value: Union[str, int, float, Any]) -> str:
    """A number as decimal text for the library: text as written, ints,
    floats (their shortest repr), ``decimal.Decimal``, terminating fractions,
    mpmath numbers (their digits at the current ``mpmath.mp.dps``) and sympy
    numbers. Anything else is :class:`InputError`."""
    if isinstance(value, str):
        return value.strip()
    if isinstance(value, bool):
        raise InputError(f"{name} must be a number, got {value!r}")
    if isinstance(value, numbers.Integral):
        return str(int(value))
    if isinstance(value, float):
        return repr(value)
    if isinstance(value, decimal.Decimal):
        return str(value)
    if isinstance(value, numbers.Rational):
        return _terminating(value, name)
    if _mpmath is not None and isinstance(value, _mpmath.mpf):
        return str(value)
    if type(value).__module__.startswith("sympy"):
        if getattr(value, "is_Rational", False):
            return _terminating(value, name)
        if getattr(value, "is_Float", False):
            return str(value)
    raise InputError(f"{name} must be a number or decimal text, got {type(value).__name__} {value!r}")


def _significant_digits(text: str) -> int:
    mantissa = text.lstrip("+-").split("e")[0].split("E")[0]
    return max(1, len(mantissa.replace(".", "").lstrip("0")))


def to_mpf(text: str) -> Any:
    """Decimal text as an ``mpmath.mpf`` holding every written digit, whatever
    ``mpmath.mp.dps`` is (arithmetic with it rounds to the current precision)."""
    if _mpmath is None:
        raise ImportError("mpmath is not installed: `pip install mpmath` (or use the decimal text)")
    # At least 30 digits, so that a short text such as an error "2.9e-37"
    # also reads back without visible binary rounding.
    with _mpmath.workdps(max(_significant_digits(text) + 5, 30)):
        return _mpmath.mpf(text)


def number_or_text(text: str, as_text: bool) -> Any:
    """``to_mpf(text)`` when mpmath is importable and ``as_text`` is false, else the text."""
    if as_text or _mpmath is None:
        return text
    return to_mpf(text)
