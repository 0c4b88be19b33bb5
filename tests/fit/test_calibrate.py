"""Calibration against exact inversions of closed forms."""

import json
import math

import pytest
from typer.testing import CliRunner

from holostring.background import load_background
from holostring.cli import app
from holostring.errors import BackgroundFileError, InputError
from holostring.fit.calibrate import calibrate
from holostring.fit.observables import parse_observable
from holostring.fit.targets import parse_targets, unit_factor
from holostring.units import HBARC_GEV_FM


def targets(obs, value, unc, unit, free=("c",), fixed=None, predict=()):
    doc = {
        "parameters": {n: {"free": True} for n in free},
        "targets": [{"observable": obs, "value": value, "uncertainty": unc, "unit": unit}],
    }
    for k, v in (fixed or {}).items():
        doc["parameters"][k] = {"value": v}
    if predict:
        doc["predict"] = {"observables": list(predict)}
    return parse_targets(doc)


def test_string_tension_inverts_the_closed_form():
    # soft wall sigma = g e c / 2 (Andreev-Zakharov hep-ph/0604204): c = 2 sigma/(g e)
    res = calibrate(
        load_background("soft-wall"), targets("string_tension", 0.18, 0.01, "GeV^2", fixed={"g": 1.0})
    )
    assert res.converged
    assert res.values["c"] == pytest.approx(2 * 0.18 / math.e, rel=1e-10)
    # linear propagation: dc = 2 dsigma / e
    assert res.uncertainties["c"] == pytest.approx(2 * 0.01 / math.e, rel=1e-6)
    assert res.units["c"] == "GeV^2"
    assert res.dof == 0 and res.chi2 < 1e-16


def test_sqrt_sigma_in_mev_and_prediction_of_sigma():
    res = calibrate(
        load_background("soft-wall", g=2.0),
        targets("sqrt_string_tension", 440.0, 10.0, "MeV", predict=["string_tension"]),
    )
    c = 2 * 0.44**2 / (2.0 * math.e)
    assert res.values["c"] == pytest.approx(c, rel=1e-10)
    sigma = next(p for p in res.predictions if p.observable == "string_tension")
    assert sigma.value == pytest.approx(0.44**2, rel=1e-10)
    # d sigma = 2 sqrt(sigma) d sqrt(sigma)
    assert sigma.uncertainty == pytest.approx(2 * 0.44 * 0.010, rel=1e-6)


def test_overdetermined_fit_has_chi2():
    doc = {
        "parameters": {"z0": {"free": True}, "g": {"value": 1.0}},
        "targets": [
            {"observable": "string_tension", "value": 0.16, "uncertainty": 0.01, "unit": "GeV^2"},
            {"observable": "sqrt_string_tension", "value": 0.42, "uncertainty": 0.01, "unit": "GeV"},
        ],
    }
    res = calibrate(load_background("hard-wall"), parse_targets(doc))
    # hard wall sigma = g/z0^2 (KSS hep-th/9811192): weighted least squares in sigma(z0)
    assert res.converged and res.dof == 1
    assert res.chi2 > 0
    s = 1 / res.values["z0"] ** 2
    # stationarity of chi^2 in s: (s - .16)/.01^2 + (sqrt(s) - .42)/(.01^2 * 2 sqrt(s)) = 0
    grad = (s - 0.16) / 0.01**2 + (math.sqrt(s) - 0.42) / (0.01**2 * 2 * math.sqrt(s))
    assert abs(grad) < 1e-6 * (1 / 0.01**2)


def test_units():
    # hbar c = 0.1973269804 GeV fm (CODATA, common practice)
    assert unit_factor("fm", -1) == pytest.approx(1 / HBARC_GEV_FM)
    assert unit_factor("MeV^2", 2) == pytest.approx(1e-6)
    with pytest.raises(ValueError, match="mass dimension"):
        unit_factor("GeV", 2)
    with pytest.raises(ValueError, match="unknown unit"):
        unit_factor("furlong", 1)


@pytest.mark.parametrize(
    ("doc", "key"),
    [
        ({"parameters": {"c": {"free": True}}, "targets": []}, "targets"),
        (
            {
                "parameters": {},
                "targets": [{"observable": "r0", "value": 0.5, "uncertainty": 0.01, "unit": "fm"}],
            },
            "parameters",
        ),
        (
            {
                "parameters": {"c": {"free": True}},
                "targets": [{"observable": "nonsense", "value": 1, "uncertainty": 1}],
            },
            "targets[0].observable",
        ),
        (
            {
                "parameters": {"c": {"free": True}},
                "targets": [{"observable": "r0", "value": 1, "uncertainty": -1, "unit": "fm"}],
            },
            "targets[0].uncertainty",
        ),
        (
            {
                "parameters": {"c": {"free": True}},
                "targets": [{"observable": "r0", "value": 1, "uncertainty": 1, "unit": "GeV"}],
            },
            "targets[0].unit",
        ),
        (
            {
                "parameters": {"c": {"free": "yes"}},
                "targets": [{"observable": "r0", "value": 1, "uncertainty": 1, "unit": "fm"}],
            },
            "parameters.c",
        ),
        ({"oops": {}}, "oops"),
    ],
)
def test_bad_targets(doc, key):
    with pytest.raises(BackgroundFileError) as info:
        parse_targets(doc)
    assert f"'{key}'" in str(info.value)


def test_unknown_free_parameter():
    with pytest.raises(InputError, match="parameter q"):
        calibrate(load_background("soft-wall"), targets("string_tension", 0.2, 0.01, "GeV^2", free=("q",)))


def test_observable_specs():
    assert parse_observable("mass:vector-meson:0").args == ("vector-meson", 0)
    assert parse_observable("ratio:tensor-glueball:0/scalar-glueball:0").dimension == 0
    assert parse_observable("screening_length:T=0.2").args == (0.2,)
    with pytest.raises(InputError):
        parse_observable("screening_length:T=-1")


def test_cli_calibrate(tmp_path):
    tf = tmp_path / "t.toml"
    tf.write_text(
        '[parameters.c]\nfree = true\n[[targets]]\nobservable = "string_tension"\nvalue = 0.2\n'
        'uncertainty = 0.01\nunit = "GeV^2"\n'
    )
    out = tmp_path / "out"
    r = CliRunner().invoke(app, ["calibrate", "soft-wall", str(tf), "--json", "--out", str(out)])
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout)
    assert d["fitted"]["c"]["value"] == pytest.approx(0.4 / math.e, rel=1e-10)
    assert {p.name for p in out.iterdir()} == {"calibration.json", "predictions.csv", "residuals.png"}
    bad = CliRunner().invoke(app, ["calibrate", "soft-wall", str(tmp_path / "missing.toml")])
    assert bad.exit_code == 2 and "no such file" in bad.stderr


def test_rho_mass_fixes_c():
    # m_rho^2 = 4c (Karch-Katz-Son-Stephanov hep-ph/0602229, vector mesons m_n^2 = 4c(n+1));
    # rho mass 0.775 GeV (PDG, from memory, rounded): c = 0.775^2/4 = 0.15015625 GeV^2
    res = calibrate(load_background("soft-wall"), targets("mass:vector-meson:0", 0.775, 0.001, "GeV"))
    assert res.converged
    assert res.values["c"] == pytest.approx(0.775**2 / 4, rel=1e-9)
    assert f"{res.values['c']:.3f}" == "0.150"
    # dc = (m/2) dm
    assert res.uncertainties["c"] == pytest.approx(0.775 / 2 * 0.001, rel=1e-5)


def test_example_targets_file_loads():
    from pathlib import Path

    from holostring.fit.targets import load_targets

    root = Path(__file__).resolve().parents[2] / "examples" / "targets"
    for path in root.glob("*.toml"):
        ts = load_targets(path)
        assert ts.targets and ts.free
        assert all(t.source for t in ts.targets)


def test_two_parameter_string_calibration_reproduces_targets():
    # Targets: sqrt(sigma) = 0.44 GeV (lattice, common practice; Bali hep-ph/0001312, from memory)
    # and r0 = 0.5 fm (Sommer hep-lat/9310022, from memory). Recomputed independently afterwards:
    # sigma from the closed form g e c/2 (Andreev-Zakharov hep-ph/0604204), r0 from a fresh V(L).
    from pathlib import Path

    from holostring.fit.targets import load_targets
    from holostring.strings import compute_potential

    path = Path(__file__).resolve().parents[2] / "examples" / "targets" / "lattice-hadrons.toml"
    ts = load_targets(path)
    ts = type(ts)(ts.targets, ts.free, ts.fixed, (), ts.energy_unit, ts.origin)  # no extra predictions
    res = calibrate(load_background("soft-wall"), ts)
    assert res.converged, res.message
    c, g = res.values["c"], res.values["g"]
    assert math.sqrt(g * math.e * c / 2) == pytest.approx(0.44, rel=1e-8)
    pot = compute_potential(load_background("soft-wall", c=c, g=g))
    assert pot.r0 * HBARC_GEV_FM == pytest.approx(0.5, rel=1e-7)
    assert -1 < res.correlation[0, 1] < 1


def test_exact_gradients_match_finite_differences():
    # sigma = g e c/2 (Andreev-Zakharov hep-ph/0604204): d sigma/dc = g e/2, d sigma/dg = e c/2;
    # vector mesons m_n^2 = 4c(n+1) (KKSS hep-ph/0602229): d m_n^2/dc = 4(n+1)
    from holostring.fit.observables import gradient

    bg = load_background("soft-wall", c=0.7, g=1.3)
    d = gradient(bg, parse_observable("string_tension"), ["c", "g"])
    assert d == pytest.approx([1.3 * math.e / 2, 0.7 * math.e / 2], rel=1e-12)
    d = gradient(bg, parse_observable("mass_squared:vector-meson:2"), ["c", "g"])
    assert d == pytest.approx([12.0, 0.0], abs=1e-8)
    # hard wall sigma = g/z0^2 at the wall (the wall moves with z0): d sigma/dz0 = -2 g/z0^3
    hw = load_background("hard-wall", z0=2.0, g=1.5)
    assert gradient(hw, parse_observable("string_tension"), ["z0"]) == pytest.approx(
        [-2 * 1.5 / 8], rel=1e-12
    )
    # r0 has no exact formula here: finite differences are used
    assert gradient(bg, parse_observable("r0"), ["c"]) is None


def test_calibration_records_how_gradients_were_taken():
    t = targets("mass:vector-meson:0", 0.775, 0.001, "GeV")
    exact = calibrate(load_background("soft-wall"), t)
    fd = calibrate(load_background("soft-wall"), t, exact_gradients=False)
    assert "Hellmann-Feynman" in exact.provenance.settings["gradients"]["mass:vector-meson:0"]
    assert "differences" in fd.provenance.settings["gradients"]["mass:vector-meson:0"]
    assert exact.values["c"] == pytest.approx(fd.values["c"], rel=1e-10)
    assert exact.uncertainties["c"] == pytest.approx(fd.uncertainties["c"], rel=1e-6)
