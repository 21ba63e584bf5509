"""Readback of `--format mathematica` and `--format maple`.

The binary's output is parsed with sympy's parser for that language
(sympy.parsing.mathematica.parse_mathematica; for Maple, sympy's own
parse_expr with `^` as power) and compared with values from outside the
writer: published coefficients typed in here, and the JSON output's exact
strings converted independently with sympy.

The binary is `$LOOPWISE_BIN`, or target/release/loopwise under the
repository root; the tests fail when it is missing.
"""

import json
import os
import pathlib
import subprocess

import pytest
import sympy
from sympy import Function, Integer, Rational, log, pi, zeta
from sympy.parsing.mathematica import parse_mathematica
from sympy.parsing.sympy_parser import (
    convert_xor,
    parse_expr,
    standard_transformations,
)

ROOT = pathlib.Path(__file__).resolve().parents[2]
BINARY = pathlib.Path(os.environ.get("LOOPWISE_BIN", ROOT / "target" / "release" / "loopwise"))
MZV = Function("MZV")
TRANSFORMATIONS = standard_transformations + (convert_xor,)


def loopwise(*args, stdin=None, code=0):
    if not BINARY.is_file():
        pytest.fail(f"the loopwise binary is missing: {BINARY} (cargo build --release, or set LOOPWISE_BIN)")
    run = subprocess.run([str(BINARY), *args], input=stdin, capture_output=True, text=True)
    assert run.returncode == code, run.stderr
    return run.stdout


def from_mathematica(text):
    """parse_mathematica keeps Zeta as an undefined function: make it sympy's zeta."""
    assert text.startswith("(* ")
    value = parse_mathematica(text)
    return value.replace(Function("Zeta"), zeta)


def from_maple(text):
    assert text.startswith("# ")
    body = text.split("\n", 1)[1].strip()
    assert body.endswith(";")
    local = {"Pi": pi, "Zeta": zeta, "log": log, "MZV": MZV, "Catalan": sympy.Catalan}
    return parse_expr(body[:-1], local_dict=local, transformations=TRANSFORMATIONS)


def from_loopwise_text(text):
    """loopwise's own text form (the JSON's `exact`), converted here: pi, zeta(n)
    and zeta(s1, ..., sk) as MZV."""

    def z(*args):
        return zeta(args[0]) if len(args) == 1 else MZV(*args)

    local = {"pi": pi, "zeta": z, "log": log, "ln": log, "catalan": sympy.Catalan}
    return parse_expr(text, local_dict=local, transformations=TRANSFORMATIONS)


def same(a, b):
    return sympy.simplify(sympy.expand(a - b)) == 0


def both_systems(*args):
    return (
        from_mathematica(loopwise(*args, "--format", "mathematica")),
        from_maple(loopwise(*args, "--format", "maple")),
    )


def json_orders(*args):
    report = json.loads(loopwise(*args, "--format", "json"))
    return [from_loopwise_text(o["exact"]) for o in report["orders"]]


def test_cusp_through_four_loops_against_the_published_expansion():
    # Gamma_cusp = f(g)/2 with f(g) = 8 g^2 - 8/3 pi^2 g^4 + 88/45 pi^4 g^6
    # - 16 (73/630 pi^6 + 4 zeta(3)^2) g^8 (hep-th/0610251, eq. for f(g);
    # recalled from memory).
    published = [
        Integer(4),
        -Rational(4, 3) * pi**2,
        Rational(44, 45) * pi**4,
        -8 * (Rational(73, 630) * pi**6 + 4 * zeta(3) ** 2),
    ]
    for even in ("pi", "zeta"):
        for values in both_systems("expand", "cusp", "-L", "4", "--even", even):
            assert len(values) == 4
            for got, want in zip(values, published):
                assert same(got, want), (got, want)


@pytest.mark.parametrize(
    "args",
    [
        ("cusp", "-L", "12"),
        ("Gamma(pi/3)", "-L", "12"),
        ("Gamma(pi/6)", "-L", "10", "--coupling", "lambda"),
        ("octagon-constant", "-L", "10", "--even", "zeta"),
        ("Gamma(c2)", "-L", "7", "--coupling", "a"),
        ("-zeta(2)/2*Gamma(pi/4) + Delta(0)/4", "-L", "9"),
    ],
)
def test_many_loops_agree_with_the_json_output(args):
    reference = json_orders("expand", *args)
    assert len(reference) == int(args[2])
    for values in both_systems("expand", *args):
        assert len(values) == len(reference)
        for loop, (got, want) in enumerate(zip(values, reference), start=1):
            assert sympy.expand(got - want) == 0, (loop, got, want)


# Invented check input (fictional data): multiple zeta values, logarithms,
# Catalan's constant, a decimal and a gap.
MIXED = """\
# invented test data
prediction: cusp
coupling: g2
orders:
  - loop: 1
    exact: "4 + zeta(5,3) - zeta(3,5)/2"
  - loop: 2
    exact: "-8 Zeta[2] + log(2)^2/3 - 2^-2 catalan"
  - loop: 4
    value: "-937.43062784825374188"
  - loop: 5
    exact: "zeta(3,5,3)*zeta(3) - zeta(7,3)"
"""


def test_check_entries_read_back_with_multiple_zeta_values():
    supplied = {
        1: from_loopwise_text("4 + zeta(5,3) - zeta(3,5)/2"),
        2: from_loopwise_text("-8*zeta(2) + log(2)^2/3 - 2^-2*catalan"),
        5: from_loopwise_text("zeta(3,5,3)*zeta(3) - zeta(7,3)"),
    }
    predicted = json_orders("expand", "cusp", "-L", "5")
    m = from_mathematica(loopwise("check", "-", "--format", "mathematica", stdin=MIXED, code=1))
    p = from_maple(loopwise("check", "-", "--format", "maple", stdin=MIXED, code=1))
    assert len(m) == len(p) == 5
    for loop in range(1, 6):
        rm, rp = m[loop - 1], p[loop - 1]
        assert rm[0] == rp[0] == loop
        assert sympy.expand(rm[1] - predicted[loop - 1]) == 0
        assert sympy.expand(rp[1] - predicted[loop - 1]) == 0
        if loop in supplied:
            assert sympy.expand(rm[2] - supplied[loop]) == 0, (rm[2], supplied[loop])
            assert sympy.expand(rp[2] - supplied[loop]) == 0, (rp[2], supplied[loop])
    assert str(m[2][2]) == "Missing(_Str(NotSupplied))" and p[2][2] == "not supplied"
    assert str(m[3][2]) == "Missing(_Str(NotExact))" and p[3][2] == "not exact"
    # The argument order survives: zeta(5,3) and zeta(3,5) are different numbers.
    assert MZV(5, 3) in m[0][2].atoms(MZV) and MZV(3, 5) in m[0][2].atoms(MZV)


def test_origin_pairs_agree_with_the_json_output():
    demo = (ROOT / "series" / "examples" / "demo-origin.yaml").read_text()
    report = json.loads(loopwise("origin", "-", "--format", "json", stdin=demo, code=1))
    rows = [o for o in report["orders"] if o["exponentiation"] == "holds"]
    for read in (
        from_mathematica(loopwise("origin", "-", "--format", "mathematica", stdin=demo, code=1)),
        from_maple(loopwise("origin", "-", "--format", "maple", stdin=demo, code=1)),
    ):
        assert len(read) == len(rows) == 4
        for got, row in zip(read, rows):
            assert got[0] == row["loop"]
            for pair, name in zip(got[1:], ("octagon", "hexagon", "linear", "constant")):
                cell = row[name]
                assert sympy.expand(pair[1] - from_loopwise_text(cell["supplied"])) == 0
                if cell["predicted"] is not None:
                    assert sympy.expand(pair[0] - from_loopwise_text(cell["predicted"])) == 0
