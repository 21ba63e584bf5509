"""`loopwise.at`, `scan` and `evaluate` against the closed form of the
octagon anomalous dimension, Gamma_oct = (2/pi^2) ln cosh(2 pi g)
(arXiv:1907.13131, arXiv:2003.01121; series/catalogue/octagon.yaml), computed
here with mpmath."""

from __future__ import annotations

import decimal
import json

import mpmath
import pytest

import loopwise


def octagon(g) -> mpmath.mpf:
    with mpmath.workdps(60):
        g = mpmath.mpf(g)
        return +(2 / mpmath.pi**2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g)))


@pytest.mark.parametrize("g", ["0.5", "2"])
def test_at_matches_the_octagon_closed_form(g):
    value, error = loopwise.at("octagon", g, digits=30)
    assert isinstance(value, mpmath.mpf) and isinstance(error, mpmath.mpf)
    with mpmath.workdps(60):
        reference = octagon(g)
        # The value carries the digits its error estimate supports (at most 30).
        assert abs(value - reference) <= error + mpmath.mpf(10) ** -29 * abs(reference), (value, reference)
        assert abs(value - reference) <= mpmath.mpf(10) ** -28 * abs(reference)
        assert error < mpmath.mpf(10) ** -28 * abs(reference)


def test_at_takes_numbers_of_every_kind_and_lists():
    reference = octagon("0.5")
    for g in (0.5, "0.5", decimal.Decimal("0.5"), mpmath.mpf("0.5")):
        value, _ = loopwise.at("octagon", g, digits=20)
        assert abs(value - reference) < mpmath.mpf(10) ** -18 * reference
    both = loopwise.at("octagon", [0.5, 2], digits=20)
    assert len(both) == 2
    # Text naming several couplings gives all of them, as the command line's --g does.
    assert loopwise.at("octagon", "0.5,2", digits=20) == both
    assert len(loopwise.at("octagon", "0:2:0.5", digits=10)) == 5
    assert abs(both[1].value - octagon(2)) < mpmath.mpf(10) ** -18 * octagon(2)


def test_as_text_gives_the_command_lines_digits(cli):
    code, out, _ = cli("at", "octagon", "--g", "0.5,2", "--digits", "25", "--format", "json")
    assert code == 0
    rows = json.loads(out)["values"]
    got = loopwise.at("octagon", ["0.5", "2"], digits=25, as_text=True)
    assert [(v.value, v.error) for v in got] == [(r["value"], r["error"]) for r in rows]


def test_scan_matches_the_closed_form_at_every_point():
    points = loopwise.scan("octagon", 0, 2, points=5, digits=20)
    assert [float(p.g) for p in points] == [0.0, 0.5, 1.0, 1.5, 2.0]
    for p in points:
        reference = octagon(p.g)
        assert abs(p.value - reference) <= p.error + mpmath.mpf(10) ** -19 * abs(reference), p
    # The same grid by its step, and as an explicit list.
    by_step = loopwise.scan("octagon", 0, 2, step=0.5, digits=20)
    listed = loopwise.scan("octagon", couplings=[0, 0.5, 1, 1.5, 2], digits=20)
    assert by_step == points == listed


def test_scan_matches_the_command_line(cli):
    code, out, _ = cli("scan", "cusp", "--g", "0:3", "--points", "4", "--format", "json")
    assert code == 0
    rows = json.loads(out)
    got = loopwise.scan("cusp", 0, 3, points=4, as_text=True)
    assert [tuple(p) for p in got] == [(r["g"], r["value"], r["error"]) for r in rows]


def test_evaluate_gives_mpmath_values_and_the_command_lines_digits(cli):
    value, error = loopwise.evaluate("-876 zeta(6) - 32 zeta(3)^2", 40)
    with mpmath.workdps(50):
        reference = -876 * mpmath.zeta(6) - 32 * mpmath.zeta(3) ** 2
        assert error == 0
        assert abs(value - reference) < mpmath.mpf(10) ** -38 * abs(reference)
    # An uncertain input: the digits `loopwise eval` prints, "VALUE ± ERROR".
    code, out, _ = cli("eval", "1.5(3) * 2")
    assert code == 0
    value, error = loopwise.evaluate("1.5(3) * 2", as_text=True)
    assert f"{value} ± {error}" == out.strip()
    assert float(error) == pytest.approx(0.6)


def test_mpf_values_keep_their_digits_whatever_mp_dps_is():
    old = mpmath.mp.dps
    try:
        mpmath.mp.dps = 15
        value, _ = loopwise.at("octagon", "0.5", digits=30)
        mpmath.mp.dps = 40
        assert abs(+value - octagon("0.5")) < mpmath.mpf(10) ** -28
    finally:
        mpmath.mp.dps = old
