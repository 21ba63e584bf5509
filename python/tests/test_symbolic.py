"""`loopwise.to_sympy` and the sympy function `MZV`: multiple zeta values in
the argument order of docs/conventions.md section 7, checked against direct
summation with mpmath and against the stuffle product."""

from __future__ import annotations

import mpmath
import pytest
import sympy

import loopwise


def direct_mzv(a: int, b: int, dps: int) -> mpmath.mpf:
    """zeta(a, b) = sum over n > m >= 1 of n^-a m^-b, summed with mpmath
    independently of loopwise: the inner sum over m < n is
    zeta(b) - zeta(b, n) (Hurwitz), so one accelerated outer sum remains."""
    with mpmath.workdps(dps + 10):
        return +mpmath.nsum(lambda n: n ** (-a) * (mpmath.zeta(b) - mpmath.zeta(b, n)), [1, mpmath.inf])


def test_zeta_5_3_is_MZV_5_3_with_its_value():
    expr = loopwise.to_sympy("zeta(5,3)")
    MZV = loopwise.MZV
    assert expr == MZV(5, 3)
    assert expr.func is MZV and expr.args == (5, 3)
    reference = direct_mzv(5, 3, 30)
    with mpmath.workdps(40):
        assert abs(mpmath.mpf(str(expr.evalf(30))) - reference) < mpmath.mpf(10) ** -29
    # docs/conventions.md section 7 quotes 0.0377076729848475... (recalled from memory there).
    assert str(expr.evalf(16)).startswith("0.03770767298484")


def test_argument_order_follows_the_convention():
    # zeta(3,5) = sum n^-3 m^-5 over n > m: a different number; the stuffle
    # product zeta(5) zeta(3) = zeta(5,3) + zeta(3,5) + zeta(8) ties them together.
    MZV = loopwise.MZV
    z35 = loopwise.to_sympy("zeta(3,5)")
    assert z35 == MZV(3, 5) != MZV(5, 3)
    with mpmath.workdps(40):
        assert abs(mpmath.mpf(str(z35.evalf(30))) - direct_mzv(3, 5, 30)) < mpmath.mpf(10) ** -29
        stuffle = sympy.zeta(5) * sympy.zeta(3) - MZV(5, 3) - MZV(3, 5) - sympy.zeta(8)
        assert abs(mpmath.mpf(str(stuffle.evalf(30)))) < mpmath.mpf(10) ** -29


def test_depth_one_is_sympys_zeta():
    assert loopwise.MZV(3) == sympy.zeta(3)
    assert loopwise.to_sympy("zeta(3) + z5 + ζ(7)") == sympy.zeta(3) + sympy.zeta(5) + sympy.zeta(7)


def test_the_language_maps_onto_sympy():
    l1 = sympy.Symbol("l1")
    got = loopwise.to_sympy("2pi^2 - 3/4 log(2) + catalan*l1 - 1.25 + 2^3^2 - 7/2/2")
    want = 2 * sympy.pi**2 - sympy.Rational(3, 4) * sympy.log(2) + sympy.Catalan * l1 - sympy.Rational(5, 4) + 2**9 - sympy.Rational(7, 4)
    assert sympy.simplify(got - want) == 0


def test_a_long_sum_converts_without_deep_recursion():
    text = " - ".join(f"{k}*zeta(3)" for k in range(1, 3001))
    got = loopwise.to_sympy(text)
    assert got == (1 - sum(range(2, 3001))) * sympy.zeta(3)


@pytest.mark.parametrize(
    "text, column, words",
    [
        ("Gamma(pi/4) + 1", 1, "function of the coupling"),
        ("1 + 1.5(3)", 5, "uncertainty"),
        ("zeta(3", 7, "expected"),
    ],
)
def test_what_has_no_sympy_form_is_refused_with_its_place(text, column, words):
    with pytest.raises(loopwise.InputError) as caught:
        loopwise.to_sympy(text)
    message = str(caught.value)
    assert message.startswith(f"<expression>:1:{column}:"), message
    assert words in message
