"""Coefficient-language text as sympy expressions.

The text is parsed by the library's own parser (so exactly the language
``check`` and ``expand`` read) into a tree, which is rebuilt here from
sympy's objects: ``pi``, ``Catalan``, ``zeta(n)``, ``log``, ``Symbol``,
exact ``Rational`` numbers, and multiple zeta values as :class:`MZV`.

``MZV(s1, ..., sk)`` is sum over n1 > n2 > ... > nk >= 1 of
n1^-s1 ... nk^-sk, arguments in the order the coefficient language writes
``zeta(s1, ..., sk)`` (docs/conventions.md section 7): ``MZV(5, 3)`` is
``zeta(5,3)`` = 0.0377076729848475... It evaluates numerically
(``.evalf(n)``) through the library's MPFR code; depth one is sympy's own
``zeta``.
"""

from __future__ import annotations

import json
import math
from typing import Any, Dict

from . import _native

_cache: Dict[str, Any] = {}


def _sympy() -> Any:
    try:
        import sympy  # type: ignore[import-untyped]
    except ImportError as e:
        raise ImportError("sympy is not installed: `pip install sympy` for symbolic results") from e
    return sympy


def mzv_class() -> Any:
    """The sympy function class ``MZV``, made once on first use (so that
    importing loopwise does not import sympy)."""
    if "MZV" in _cache:
        return _cache["MZV"]
    sympy = _sympy()

    function: Any = sympy.Function

    class MZV(function):  # type: ignore[misc]
        """Multiple zeta value MZV(s1, ..., sk) = sum_{n1 > ... > nk >= 1}
        n1^-s1 ... nk^-sk, the coefficient language's ``zeta(s1, ..., sk)``;
        MZV(n) is ``zeta(n)``. Numerical values come from loopwise's MPFR
        evaluation of the same text."""

        @classmethod
        def eval(cls, *args: Any) -> Any:
            if len(args) == 1:
                return sympy.zeta(args[0])
            return None

        def _eval_evalf(self, prec: int) -> Any:
            if not all(a.is_Integer and a > 0 for a in self.args):
                return None
            digits = int(prec * math.log10(2)) + 3
            text = "zeta(" + ",".join(str(int(a)) for a in self.args) + ")"
            value, _ = _native.evaluate(text, digits)
            return sympy.Float(value, precision=prec)

    _cache["MZV"] = MZV
    return MZV


def _build(node: Any, sympy: Any, mzv: Any) -> Any:
    kind = node[0]
    if kind == "int":
        return sympy.Integer(int(node[1]))
    if kind == "rational":
        return sympy.Rational(int(node[1]), int(node[2]))
    if kind == "pi":
        return sympy.pi
    if kind == "catalan":
        return sympy.Catalan
    if kind == "zeta":
        args = node[1]
        return sympy.zeta(args[0]) if len(args) == 1 else mzv(*args)
    if kind == "log":
        return sympy.log(_build(node[1], sympy, mzv))
    if kind == "symbol":
        return sympy.Symbol(node[1])
    if kind == "neg":
        return -_build(node[1], sympy, mzv)
    if kind == "sum":
        return sympy.Add(*(_build(t, sympy, mzv) for t in node[1]))
    if kind == "product":
        return sympy.Mul(*(_build(f, sympy, mzv) for f in node[1]))
    if kind == "power":
        return sympy.Pow(_build(node[1], sympy, mzv), _build(node[2], sympy, mzv))
    raise ValueError(f"loopwise: unknown node {kind!r} from the native parser")


def to_sympy(text: str) -> Any:
    """A coefficient-language expression (``"-292/315*pi^6 - 32*zeta(3)^2"``,
    ``"zeta(5,3)"``) as an exact sympy expression.

    Raises :class:`loopwise.InputError` for text outside the language, a
    number with an uncertainty, and ``Gamma(...)``/``Delta(...)`` (functions
    of the coupling, not constants), with the position in the text.
    Requires sympy.
    """
    if not isinstance(text, str):
        raise _native.InputError(f"to_sympy takes coefficient-language text, got {type(text).__name__}")
    sympy = _sympy()
    tree = json.loads(_native.tree(text))
    return _build(tree, sympy, mzv_class())
