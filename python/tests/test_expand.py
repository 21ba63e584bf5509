"""`loopwise.expand`: exact coefficients against the published cusp
anomalous dimension, sympy's own zeta values, and the coupling conventions."""

from __future__ import annotations

import json
import warnings

import mpmath
import sympy
from sympy import Rational, Symbol, pi, zeta

import loopwise

# Gamma_cusp = sum_L c_L g^(2L), g^2 = lambda/(16 pi^2), through four loops:
# hep-th/0610251 (its f(g) = 2 Gamma_cusp), the four-loop term also
# hep-th/0610248; in that form in the project's tests/exact_engine.rs.
PUBLISHED_CUSP = {
    1: sympy.Integer(4),
    2: -8 * zeta(2),
    3: 88 * zeta(4),
    4: -876 * zeta(6) - 32 * zeta(3) ** 2,
}


def test_cusp_matches_the_published_coefficients_through_four_loops():
    e = loopwise.expand("cusp", 4)
    assert [c.loop for c in e] == [1, 2, 3, 4]
    for c in e:
        got = c.sympy()
        assert sympy.simplify(got - PUBLISHED_CUSP[c.loop]) == 0, (c.loop, got)
    # The exact text is the coefficient language's, as the command line prints it.
    assert e[3].exact == "-292/315*pi^6 - 32*zeta(3)^2"


def test_cusp_values_agree_with_sympy_zeta_values_to_40_digits():
    e = loopwise.expand("cusp", 4, digits=45)
    with mpmath.workdps(50):
        for c in e:
            reference = mpmath.mpf(str(PUBLISHED_CUSP[c.loop].evalf(40)))
            got = c.mpf()
            assert abs(got - reference) <= mpmath.mpf(10) ** -38 * abs(reference), (c.loop, got, reference)
            # .sympy() evaluated by sympy itself gives the same digits.
            assert abs(mpmath.mpf(str(c.sympy().evalf(40))) - reference) <= mpmath.mpf(10) ** -38 * abs(reference)


def test_the_expansion_states_its_source():
    e = loopwise.expand("cusp", 2)
    assert isinstance(e, list)
    assert e.quantity == "cusp" and e.definition == "Gamma(pi/4)"
    assert e.coupling == "g2" and e.status == "established"
    # The catalogue entry cites the published expansion (series/catalogue/cusp.yaml).
    assert "hep-th/0610251" in e.references, e.references


def test_couplings_a_and_lambda_rescale_by_their_definitions():
    # a = lambda/(8 pi^2) = 2 g^2 and g^2 = lambda/(16 pi^2) (docs/conventions.md
    # section 1): the coefficient of a^L is c_L / 2^L, that of lambda^L is c_L / (16 pi^2)^L.
    for coupling, factor in (("a", Rational(1, 2)), ("lambda", 1 / (16 * pi**2))):
        e = loopwise.expand("cusp", 4, coupling)
        assert e.coupling == coupling
        for c in e:
            assert sympy.simplify(c.sympy() - PUBLISHED_CUSP[c.loop] * factor**c.loop) == 0, (coupling, c)
    # The default is the catalogue entry's convention, g2 for the cusp.
    assert loopwise.expand("cusp", 3) == loopwise.expand("cusp", 3, "g2")


def test_the_symbolic_tilt_at_c2_one_half_is_the_cusp():
    # Gamma(c2) keeps cos^2 of the tilt as a symbol; the cusp is the tilt pi/4,
    # cos^2 = 1/2 (docs/conventions.md section 3), so substituting must give
    # the published coefficients.
    e = loopwise.expand("Gamma(c2)", 4)
    c2 = Symbol("c2")
    assert any(c.sympy().has(c2) for c in e)
    for c in e:
        if c.sympy().has(c2):
            assert c.value is None
        assert sympy.simplify(c.sympy().subs(c2, Rational(1, 2)) - PUBLISHED_CUSP[c.loop]) == 0, c


def test_even_zeta_style_is_the_same_number():
    pis = loopwise.expand("cusp", 4)
    zetas = loopwise.expand("cusp", 4, even="zeta")
    assert "zeta(6)" in zetas[3].exact
    for a, b in zip(pis, zetas):
        assert sympy.simplify(a.sympy() - b.sympy()) == 0
        assert a.value == b.value


def test_expand_matches_the_command_line(cli):
    code, out, _ = cli("expand", "hexagon", "-L", "6", "--format", "json", "--digits", "25")
    assert code == 0
    report = json.loads(out)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        e = loopwise.expand("hexagon", 6, digits=25)
    # hexagon is a conjecture (arXiv:2001.05460): the package says so, as the CLI does.
    assert report["status"] == "conjecture" == e.status
    assert any(issubclass(w.category, loopwise.ConjectureWarning) for w in caught)
    assert [(c.loop, c.exact, c.value) for c in e] == [
        (o["loop"], o["exact"], o["value"]) for o in report["orders"]
    ]
