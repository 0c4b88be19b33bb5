"""Background files: good ones load, bad ones get one clear line naming file and key."""

import math

import pytest

from holostring.background import load_background
from holostring.errors import BackgroundFileError, HolostringError, InputError

GOOD = """
[background]
name = "demo"
[parameters.a]
default = 0.5
range = "(0, 5]"
dimension = 2
[metric]
warp = "exp(a*z^2/2)/z^2"
"""


def write(tmp_path, text, name="bg.toml"):
    p = tmp_path / name
    p.write_text(text)
    return str(p)


def test_good_file(tmp_path):
    bg = load_background(write(tmp_path, GOOD))
    assert bg.params == {"a": 0.5, "g": 1.0}
    assert bg.origin_hash and len(bg.origin_hash) == 64


@pytest.mark.parametrize(
    ("text", "key", "words"),
    [
        ("[background\n", None, "malformed TOML"),
        (GOOD + "\n[extra]\nx = 1\n", "extra", "unknown table"),
        (GOOD.replace("dimension = 2", "dimension = 2\ncolour = 1"), "parameters.a.colour", "unknown key"),
        (
            GOOD.replace('warp = "exp(a*z^2/2)/z^2"', 'warp = "exp(b*z^2)/z^2"'),
            "metric.warp",
            "undeclared symbol 'b'",
        ),
        (
            GOOD.replace('warp = "exp(a*z^2/2)/z^2"', "warp = \"__import__('os').system('true')\""),
            "metric.warp",
            "attribute",
        ),
        (GOOD.replace('warp = "exp(a*z^2/2)/z^2"', 'warp = "z.real"'), "metric.warp", "attribute"),
        (
            GOOD.replace('warp = "exp(a*z^2/2)/z^2"', 'warp = "(lambda: 1)()"'),
            "metric.warp",
            "named functions",
        ),
        (GOOD.replace('warp = "exp(a*z^2/2)/z^2"', 'warp = "__class__"'), "metric.warp", "dunder"),
        (GOOD.replace('warp = "exp(a*z^2/2)/z^2"', 'warp = "exp(z^2"'), "metric.warp", "syntax error"),
        (GOOD.replace("default = 0.5", "default = 7"), "parameters.a.default", "outside the allowed range"),
        (GOOD.replace('range = "(0, 5]"', 'range = "(5, 0)"'), "parameters.a.range", "empty"),
        (
            GOOD.replace('name = "demo"', 'name = "demo"\nframe = "jordan"'),
            "background.frame",
            "must be one of",
        ),
        (GOOD.replace("[parameters.a]", "[parameters.z]"), "parameters.z", "reserved"),
        (GOOD.replace("[parameters.a]", "[parameters.exp]"), "parameters.exp", "function"),
        (GOOD + '\n[ir]\nkind = "wall"\n', "ir.at", "needs its position"),
        (GOOD + '\n[ir]\nkind = "wall"\nat = "z"\n', "ir.at", "cannot depend on z"),
        ("[background]\nname='x'\n[metric]\nG_tt = '1/z^2'\n", "metric.G_xx", "missing"),
    ],
)
def test_bad_files(tmp_path, text, key, words):
    path = write(tmp_path, text)
    with pytest.raises(BackgroundFileError) as info:
        load_background(path)
    msg = str(info.value)
    assert path in msg
    if key:
        assert f"'{key}'" in msg
    assert words in msg
    assert "\n" not in msg


def test_negative_metric_component_is_refused(tmp_path):
    # (1 - z) turns negative at z > 1 on an infinite domain
    path = write(tmp_path, "[background]\nname='neg'\n[metric]\nwarp = '(1 - z)/z^2'\n")
    with pytest.raises(InputError) as info:
        load_background(path)
    assert "G_tt" in str(info.value) and "negative" in str(info.value)


def test_parameter_that_makes_the_metric_negative(tmp_path):
    path = write(
        tmp_path, "[background]\nname='q'\n[parameters.q]\ndefault=0\n[metric]\nwarp = '(1 + q*z^2)/z^2'\n"
    )
    load_background(path)
    with pytest.raises(InputError, match="vanishes or turns negative"):
        load_background(path, q=-1.0)


def test_missing_required_parameter(tmp_path):
    path = write(
        tmp_path, "[background]\nname='r'\n[parameters.a]\nrange='(0, inf)'\n[metric]\nwarp='exp(a*z)/z^2'\n"
    )
    with pytest.raises(InputError, match="parameter a: has no default"):
        load_background(path)
    assert load_background(path, a=1.0).params["a"] == 1.0


@pytest.mark.parametrize(
    ("value", "words"),
    [
        (math.nan, "not a finite"),
        (math.inf, "not a finite"),
        (-1.0, "outside the allowed range"),
        ("1", "expected a number"),
        (True, "expected a number"),
    ],
)
def test_bad_parameter_values(value, words):
    with pytest.raises(InputError) as info:
        load_background("soft-wall", c=value)
    assert "parameter c" in str(info.value) and words in str(info.value)


def test_unknown_parameter():
    with pytest.raises(InputError, match="unknown for background 'soft-wall'"):
        load_background("soft-wall", q=1.0)


def test_unknown_background():
    with pytest.raises(HolostringError, match="neither a catalogue name"):
        load_background("no-such-thing")


def test_with_params_is_immutable_and_shares_compiled_functions():
    a = load_background("soft-wall", c=1.0)
    f = a.function("F")
    b = a.with_params(c=2.0)
    assert a.params["c"] == 1.0 and b.params["c"] == 2.0
    assert b.raw_function("F") is a.raw_function("F")
    assert f(1.0) == pytest.approx(math.exp(0.5))
    assert b.function("F")(1.0) == pytest.approx(math.exp(1.0))
    with pytest.raises(AttributeError):
        a.name = "x"
