"""Tests for the case-file expression evaluator (fekt.case.expr).

The rejection checks below (whitelisted syntax only, length/depth/exponent
limits, finite results, unknown names, circular references) are common
practice for evaluating untrusted arithmetic; they follow from the design
of the module and do not come from any external source.
"""

from __future__ import annotations

import math

import pytest

from fekt.case.expr import MAX_DEPTH, MAX_LENGTH, evaluate, resolve_parameters
from fekt.errors import CaseError, InputError

ITEM = "cutouts[1].diameter"


def ev(text, params=None):
    return evaluate(text, params or {}, item=ITEM)


def expect_error(text, params=None, *, contains=None):
    """Evaluate, require a CaseError, and check it names the item and the text."""
    with pytest.raises(CaseError) as info:
        evaluate(text, params or {}, item=ITEM)
    message = str(info.value)
    assert type(info.value) is CaseError
    assert ITEM in message
    assert (contains if contains is not None else text) in message
    return message


# --------------------------------------------------------------------------
# Plain values
# --------------------------------------------------------------------------


@pytest.mark.parametrize("value, expected", [(3, 3.0), (2.5, 2.5), (-1, -1.0), (0, 0.0)])
def test_numbers_pass_through_as_float(value, expected):
    result = ev(value)
    assert result == expected
    assert type(result) is float


def test_case_error_is_an_input_error():
    # The CLI maps InputError to exit code 2.
    with pytest.raises(InputError):
        ev("1/0")


# --------------------------------------------------------------------------
# Arithmetic and precedence
# --------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, expected",
    [
        ("2+3*4", 14.0),
        ("(2+3)*4", 20.0),
        ("2**3**2", 512.0),  # right-associative
        ("-2**2", -4.0),  # the power binds tighter than the sign, as in Python
        ("(-2)**2", 4.0),
        ("2**-1", 0.5),
        ("10 - 4 - 3", 3.0),  # left-associative
        ("12 / 4 / 3", 1.0),
        ("+5", 5.0),
        ("--5", 5.0),
        ("1e-3", 0.001),
        ("2.5E2", 250.0),
        ("  7 / 2  ", 3.5),
        ("(1 +\n 2)", 3.0),
        ("(-8)**3", -512.0),
    ],
)
def test_arithmetic(text, expected):
    assert ev(text) == pytest.approx(expected)


def test_result_is_float():
    assert type(ev("2+2")) is float


# --------------------------------------------------------------------------
# Names, constants, functions
# --------------------------------------------------------------------------


def test_parameters_are_substituted():
    assert ev("D/2 - r", {"D": 20.0, "r": 3.0}) == pytest.approx(7.0)


def test_pi():
    assert ev("pi") == pytest.approx(math.pi)
    assert ev("2*pi*r", {"r": 1.0}) == pytest.approx(2 * math.pi)


@pytest.mark.parametrize(
    "text, expected",
    [
        ("sin(30)", 0.5),
        ("cos(60)", 0.5),
        ("tan(45)", 1.0),
        ("sin(90)", 1.0),
        ("cos(90)", 0.0),
        ("sin(180)", 0.0),
        ("sin(-30)", -0.5),
        ("sin(390)", 0.5),
        ("cos(45)", math.sqrt(0.5)),
        ("tan(30)", 1 / math.sqrt(3)),
        ("asin(0.5)", 30.0),
        ("acos(0.5)", 60.0),
        ("atan(1)", 45.0),
        ("atan2(1, 1)", 45.0),
        ("atan2(1, -1)", 135.0),
        ("radians(180)", math.pi),
        ("degrees(pi)", 180.0),
    ],
)
def test_trig_works_in_degrees(text, expected):
    assert ev(text) == pytest.approx(expected, abs=1e-12)


def test_trig_is_exact_at_right_angles():
    # A point at cos(90)*r must lie exactly on the axis, not 6e-17 off it.
    assert ev("cos(90)") == 0.0
    assert ev("sin(180)") == 0.0
    assert ev("sin(30)") == 0.5


@pytest.mark.parametrize(
    "text, expected",
    [
        ("sqrt(16)", 4.0),
        ("sqrt(2)**2", 2.0),
        ("abs(-3)", 3.0),
        ("min(3, 1, 2)", 1.0),
        ("max(3, 1, 2)", 3.0),
        ("max(4)", 4.0),
        ("sqrt(D**2 - d**2)", 8.0),
    ],
)
def test_other_functions(text, expected):
    assert ev(text, {"D": 10.0, "d": 6.0}) == pytest.approx(expected)


# --------------------------------------------------------------------------
# Rejections: forbidden syntax
# --------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, rule",
    [
        ("__import__('os')", "unknown function '__import__'"),
        ("a.b", "attribute access"),
        ("().__class__", "attribute access"),
        ("(1).real", "attribute access"),
        ("sqrt.__call__(4)", "only calls of the built-in functions"),
        ("x[0]", "subscripts"),
        ("1 < 2", "comparisons"),
        ("1 == 1", "comparisons"),
        ("lambda: 1", "lambda"),
        ("(lambda: 1)()", "only calls of the built-in functions"),
        ("'abc'", "strings"),
        ("1 + 'a'", "strings"),
        ("b'x'", "strings"),
        ("1 if 1 else 2", "conditional"),
        ("1 and 2", "boolean operators"),
        ("not 1", "'not'"),
        ("~1", "'~'"),
        ("7 // 2", "'//'"),
        ("7 % 2", "'%'"),
        ("1 | 2", "'|'"),
        ("[1, 2]", "lists"),
        ("(1, 2)", "tuples"),
        ("{1: 2}", "dictionaries"),
        ("[x for x in y]", "comprehensions"),
        ("sqrt(x=4)", "keyword arguments"),
        ("max(*a)", "starred arguments"),
        ("1j", "complex"),
        ("True", "literal True"),
        ("None", "literal None"),
        ("f'{1}'", "f-strings"),
        ("(x := 1)", "assignment"),
    ],
)
def test_forbidden_syntax_is_rejected(text, rule):
    message = expect_error(text, {"a": 1.0, "x": 1.0, "y": 1.0})
    assert rule in message


@pytest.mark.parametrize("text", ["1 +", "a b", "sqrt(2", ")", "import os", "x = 1"])
def test_syntax_errors(text):
    message = expect_error(text, {"a": 1.0, "b": 1.0, "x": 1.0})
    assert "syntax error" in message


def test_syntax_error_reports_position():
    message = expect_error("a b", {"a": 1.0, "b": 1.0})
    assert "column 3" in message


def test_empty_expression():
    with pytest.raises(CaseError, match="empty expression"):
        ev("   ")


# --------------------------------------------------------------------------
# Rejections: names and functions
# --------------------------------------------------------------------------


def test_unknown_name_suggests_close_match():
    with pytest.raises(CaseError) as info:
        evaluate("rr/2", {"r": 1.0}, item="parameters.r")
    message = str(info.value)
    assert message.startswith("parameters.r: unknown name 'rr' in expression 'rr/2'")
    assert "did you mean 'r'?" in message
    assert info.value.hint == "did you mean 'r'?"


def test_unknown_name_without_close_match_lists_known():
    message = expect_error("zzz + 1", {"D": 1.0})
    assert "unknown name 'zzz'" in message
    assert "known parameters: D" in message


def test_unknown_function_suggests_close_match():
    message = expect_error("sqr(4)")
    assert "unknown function 'sqr'" in message
    assert "did you mean 'sqrt'?" in message


def test_function_used_without_call():
    message = expect_error("sqrt")
    assert "must be called" in message


@pytest.mark.parametrize("text", ["sqrt(1, 2)", "atan2(1)", "min()"])
def test_wrong_argument_count(text):
    message = expect_error(text)
    assert "takes" in message


def test_parameters_may_not_shadow_builtins_in_evaluate():
    message = expect_error("pi * 2", {"pi": 3.0}, contains="'pi'")
    assert "reserved" in message


# --------------------------------------------------------------------------
# Rejections: limits and non-finite results
# --------------------------------------------------------------------------


def test_too_long():
    text = "1+" * (MAX_LENGTH // 2) + "1"
    message = expect_error(text, contains=text[:40])
    assert f"limit is {MAX_LENGTH}" in message


def test_length_limit_is_inclusive():
    # Exactly MAX_LENGTH characters is allowed (depth kept small on purpose).
    text = "1" + " " * (MAX_LENGTH - 2) + "1"
    with pytest.raises(CaseError, match="syntax error"):
        ev(text)  # reaches the parser, i.e. passed the length check
    assert ev("(" + " " * (MAX_LENGTH - 3) + "7)") == 7.0


def test_too_deep_unary_chain():
    text = "-" * (MAX_DEPTH + 5) + "1"
    message = expect_error(text)
    assert f"more than {MAX_DEPTH} levels" in message


def test_too_deep_nested_calls():
    text = "sqrt(" * (MAX_DEPTH + 1) + "1" + ")" * (MAX_DEPTH + 1)
    message = expect_error(text, contains="sqrt(sqrt(")
    assert "levels deep" in message


def test_depth_within_limit_is_fine():
    assert ev("sqrt(" * 10 + "1" + ")" * 10) == 1.0


@pytest.mark.parametrize("text", ["1/0", "D/(r-r)", "0**-1"])
def test_division_by_zero(text):
    message = expect_error(text, {"D": 1.0, "r": 2.0})
    assert "division by zero" in message


@pytest.mark.parametrize(
    "text, rule",
    [
        ("10**1000", "exceeds the limit"),
        ("2**-101", "exceeds the limit"),
        ("9**9**9", "exceeds the limit"),
        ("1e300**2", "overflows"),
        ("1e308*10", "not a finite number"),
        ("1e308+1e308", "not a finite number"),
        ("1e999", "too large"),
        ("(-8)**(1/3)", "non-integer exponent"),
    ],
)
def test_huge_exponent_and_overflow(text, rule):
    message = expect_error(text)
    assert rule in message


@pytest.mark.parametrize("text", ["sqrt(-1)", "asin(2)", "acos(-1.5)", "tan(90)", "tan(-270)"])
def test_domain_errors(text):
    message = expect_error(text)
    assert "undefined" in message


# --------------------------------------------------------------------------
# Rejections: value types
# --------------------------------------------------------------------------


@pytest.mark.parametrize("value", [True, False])
def test_bool_rejected(value):
    message = expect_error(value, contains=repr(value))
    assert "boolean" in message


@pytest.mark.parametrize("value", [[1, 2], None, {"a": 1}, (1,), b"1"])
def test_non_number_non_string_rejected(value):
    message = expect_error(value, contains=repr(value))
    assert "expected a number or an expression string" in message


@pytest.mark.parametrize("value", [math.inf, -math.inf, math.nan, 10**400])
def test_non_finite_numbers_rejected(value):
    message = expect_error(value, contains="not a finite number")
    assert ITEM in message


# --------------------------------------------------------------------------
# resolve_parameters
# --------------------------------------------------------------------------


def test_resolve_plain_numbers():
    assert resolve_parameters({"D": 20, "r": 2.5}) == {"D": 20.0, "r": 2.5}


def test_resolve_chained_in_any_order():
    raw = {"h": "(D - d)/2", "d": "D - 2*t", "D": 20, "t": "r * 2", "r": 1.5}
    result = resolve_parameters(raw)
    assert result == pytest.approx({"h": 3.0, "d": 14.0, "D": 20.0, "t": 3.0, "r": 1.5})
    # Order of the input is kept, which keeps reports readable.
    assert list(result) == list(raw)


def test_resolved_parameters_feed_evaluate():
    params = resolve_parameters({"w": 40, "angle": 30, "rise": "w * tan(angle)"})
    assert evaluate("rise / w", params, item="x") == pytest.approx(math.tan(math.radians(30)))


def test_resolve_empty():
    assert resolve_parameters({}) == {}


def test_resolve_unknown_name_with_hint():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"r": 2, "h": "rr/2"})
    message = str(info.value)
    assert type(info.value) is CaseError
    assert message.startswith("parameters.h: unknown name 'rr' in expression 'rr/2'")
    assert "did you mean 'r'?" in message


def test_resolve_uses_item_prefix():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"a": "nope"}, item_prefix="studies[0].parameters")
    assert str(info.value).startswith("studies[0].parameters.a:")
    assert "'nope'" in str(info.value)


def test_resolve_two_parameter_cycle():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"a": "b", "b": "a"})
    message = str(info.value)
    assert type(info.value) is CaseError
    assert "parameters.a" in message
    assert "circular reference: a -> b -> a" in message


def test_resolve_self_reference():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"a": "a + 1"})
    message = str(info.value)
    assert "parameters.a" in message
    assert "circular reference: a -> a" in message


def test_resolve_longer_cycle_behind_valid_parameters():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"x": 1, "a": "b + x", "b": "c", "c": "2*a"})
    assert "a -> b -> c -> a" in str(info.value)


def test_resolve_long_chain_does_not_hit_recursion_limit():
    raw = {f"p{i}": f"p{i + 1} + 1" for i in range(2000)}
    raw["p2000"] = 0
    assert resolve_parameters(raw)["p0"] == 2000.0


@pytest.mark.parametrize("name", ["pi", "sqrt", "sin", "max"])
def test_resolve_rejects_shadowing(name):
    with pytest.raises(CaseError) as info:
        resolve_parameters({name: 1})
    message = str(info.value)
    assert f"parameters.{name}" in message
    assert "reserved" in message


@pytest.mark.parametrize("name", ["1a", "a-b", "", "lambda", "a b"])
def test_resolve_rejects_non_identifiers(name):
    with pytest.raises(CaseError) as info:
        resolve_parameters({name: 1})
    assert repr(name) in str(info.value)
    assert "not a valid identifier" in str(info.value)


def test_resolve_rejects_non_string_name():
    with pytest.raises(CaseError, match="not a string"):
        resolve_parameters({1: 2})


def test_resolve_rejects_non_mapping():
    with pytest.raises(CaseError, match="expected a table"):
        resolve_parameters([("a", 1)])


@pytest.mark.parametrize("value", [True, [1], None])
def test_resolve_rejects_bad_values(value):
    with pytest.raises(CaseError) as info:
        resolve_parameters({"a": value})
    message = str(info.value)
    assert "parameters.a" in message
    assert repr(value) in message


def test_resolve_rejects_forbidden_syntax_in_value():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"a": "().__class__"})
    message = str(info.value)
    assert "parameters.a" in message
    assert "().__class__" in message
    assert "attribute access" in message


def test_resolve_reports_evaluation_errors_with_item():
    with pytest.raises(CaseError) as info:
        resolve_parameters({"r": 0, "k": "1/r"})
    message = str(info.value)
    assert "parameters.k" in message
    assert "'1/r'" in message
    assert "division by zero" in message
