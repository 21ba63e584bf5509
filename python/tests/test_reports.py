"""`check`, `origin` and `identify` return the dictionaries the command
line prints with `--format json`, on the repository's fictional demo files;
`identify` recovers published and sympy-evaluated constants."""

from __future__ import annotations

import json

import mpmath
import sympy

import loopwise

DEMO_CUSP = "series/examples/demo-cusp.yaml"
DEMO_ORIGIN = "series/examples/demo-origin.yaml"


def cli_json(cli, *args):
    code, out, err = cli(*args, "--format", "json")
    # 0: agrees or found; 1: the demo's planted mistake, or no relation.
    assert code in (0, 1), err
    return json.loads(out)


def test_check_gives_the_command_lines_dictionary(cli, in_repo):
    got = loopwise.check(DEMO_CUSP)
    assert got == cli_json(cli, "check", DEMO_CUSP)
    # The demo plants a transposed pair of digits at five loops (its header).
    assert got["agrees"] is False
    assert any(o["loop"] == 5 and not o["verdict"].startswith("agrees") for o in got["orders"])


def test_check_with_identify_gives_the_command_lines_dictionary(cli, in_repo):
    assert loopwise.check(DEMO_CUSP, 40, identify=True) == cli_json(
        cli, "check", DEMO_CUSP, "--digits", "40", "--identify"
    )


def test_check_takes_path_objects(in_repo):
    assert loopwise.check(in_repo / DEMO_CUSP)["prediction"] == "cusp"


def test_origin_gives_the_command_lines_dictionary(cli, in_repo):
    got = loopwise.origin(DEMO_ORIGIN)
    assert got == cli_json(cli, "origin", DEMO_ORIGIN)
    assert loopwise.origin(DEMO_ORIGIN, even="pi") == cli_json(cli, "origin", DEMO_ORIGIN, "--even", "pi")


def test_identify_recovers_zeta3_squared_at_weight_6(cli):
    with mpmath.workdps(40):
        value = mpmath.nstr(mpmath.zeta(3) ** 2, 35)
    got = loopwise.identify(value, weight=6)
    assert got == cli_json(cli, "identify", value, "--weight", "6")
    assert got["found"] is True
    assert sympy.simplify(loopwise.to_sympy(got["relation"]) - sympy.zeta(3) ** 2) == 0


def test_identify_recovers_the_four_loop_cusp_coefficient():
    # -876 zeta(6) - 32 zeta(3)^2: hep-th/0610251, evaluated by sympy.
    published = -876 * sympy.zeta(6) - 32 * sympy.zeta(3) ** 2
    got = loopwise.identify(str(published.evalf(40)), weight=6)
    assert got["found"] is True, got
    assert sympy.simplify(loopwise.to_sympy(got["relation"]) - published) == 0


def test_identify_finds_zeta_5_3_in_the_weight_8_basis():
    # zeta(5,3) by direct summation with mpmath (see test_symbolic.py), then
    # identified: the relation names the multiple zeta value, which sympy reads
    # as MZV(5, 3).
    with mpmath.workdps(50):
        z53 = mpmath.nsum(lambda n: n**-5 * (mpmath.zeta(3) - mpmath.zeta(3, n)), [1, mpmath.inf])
        value = mpmath.nstr(z53, 40)
    got = loopwise.identify(value, weight=8)
    assert got["found"] is True, got
    assert loopwise.to_sympy(got["relation"]) == loopwise.MZV(5, 3)


def test_identify_with_a_basis_list():
    with mpmath.workdps(40):
        value = mpmath.nstr(3 * mpmath.log(2) - mpmath.catalan / 2, 35)
    got = loopwise.identify(value, basis=["log(2)", "catalan"])
    assert got["found"] is True
    assert sympy.simplify(loopwise.to_sympy(got["relation"]) - (3 * sympy.log(2) - sympy.Catalan / 2)) == 0
