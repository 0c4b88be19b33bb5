"""Scan plans: grid and random points from NAME=START:STOP:COUNT specs; bad specs name the field."""

import numpy as np
import pytest

from holostring.errors import InputError
from holostring.scan import grid_plan, parse_vary, random_plan


def test_grid_values_match_numpy_linspace_and_geomspace():
    # common practice: evenly spaced values with both ends included (numpy.linspace/geomspace)
    assert parse_vary("c=0.5:2:7").grid() == tuple(np.linspace(0.5, 2, 7))
    got = parse_vary("c=0.01:100:5:log").grid()
    assert got == pytest.approx(np.geomspace(0.01, 100, 5), rel=1e-15)
    assert got[0] == 0.01 and got[-1] == 100.0
    assert parse_vary("c=3,1,2").grid() == (3.0, 1.0, 2.0)
    assert parse_vary("c=2:2:1").grid() == (2.0,)


def test_grid_is_cartesian_product_last_axis_fastest():
    plan = grid_plan(["c=1:3:3", "g=10:20:2"])
    assert plan.shape == (3, 2)
    assert plan.points == ((1, 10), (1, 20), (2, 10), (2, 20), (3, 10), (3, 20))
    assert plan.names == ("c", "g")


def test_random_points_are_seeded_and_inside_the_ranges():
    a = random_plan(["c=-1:1", "g=0.1:10:log"], 200, seed=7)
    b = random_plan(["c=-1:1", "g=0.1:10:log"], 200, seed=7)
    c = random_plan(["c=-1:1", "g=0.1:10:log"], 200, seed=8)
    assert a.points == b.points and a.points != c.points
    pts = np.array(a.points)
    assert pts.shape == (200, 2)
    assert (pts[:, 0] >= -1).all() and (pts[:, 0] <= 1).all()
    assert (pts[:, 1] >= 0.1).all() and (pts[:, 1] <= 10).all()
    # log-uniform: about half the samples below the geometric midpoint 1 (binomial, 200 draws)
    assert 70 < (pts[:, 1] < 1).sum() < 130
    assert a.fingerprint() != c.fingerprint()


@pytest.mark.parametrize(
    ("spec", "words"),
    [
        ("c", "NAME=START:STOP:COUNT"),
        ("c=1:2:x", "COUNT 'x' is not a whole number"),
        ("c=1:2:0", "at least 1"),
        ("c=a:2:3", "'a' is not a number"),
        ("c=1:inf:3", "not a finite number"),
        ("c=1:1:3", "START and STOP are equal"),
        ("c=-1:2:3:log", "above 0"),
        ("c=1:2:3:4", "START:STOP:COUNT"),
        ("c=1,1", "listed twice"),
        ("2c=1:2:3", "not a parameter name"),
    ],
)
def test_bad_specs_name_the_field(spec, words):
    with pytest.raises(InputError) as info:
        parse_vary(spec)
    assert info.value.field.startswith("--vary")
    assert words in str(info.value)


def test_grid_needs_count_and_names_once():
    with pytest.raises(InputError, match="COUNT is missing"):
        grid_plan(["c=1:2"])
    with pytest.raises(InputError, match="given twice"):
        grid_plan(["c=1:2:3", "c=1:2:3"])
    with pytest.raises(InputError, match="whole number"):
        random_plan(["c=1:2"], 0)
    with pytest.raises(InputError, match="not a list"):
        random_plan(["c=1,2"], 5)
