"""Each catalogue entry against its published form."""

import filecmp
import math
from pathlib import Path

import numpy as np
import pytest
import sympy as sp

from holostring.background import catalogue, load_background
from holostring.background.diagnostics import diagnose
from holostring.background.formula import Z
from tests.background.reference import black_brane_temperature

ROOT = Path(__file__).resolve().parents[2]


def test_catalogue_has_the_promised_names():
    for name in [
        "ads",
        "ads-black-brane",
        "ads-soliton",
        "hard-wall",
        "hard-wall-black-brane",
        "soft-wall",
        "soft-wall-black-brane",
        "d4-soliton",
    ]:
        assert name in catalogue.names()


@pytest.mark.parametrize("name", catalogue.names())
def test_every_entry_cites_a_source_and_has_g(name):
    bg = load_background(name)
    assert "hep-" in bg.source or "Phys" in bg.source
    assert bg.g == 1.0
    assert bg.parameter("g").range_text == "(0, inf)"


@pytest.mark.parametrize("name", catalogue.names())
def test_metrics_folder_holds_the_same_files(name):
    # the commented files in metrics/ are the catalogue files, byte for byte
    assert filecmp.cmp(ROOT / "metrics" / f"{name}.toml", catalogue.path_of(name), shallow=False)


def _same(a, b):
    return sp.simplify(a - b) == 0


def test_ads_is_poincare_ads5():
    # ds^2 = (dx^2 + dz^2)/z^2 (Maldacena hep-th/9803002)
    m = load_background("ads").metric("string")
    assert all(_same(m[k], Z**-2) for k in ("G_tt", "G_xx", "G_zz"))


def test_black_brane_form_and_temperature():
    # G_tt = f/z^2, G_zz = 1/(z^2 f), f = 1 - z^4/zh^4; T = 1/(pi zh) (Witten hep-th/9803131)
    bg = load_background("ads-black-brane", zh=0.7)
    zh = bg.symbols["zh"]
    f = 1 - Z**4 / zh**4
    m = bg.metric("string")
    assert _same(m["G_tt"], f / Z**2) and _same(m["G_zz"], 1 / (Z**2 * f))
    assert diagnose(bg).temperature == pytest.approx(black_brane_temperature(0.7), rel=1e-12)


def test_soliton_exchanges_time_and_circle():
    # AdS soliton: G_yy = f/z^2, G_tt = 1/z^2, circle shrinks at z0 (Witten hep-th/9803131)
    bg = load_background("ads-soliton")
    z0 = bg.symbols["z0"]
    m = bg.metric("string")
    assert _same(m["G_yy"], (1 - Z**4 / z0**4) / Z**2)
    assert _same(m["G_tt"], Z**-2)
    assert bg.n_flat == 2


def test_soft_wall_two_conventions():
    # Einstein frame AdS + Phi = c z^2 (Karch-Katz-Son-Stephanov hep-ph/0602229);
    # string frame exp(c z^2/2)/z^2 (Andreev-Zakharov hep-ph/0604204) via g_s = e^{Phi/2} g_E.
    bg = load_background("soft-wall")
    c = bg.symbols["c"]
    assert _same(bg.metric("einstein")["G_xx"], Z**-2)
    assert _same(bg.dilaton, c * Z**2)
    assert _same(bg.metric("string")["G_xx"], sp.exp(c * Z**2 / 2) / Z**2)


def test_d4_soliton_is_not_ads_in_the_uv():
    # string frame G_xx = (U/R)^(3/2) = z^(-3/2) with z = 1/U (Witten hep-th/9803131)
    d = diagnose(load_background("d4-soliton"))
    assert not d.asymptotically_ads
    assert d.uv_power == pytest.approx(-1.5, abs=1e-12)
    assert d.coulomb_coefficient is None


@pytest.mark.parametrize("name", catalogue.names())
def test_numeric_functions_match_symbolic(name):
    bg = load_background(name)
    z_ir = bg.z_ir if math.isfinite(bg.z_ir) else 3.0
    z = np.linspace(0.05, 0.95, 7) * z_ir
    for key in ("F", "H", "dF"):
        expr = bg.expression(key).subs(bg.substitutions())
        exact = np.array([float(sp.N(expr.subs(Z, zi), 20)) for zi in z])
        np.testing.assert_allclose(bg.function(key)(z), exact, rtol=1e-13)
        np.testing.assert_allclose(np.asarray(bg.function(key, backend="jax")(z)), exact, rtol=1e-13)
