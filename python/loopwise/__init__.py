"""loopwise from Python: exact weak-coupling expansions of planar N=4 SYM
quantities, their values at finite coupling, checks of series files,
the six-gluon origin analysis and numerical identification, computed by the
Rust library in-process (no subprocess).

Quantities are catalogue names (``"cusp"``, ``"octagon"``, ...) or formulas
of the coefficient language (``"Gamma(pi/6)"``, ``"-zeta(2)/2*cusp + Delta(0)/4"``),
exactly as on the command line.

Numbers: ``Coefficient.value`` is decimal text and ``Coefficient.mpf()``
the same digits as an ``mpmath.mpf``. :func:`at`, :func:`scan` and
:func:`evaluate` return ``mpmath.mpf`` values when mpmath is importable and
decimal text otherwise (``as_text=True`` asks for text always). Every mpf
holds all the digits it was given, whatever ``mpmath.mp.dps`` is; raise
``mp.dps`` to compute with them.

Errors: unusable input (text outside the language, unknown names, numbers
out of range, files that cannot be read or used) raises :class:`InputError`,
a ``ValueError``, with the command line's message (file, line and column
where there are any); a numerical computation that cannot reach the asked
accuracy raises :class:`NumericError`, an ``ArithmeticError``. Predictions
that are conjectures of the literature carry ``status == "conjecture"`` and
emit a :class:`ConjectureWarning`.
"""

from __future__ import annotations

import json
import os
import warnings
from typing import Any, Dict, List, NamedTuple, Optional, Sequence, Union

from . import _native
from ._native import InputError, NumericError
from ._numbers import number_or_text, number_text, optional_whole, to_mpf, whole
from ._symbolic import mzv_class, to_sympy

__version__: str = _native.__version__

__all__ = [
    "Coefficient",
    "ConjectureWarning",
    "Expansion",
    "InputError",
    "MZV",
    "NumericError",
    "Point",
    "Value",
    "at",
    "check",
    "evaluate",
    "expand",
    "identify",
    "origin",
    "scan",
    "to_sympy",
]

PathLike = Union[str, "os.PathLike[str]"]


class ConjectureWarning(UserWarning):
    """The prediction used is a conjecture of the literature, not established."""


def _warn_if_conjecture(quantity: str, status: Optional[str]) -> None:
    if status == "conjecture":
        warnings.warn(
            f"{quantity}: this prediction is a CONJECTURE of the literature (see its catalogue entry)",
            ConjectureWarning,
            stacklevel=3,
        )


def _text_arg(name: str, value: Any) -> str:
    if not isinstance(value, str):
        raise InputError(f"{name} must be text, got {type(value).__name__} {value!r}")
    return value


def _catalog(catalog: Optional[PathLike]) -> Optional[str]:
    return None if catalog is None else os.fspath(catalog)


class Coefficient:
    """One exact loop coefficient of an expansion.

    Attributes:
        loop: the loop order L (the coefficient multiplies x^L in the chosen
            coupling x: g^2, a or lambda).
        exact: the exact coefficient in the coefficient language, e.g.
            ``"-292/315*pi^6 - 32*zeta(3)^2"``; it pastes into series files.
        value: its decimal value to the requested digits, as text; ``None``
            when the coefficient holds the symbolic tilt ``c2``.
    """

    __slots__ = ("loop", "exact", "value")

    def __init__(self, loop: int, exact: str, value: Optional[str]) -> None:
        self.loop = loop
        self.exact = exact
        self.value = value

    def mpf(self) -> Any:
        """The decimal value as an ``mpmath.mpf`` holding all its digits.

        Raises ``ImportError`` without mpmath and :class:`InputError` for a
        coefficient with the symbol ``c2``, which has no single value."""
        if self.value is None:
            raise InputError(f"loop {self.loop}: `{self.exact}` holds a symbol and has no numerical value")
        return to_mpf(self.value)

    def sympy(self) -> Any:
        """The exact coefficient as a sympy expression (``pi``, ``zeta(n)``,
        ``Symbol("c2")``, rationals). Requires sympy."""
        return to_sympy(self.exact)

    def __repr__(self) -> str:
        return f"Coefficient(loop={self.loop}, exact={self.exact!r}, value={self.value!r})"

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, Coefficient):
            return NotImplemented
        return (self.loop, self.exact, self.value) == (other.loop, other.exact, other.value)

    def __hash__(self) -> int:
        return hash((self.loop, self.exact, self.value))


class Expansion(List[Coefficient]):
    """The coefficients of :func:`expand`, loop 1 first: a list, with what the
    command line's report states about them.

    Attributes:
        quantity: the name or formula expanded.
        definition: its definition in the functionals (``"Gamma(pi/4)"``).
        coupling: ``"g2"``, ``"a"`` or ``"lambda"``.
        status: ``"established"`` or ``"conjecture"`` for catalogue
            predictions (and formulas built from them), ``None`` for formulas
            of the functionals alone.
        references: arXiv identifiers of the catalogue entry.
    """

    def __init__(
        self,
        coefficients: Sequence[Coefficient],
        quantity: str,
        definition: str,
        coupling: str,
        status: Optional[str],
        references: Sequence[str],
    ) -> None:
        super().__init__(coefficients)
        self.quantity = quantity
        self.definition = definition
        self.coupling = coupling
        self.status = status
        self.references = list(references)

    def __repr__(self) -> str:
        return (
            f"Expansion(quantity={self.quantity!r}, coupling={self.coupling!r}, "
            f"status={self.status!r}, loops={len(self)})"
        )


def expand(
    quantity: str,
    loops: int,
    coupling: str = "g2",
    *,
    digits: int = 20,
    even: str = "pi",
    catalog: Optional[PathLike] = None,
) -> Expansion:
    """The exact loop coefficients of ``quantity`` through ``loops`` loops,
    as ``loopwise expand QUANTITY -L LOOPS`` computes them.

    Args:
        quantity: a catalogue name or a formula.
        loops: the highest loop order, 1 to 50.
        coupling: ``"g2"`` (g^2 = lambda/(16 pi^2), the default), ``"a"``
            (a = 2 g^2) or ``"lambda"``; a user catalogue entry written in
            another convention is converted.
        digits: significant digits of the decimal values.
        even: ``"pi"`` writes even zeta values as powers of pi, ``"zeta"`` as zeta(2n).
        catalog: a directory of extra catalogue entries (``--catalog DIR``).

    Returns:
        An :class:`Expansion`: a list of :class:`Coefficient`, loop 1 first.

    Raises:
        InputError: an unknown or malformed quantity, an unknown coupling, a
            loop count or digits out of range.
    """
    coupling = _text_arg("coupling", coupling)
    report = json.loads(
        _native.expand(
            _text_arg("quantity", quantity),
            whole("loops", loops),
            coupling,
            whole("digits", digits),
            _text_arg("even", even),
            _catalog(catalog),
        )
    )
    _warn_if_conjecture(report["quantity"], report["status"])
    return Expansion(
        [Coefficient(o["loop"], o["exact"], o["value"]) for o in report["orders"]],
        report["quantity"],
        report["definition"],
        report["coupling"],
        report["status"],
        report["references"],
    )


class Value(NamedTuple):
    """A value at finite coupling and its error estimate (mpmath numbers,
    or decimal text without mpmath or with ``as_text=True``)."""

    value: Any
    error: Any


class Point(NamedTuple):
    """One point of :func:`scan`: the coupling g, the value and its error estimate."""

    g: Any
    value: Any
    error: Any


def _couplings_text(g: Any) -> str:
    if isinstance(g, (list, tuple)):
        if not g:
            raise InputError("no couplings given")
        return ",".join(number_text("g", x) for x in g)
    return number_text("g", g)


def at(
    quantity: str,
    g: Any,
    digits: int = 30,
    *,
    as_text: bool = False,
    catalog: Optional[PathLike] = None,
) -> Union[Value, List[Value]]:
    """The value of ``quantity`` at coupling ``g`` (g^2 = lambda/(16 pi^2),
    0 <= g <= 200) with its error estimate, as ``loopwise at`` computes it.

    Args:
        quantity: a catalogue name or a formula in the functionals (any real tilt).
        g: a number (int, float, decimal text, ``Decimal``, a terminating
            fraction, mpmath or sympy number), or a list of them.
        digits: significant digits wanted, 1 to 200; the value carries only
            the digits its error estimate supports.
        as_text: return decimal text even when mpmath is importable.
        catalog: a directory of extra catalogue entries.

    Returns:
        ``Value(value, error)`` for one coupling, a list of them for a list
        (or for text naming several couplings, ``"0.1,0.5"`` or a grid ``"0:1:0.25"``).
        The values are ``mpmath.mpf`` when mpmath is importable (and
        ``as_text`` is false), decimal text otherwise.

    Raises:
        InputError: unusable quantity, coupling or digits.
        NumericError: the engine cannot reach the accuracy.
    """
    report = json.loads(
        _native.at(
            _text_arg("quantity", quantity),
            _couplings_text(g),
            whole("digits", digits),
            _catalog(catalog),
        )
    )
    _warn_if_conjecture(report["quantity"], report["status"])
    values = [
        Value(number_or_text(r["value"], as_text), number_or_text(r["error"], as_text))
        for r in report["values"]
    ]
    # Text may name several couplings ("0.1,0.5", a grid "0:1:0.25"): then all
    # of them come back, never just the first.
    if isinstance(g, (list, tuple)) or len(values) != 1:
        return values
    return values[0]


def scan(
    quantity: str,
    start: Any = None,
    stop: Any = None,
    points: Optional[int] = None,
    digits: int = 15,
    *,
    step: Any = None,
    couplings: Optional[Sequence[Any]] = None,
    as_text: bool = False,
    catalog: Optional[PathLike] = None,
) -> List[Point]:
    """Values on a grid of couplings, as ``loopwise scan`` computes them.

    The grid is ``start`` to ``stop`` (ends included) with ``points``
    values (61 by default), or with spacing ``step``; or the explicit list
    ``couplings``. 0 <= g <= 200, at most 100,000 points.

    Args:
        quantity: a catalogue name or a formula in the functionals.
        start, stop: the ends of the grid.
        points: the number of grid values, 2 to 100,000; not with ``step``.
        digits: significant digits wanted, 1 to 200.
        step: the spacing of the grid, instead of ``points``.
        couplings: a list of couplings instead of a grid.
        as_text: return decimal text even when mpmath is importable.
        catalog: a directory of extra catalogue entries.

    Returns:
        A list of ``Point(g, value, error)`` in grid order (mpmath numbers
        when mpmath is importable, else decimal text).

    Raises:
        InputError: unusable quantity, grid or digits.
        NumericError: the engine cannot reach the accuracy.
    """
    if couplings is not None:
        if start is not None or stop is not None or step is not None or points is not None:
            raise InputError("scan takes either couplings=[...] or a grid start, stop (points or step), not both")
        grid = _couplings_text(list(couplings))
    else:
        if start is None or stop is None:
            raise InputError("scan needs start and stop (or couplings=[...])")
        if step is not None and points is not None:
            raise InputError("scan takes points or step, not both")
        grid = f"{number_text('start', start)}:{number_text('stop', stop)}"
        if step is not None:
            grid += f":{number_text('step', step)}"
    status = _status_of(quantity, catalog)
    rows = json.loads(
        _native.scan(
            _text_arg("quantity", quantity),
            grid,
            optional_whole("points", points),
            whole("digits", digits),
            _catalog(catalog),
        )
    )
    _warn_if_conjecture(quantity, status)
    return [
        Point(
            number_or_text(r["g"], as_text),
            number_or_text(r["value"], as_text),
            number_or_text(r["error"], as_text),
        )
        for r in rows
    ]


def _status_of(quantity: str, catalog: Optional[PathLike]) -> Optional[str]:
    """The catalogue status of a quantity, which the scan rows do not carry."""
    status: Optional[str] = _native.status(_text_arg("quantity", quantity), _catalog(catalog))
    return status


def check(
    path: PathLike,
    digits: int = 30,
    *,
    identify: bool = False,
    catalog: Optional[PathLike] = None,
) -> Dict[str, Any]:
    """Checks a series file (YAML) against its prediction: the dictionary
    ``loopwise check PATH --format json`` prints.

    Args:
        path: the series file.
        digits: working digits of numerical comparisons, 6 to 2000.
        identify: also propose an exact form for every agreeing numerical
            entry (``--identify``).
        catalog: a directory of extra catalogue entries.

    Raises:
        InputError: a file that cannot be read or used, with file, line and column.
    """
    report: Dict[str, Any] = json.loads(
        _native.check(os.fspath(path), whole("digits", digits), bool(identify), _catalog(catalog))
    )
    return report


def origin(
    path: PathLike,
    digits: int = 30,
    *,
    even: str = "zeta",
    catalog: Optional[PathLike] = None,
) -> Dict[str, Any]:
    """Reads a six-gluon origin series file: the dictionary
    ``loopwise origin PATH --format json`` prints (exponentiation,
    Gamma_oct, Gamma_hex and C0 order by order).

    Args:
        path: the origin series file.
        digits: working digits, 6 to 2000.
        even: ``"zeta"`` writes even zeta values as zeta(2n), ``"pi"`` as powers of pi.
        catalog: a directory of extra catalogue entries.

    Raises:
        InputError: a file that cannot be read or used, with file, line and column.
    """
    report: Dict[str, Any] = json.loads(
        _native.origin(os.fspath(path), whole("digits", digits), _text_arg("even", even), _catalog(catalog))
    )
    return report


def identify(
    value: Any,
    weight: Optional[int] = None,
    basis: Optional[Union[str, Sequence[str]]] = None,
    *,
    digits: Optional[int] = None,
    with_lower: bool = False,
    catalog: Optional[PathLike] = None,
) -> Dict[str, Any]:
    """Identifies a number as a rational combination of a basis (PSLQ): the
    dictionary ``loopwise identify VALUE --format json`` prints. This is
    numerical identification, not a proof (the dictionary's ``caution``).

    Args:
        value: decimal text with the digits you trust (best), a number
            (an ``mpmath.mpf`` contributes its ``mp.dps`` digits, a float its
            shortest repr), or a coefficient-language expression with ``digits``.
        weight: the weight basis of this weight, 0 to 11: products of even
            powers of pi, odd zeta values and zeta(5,3), zeta(7,3), zeta(3,5,3).
        basis: further elements, expressions separated by ``;`` or a list of them.
        digits: trusted significant digits (default: those written).
        with_lower: with ``weight``, all lower weights too.
        catalog: a directory of extra catalogue entries.

    A weight, a basis or both is required. The relation (``"relation"``)
    converts to sympy with :func:`to_sympy`.

    Raises:
        InputError: unusable value, digits or basis (among them a linearly
            dependent basis).
    """
    if basis is not None and not isinstance(basis, str):
        basis = "; ".join(_text_arg("basis element", b) for b in basis)
    report: Dict[str, Any] = json.loads(
        _native.identify(
            number_text("value", value),
            optional_whole("digits", digits),
            optional_whole("weight", weight),
            bool(with_lower),
            basis,
            _catalog(catalog),
        )
    )
    return report


def evaluate(
    expression: str,
    digits: int = 30,
    *,
    as_text: bool = False,
    catalog: Optional[PathLike] = None,
) -> Value:
    """The value of a coefficient-language expression (``"zeta(5,3)"``,
    ``"-876 zeta(6) - 32 zeta(3)^2"``, ``"1.2e-3(1) * pi"``), as
    ``loopwise eval`` computes it: ``Value(value, error)`` with error 0 for
    an exact expression (mpmath numbers when importable, else text).

    Raises:
        InputError: text outside the language, a catalogue name (a function
            of the coupling: use :func:`at`), digits out of range (1 to 10,000).
    """
    value, error = _native.evaluate(_text_arg("expression", expression), whole("digits", digits), _catalog(catalog))
    return Value(number_or_text(value, as_text), number_or_text(error, as_text))


def __getattr__(name: str) -> Any:
    # MZV is a sympy class, made on first use so that importing loopwise
    # does not import sympy.
    if name == "MZV":
        return mzv_class()
    raise AttributeError(f"module 'loopwise' has no attribute {name!r}")

