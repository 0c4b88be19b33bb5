"""The formula parser against malicious, malformed and random input."""

import pytest
import sympy as sp
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from holostring.background.formula import Z, parse_formula
from holostring.errors import FormulaError

C = sp.Symbol("c", positive=True)


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("exp(c*z^2/2)/z^2", sp.exp(C * Z**2 / 2) / Z**2),
        ("exp(c*z**2/2)/z**2", sp.exp(C * Z**2 / 2) / Z**2),
        ("-z^2", -(Z**2)),
        ("0.25*z", Z / 4),
        ("sqrt(1 - z^4)", sp.sqrt(1 - Z**4)),
        ("pi*z", sp.pi * Z),
        ("2^3^2", sp.Integer(512)),  # right-associative, as in mathematics
    ],
)
def test_valid_formulas(text, expected):
    assert sp.simplify(parse_formula(text, {"c": C}) - expected) == 0


@pytest.mark.parametrize(
    ("text", "reason"),
    [
        ('__import__("os").system("touch /tmp/holostring-pwned")', "attribute"),
        ("__import__('os')", "dunder"),
        ("z.__class__", "attribute"),
        ("(lambda: 1)()", "named functions"),
        ("lambda z: z", "lambda"),
        ("__builtins__", "dunder"),
        ("open('x')", "unknown function"),
        ("eval('1')", "unknown function"),
        ("[z for z in ()]", "comprehension"),
        ("z[0]", "subscript"),
        ("z if 1 else 2", "conditional"),
        ("'text'", "numbers"),
        ("exp(z, 2)", "argument"),
        ("exp(x=z)", "keyword"),
        ("z < 1", "comparison"),
        ("(z", "syntax"),
        ("q*z", "undeclared"),
        ("9**9**9", "exponent"),
        ("1e999", "finite"),
        ("z/0", "division"),
        ("", "empty"),
        ("z\n+1", "single line"),
        ("z & 1", "not allowed"),
        ("not z", "only unary"),
    ],
)
def test_refused_constructs_name_the_reason(text, reason):
    with pytest.raises(FormulaError) as info:
        parse_formula(text, {"c": C})
    assert reason in str(info.value)


def test_nothing_runs(tmp_path):
    target = tmp_path / "pwned"
    for text in [f'__import__("os").system("touch {target}")', f"open('{target}', 'w')"]:
        with pytest.raises(FormulaError):
            parse_formula(text)
    assert not target.exists()


ALPHABET = st.sampled_from(
    list("z c+-*/^().,_ 0123456789eaxpsqrtlogin[]{}'\"=<>!@#$%&|~`:;\\")
    + ["exp", "__", "lambda", "import", "os", "sqrt(", "**"]
)


@settings(max_examples=400, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(ALPHABET, max_size=30).map("".join))
def test_random_text_gives_an_expression_or_a_clear_error(text):
    try:
        out = parse_formula(text, {"c": C})
    except FormulaError as err:
        assert str(err)
        assert "\n" not in str(err)
    else:
        assert isinstance(out, sp.Basic)
        assert out.free_symbols <= {Z, C}


@settings(max_examples=200, deadline=None)
@given(st.text(max_size=60))
def test_arbitrary_unicode_never_escapes(text):
    try:
        parse_formula(text, {"c": C})
    except FormulaError:
        pass
