"""Unusable input raises `loopwise.InputError`, a ValueError, with the
message the command line prints for the same input (file, line and column
where there are any)."""

from __future__ import annotations

import pytest

import loopwise
from conftest import cli_message


def test_input_error_is_a_value_error_and_numeric_error_an_arithmetic_error():
    assert issubclass(loopwise.InputError, ValueError)
    assert issubclass(loopwise.NumericError, ArithmeticError)
    assert not issubclass(loopwise.NumericError, ValueError)
    assert loopwise.InputError.__module__ == "loopwise"


@pytest.mark.parametrize(
    "quantity, where",
    [
        ("Gamma(pi/4", "<quantity>:1:11:"),
        ("cusp + foo", "<quantity>:1:8: unknown name `foo`"),
        ("Gamma(pi/4) */ 2", "<quantity>:1:"),
    ],
)
def test_a_malformed_quantity_gets_the_command_lines_located_message(cli, quantity, where):
    with pytest.raises(loopwise.InputError) as caught:
        loopwise.expand(quantity, 3)
    assert isinstance(caught.value, ValueError)
    message = str(caught.value)
    assert message.startswith(where), message
    assert "^" in message  # the caret under the culprit
    code, _, err = cli("expand", quantity, "-L", "3")
    assert code == 2
    assert cli_message(err) == message


def test_an_unknown_coupling_is_refused():
    with pytest.raises(loopwise.InputError, match="unknown coupling convention 'g3'"):
        loopwise.expand("cusp", 3, "g3")
    with pytest.raises(loopwise.InputError, match="coupling must be text"):
        loopwise.expand("cusp", 3, 2)


@pytest.mark.parametrize("loops", [0, -1, 51, 10**30])
def test_a_loop_count_out_of_range_is_refused(loops):
    with pytest.raises(loopwise.InputError, match=r"loops=-?\d+ is out of range"):
        loopwise.expand("cusp", loops)


@pytest.mark.parametrize("loops", ["three", 2.5, True, None])
def test_a_loop_count_that_is_no_whole_number_is_refused(loops):
    with pytest.raises(loopwise.InputError, match="loops must be a whole number"):
        loopwise.expand("cusp", loops)


@pytest.mark.parametrize(
    "g, words",
    [("-1", "must be a finite number g >= 0"), (300, "beyond the finite-coupling engine"), ("x", "is not a number")],
)
def test_couplings_out_of_reach_are_refused(g, words):
    with pytest.raises(loopwise.InputError, match=words):
        loopwise.at("octagon", g)


def test_a_float_coupling_is_read_at_its_shortest_repr():
    assert loopwise.at("octagon", 1 / 3, digits=10, as_text=True) == loopwise.at(
        "octagon", "0.3333333333333333", digits=10, as_text=True
    )


def test_fractions_without_a_finite_decimal_are_refused():
    from fractions import Fraction

    with pytest.raises(loopwise.InputError, match="no finite decimal expansion"):
        loopwise.at("octagon", Fraction(1, 3))
    value, _ = loopwise.at("octagon", Fraction(1, 2), digits=10, as_text=True)
    assert value == loopwise.at("octagon", "0.5", digits=10, as_text=True).value


@pytest.mark.parametrize("points", [1, -3, 100_001])
def test_a_grid_of_too_few_or_too_many_points_is_refused(points):
    with pytest.raises(loopwise.InputError, match=rf"points={points} is out of range: 2 to 100000"):
        loopwise.scan("octagon", 0, 1, points)


def test_digits_out_of_range_are_refused():
    with pytest.raises(loopwise.InputError, match="digits=0 is out of range"):
        loopwise.at("octagon", 1, digits=0)
    with pytest.raises(loopwise.InputError, match="digits=0 is out of range"):
        loopwise.expand("cusp", 2, digits=0)


def test_an_unusable_series_file_gets_the_command_lines_message(cli, tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text("prediction: cusp\ncoupling: g2\norders:\n  - loop: 1\n    exact: \"4\"\n  - loop: 2\n    exact: \"-8 zeta(2\"\n")
    with pytest.raises(loopwise.InputError) as caught:
        loopwise.check(bad)
    message = str(caught.value)
    assert f"{bad}:7:" in message, message
    code, _, err = cli("check", str(bad))
    assert code == 2
    assert cli_message(err) == message


def test_a_missing_file_is_input_error(tmp_path):
    with pytest.raises(loopwise.InputError, match="missing.yaml"):
        loopwise.check(tmp_path / "missing.yaml")
    with pytest.raises(loopwise.InputError, match="missing.yaml"):
        loopwise.origin(tmp_path / "missing.yaml")


def test_identify_needs_a_weight_or_a_basis():
    with pytest.raises(loopwise.InputError, match="needs a weight, a basis, or both"):
        loopwise.identify("1.2020569031595942853997")
    with pytest.raises(loopwise.InputError, match="with_lower=True needs a weight"):
        loopwise.identify("1.2020569031595942853997", basis="zeta(3)", with_lower=True)
