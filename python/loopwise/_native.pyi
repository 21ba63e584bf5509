"""Type stubs of the extension module ``loopwise._native`` (python/src/lib.rs).

Every report function returns the JSON text the command line prints with
``--format json``; the package ``loopwise`` turns it into Python objects.
"""

from typing import Optional, Tuple

__version__: str

class InputError(ValueError):
    """Input loopwise cannot use; the message is the command line's, located."""

class NumericError(ArithmeticError):
    """A numerical computation that could not reach the accuracy asked for."""

def expand(
    quantity: str,
    loops: int,
    coupling: Optional[str] = None,
    digits: int = 20,
    even: str = "pi",
    catalog: Optional[str] = None,
) -> str:
    """The JSON text of ``loopwise expand QUANTITY -L LOOPS --format json``."""

def at(quantity: str, g: str, digits: int = 30, catalog: Optional[str] = None) -> str:
    """The JSON text of ``loopwise at QUANTITY --g G --format json``."""

def scan(
    quantity: str,
    grid: str,
    points: Optional[int] = None,
    digits: int = 15,
    catalog: Optional[str] = None,
) -> str:
    """The JSON text of ``loopwise scan QUANTITY --g GRID --format json``."""

def check(path: str, digits: int = 30, identify: bool = False, catalog: Optional[str] = None) -> str:
    """The JSON text of ``loopwise check PATH --format json``."""

def origin(path: str, digits: int = 30, even: str = "zeta", catalog: Optional[str] = None) -> str:
    """The JSON text of ``loopwise origin PATH --format json``."""

def identify(
    value: str,
    digits: Optional[int] = None,
    weight: Optional[int] = None,
    with_lower: bool = False,
    basis: Optional[str] = None,
    catalog: Optional[str] = None,
) -> str:
    """The JSON text of ``loopwise identify VALUE --format json``."""

def evaluate(expression: str, digits: int = 30, catalog: Optional[str] = None) -> Tuple[str, str]:
    """The value and uncertainty of an expression as decimal text (``loopwise eval``)."""

def status(quantity: str, catalog: Optional[str] = None) -> Optional[str]:
    """The catalogue status of a name or formula, or None."""

def tree(text: str) -> str:
    """The parsed tree of a coefficient-language expression as JSON."""
