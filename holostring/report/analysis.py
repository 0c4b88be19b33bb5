"""The full report of ``holostring analyze``: sections built from an AnalysisResult."""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from holostring.errors import HolostringError
from holostring.report.bundle import FigureBlock, Section, TableBlock, figure_png, write_bundle
from holostring.report.tables import fmt, limits_statement


def _png(obj: Any) -> bytes:
    if hasattr(obj, "savefig"):
        return figure_png(obj)
    first = obj.flat[0] if hasattr(obj, "flat") else obj  # an array of Axes
    return figure_png(first.figure)


def _pm(value: float | None, err: float | None, digits: int = 10) -> str:
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "—"
    if not err:
        return fmt(value, digits)
    return f"{fmt(value, digits)} ± {err:.1e}"


def build_sections(res: Any, profiles: Any = None, fits: dict[str, Any] | None = None) -> list[Section]:
    """Sections of the report, in reading order."""
    fits = regge_fits(res) if fits is None else fits
    sections = [_background(res), _diagnostics(res)]
    if res.calibration is not None:
        sections.insert(0, _calibration(res.calibration))
    if res.potential is not None:
        sections.append(_potential(res, profiles))
    for name, spec in res.spectra.items():
        sections.append(_spectrum(name, spec, fits.get(name)))
    if res.transition is not None or res.screening is not None:
        sections.append(_thermo(res))
    if res.skipped:
        sections.append(
            Section(
                "Analyses not run",
                facts=[(k, v) for k, v in res.skipped.items()],
                paragraphs=["Each analysis that does not apply, or failed, is listed with its reason."],
            )
        )
    return sections


def _background(res: Any) -> Section:
    bg = res.background
    d = bg.describe()
    facts = [("source", d["source"] or d["origin"]), ("origin", d["origin"])]
    if d.get("origin_sha256"):
        facts.append(("file SHA-256", d["origin_sha256"]))
    facts.append(("frame", f"metric written in the {d['frame']} frame; frame rule {d['frame_rule']}"))
    for k, v in d["metric"].items():
        facts.append((k, _math(v)))
    facts.append(("dilaton Phi", _math(d["dilaton"])))
    ir = d["ir_end"]
    facts.append(("IR end", ir["kind"] + (f" at z = {ir['at']}" if ir["at"] else "")))
    rows = [[k, p["value"], p["unit"], p["range"], p["meaning"]] for k, p in d["parameters"].items()]
    return Section(
        f"Background: {bg.title or bg.name}",
        facts=facts,
        tables=[
            TableBlock("parameters", ["parameter", "value", "unit", "range", "meaning"], rows, "parameters")
        ],
    )


def _math(text: str) -> str:
    """sympy's text with ** shown as ^, as physicists write it."""
    return str(text).replace("**", "^")


def _diagnostics(res: Any) -> Section:
    d = res.diagnostics
    facts = [
        ("confining", f"{'yes' if d.confining else 'no'} — {d.criterion}"),
        (
            "UV",
            ("asymptotically AdS5" if d.asymptotically_ads else "not asymptotically AdS")
            + (f" (G_xx ~ z^{d.uv_power:g})" if d.uv_power is not None else ""),
        ),
    ]
    if d.string_tension is not None:
        closed = f" = {_math(d.string_tension_exact)}" if d.string_tension_exact else ""
        facts.append(
            ("string tension sigma", _pm(d.string_tension, d.string_tension_error or None, 12) + closed)
        )
        facts.append(("confinement point z_m", fmt(d.confinement_point, 12)))
    if d.coulomb_coefficient is not None:
        facts.append(
            (
                "Coulomb coefficient kappa (UV)",
                f"{fmt(d.coulomb_coefficient, 12)} = {_math(d.coulomb_coefficient_exact)}",
            )
        )
    if d.expansion_slope is not None:
        facts.append(
            (
                "small-L slope b in V = -kappa/L + C + b L",
                f"{fmt(d.expansion_slope, 12)} = {_math(d.expansion_slope_exact)}",
            )
        )
    if d.crossover_length is not None:
        facts.append(("Coulomb-to-linear crossover sqrt(kappa/sigma)", fmt(d.crossover_length, 8)))
    if d.temperature is not None:
        facts.append(("temperature", fmt(d.temperature, 12)))
    for n in d.notes:
        facts.append(("note", n))
    return Section("Symbolic diagnostics", facts=facts)


def _potential(res: Any, profiles: Any) -> Section:
    from holostring.report import potential as rp

    p = res.potential
    d = res.diagnostics
    phys = p.physical or {}
    facts = [("scheme", f"{p.scheme} (schemes differ by an L-independent constant)")]
    sym = f" (symbolic {fmt(d.string_tension, 12)})" if d.string_tension is not None else ""
    facts.append(("string tension at large L", _pm(p.string_tension, p.errors.get("string_tension")) + sym))
    if p.cornell is not None:
        c = p.cornell
        ek, es, ec = c.errors
        facts.append(
            (
                f"Cornell fit on L in [{fmt(c.L_range[0], 5)}, {fmt(c.L_range[1], 5)}] ({c.points} points, {c.weights} weights)",
                f"kappa = {_pm(c.kappa, ek, 8)}, sigma = {_pm(c.sigma, es, 8)}, C = {_pm(c.C, ec, 8)}",
            )
        )
    for key in ("r0", "r1"):
        val = getattr(p, key)
        extra = f" = {fmt(phys[f'{key}_fm'], 6)} fm" if phys.get(f"{key}_fm") is not None else ""
        facts.append(
            (
                f"Sommer scale {key}",
                _pm(val, p.errors.get(key)) + extra
                if val is not None
                else (p.notes.get(key) or "no solution"),
            )
        )
    if p.max_separation is not None:
        facts.append(("max separation L_max", _pm(p.max_separation, p.errors.get("max_separation"))))
    if p.screening_length is not None:
        facts.append(("screening length", _pm(p.screening_length, p.errors.get("screening_length"))))
    facts.append(
        (
            "error estimate (two resolutions)",
            f"{p.error_estimate:.1e}; " + ("converged" if p.converged else "NOT CONVERGED: " + p.message),
        )
    )
    for k, v in p.notes.items():
        if k not in ("r0", "r1"):
            facts.append((f"note ({k})", v))
    figs = [
        FigureBlock(
            "potential",
            _png(rp.plot_potential(p)),
            "V(L) of the minimum-energy string, Cornell fit and asymptotes",
        )
    ]
    if profiles is not None:
        figs.append(FigureBlock("profiles", _png(rp.plot_profiles(profiles, p)), "string profiles x(z)"))
    if any(b.kind == "disconnected" or not b.stable for b in p.branches):
        figs.append(FigureBlock("branches", _png(rp.plot_branches(p)), "every branch of V(L)"))
    rows = [
        [float(a), float(b), float(c), int(k)]
        for a, b, c, k in zip(p.L, p.V, p.force, p.branch_of_minimum, strict=True)
    ]
    return Section(
        "Static potential V(L)",
        facts=facts,
        figures=figs,
        tables=[
            TableBlock(
                "potential",
                ["L", "V", "force dV/dL", "branch"],
                rows,
                "V(L), minimum-energy configuration",
                show_rows=12,
            )
        ],
    )


def regge_fits(res: Any) -> dict[str, Any]:
    """The Regge fit of every spectrum (None where there are too few states), computed once."""
    from holostring.spectra import fit_regge

    fits: dict[str, Any] = {}
    for name, spec in res.spectra.items():
        try:
            fits[name] = fit_regge(spec) if spec.states >= 3 else None
        except HolostringError:  # too few states: the report simply has no Regge line
            fits[name] = None
    return fits


def _spectrum(name: str, spec: Any, fit: Any) -> Section:
    from holostring.report import spectrum as rs

    gev = spec.masses_in_gev()
    header = ["n", "m^2", "m", "error (m^2)"] + (["m [GeV]"] if gev is not None else [])
    rows = []
    for n in range(spec.states):
        row = [n, float(spec.masses_squared[n]), float(spec.masses[n]), float(spec.error_estimate[n])]
        if gev is not None:
            row.append(float(gev[n]))
        rows.append(row)
    info = spec.channel_info
    facts = [
        (
            "field",
            f"spin {info.get('spin')}, M5^2 = {info.get('mass_squared')}, action factor exp(-{info.get('dilaton_coupling')} Phi), {info.get('frame')} frame",
        ),
        ("boundary conditions", "; ".join(str(v) for v in _boundary_text(spec))),
        ("status", ("converged: " if spec.converged else "NOT CONVERGED: ") + spec.message),
    ]
    if fit is not None:
        facts.append(
            (
                "Regge fit m_n^2 = a n + b",
                f"a = {_pm(fit.slope, fit.slope_error)}, b = {_pm(fit.intercept, fit.intercept_error)}",
            )
        )
    figs = [
        FigureBlock(
            f"spectrum_{name}_potential",
            _png(rs.plot_potential(spec)),
            f"{name}: Schrödinger potential U with the levels",
        ),
        FigureBlock(f"spectrum_{name}_modes", _png(rs.plot_modes(spec)), f"{name}: first normal modes"),
    ]
    if fit is not None:
        figs.append(
            FigureBlock(f"spectrum_{name}_regge", _png(rs.plot_regge(spec, fit)), f"{name}: Regge plot")
        )
    return Section(
        f"Spectrum: {name}",
        facts=facts,
        figures=figs,
        tables=[TableBlock(f"spectrum_{name}", header, rows, f"{name} masses")],
    )


def _boundary_text(spec: Any) -> list[str]:
    b = getattr(spec, "boundaries", None)
    if isinstance(b, dict) and b.get("statement"):
        return [str(b["statement"])]
    return [str(spec.boundary)]


def _thermo(res: Any) -> Section:
    from holostring.report import thermo as rt

    tr, sc = res.transition, res.screening
    facts = []
    figs = []
    tables = []
    if tr is not None:
        tc = (
            _pm(tr.critical_temperature, tr.critical_temperature_error, 12)
            if tr.critical_temperature is not None
            else f"no transition: {tr.message}"
        )
        if tr.critical_temperature_gev is not None:
            tc += f" = {tr.critical_temperature_gev * 1e3:.2f} MeV"
        facts += [
            ("Hawking-Page T_c", tc),
            ("construction", tr.construction),
            ("regularisation", tr.regularisation),
        ]
        facts += [("assumption", a) for a in tr.assumptions]
        facts.append(("status", ("converged: " if tr.converged else "NOT CONVERGED: ") + tr.message))
        figs.append(
            FigureBlock(
                "free_energy",
                _png(rt.plot_free_energy(tr)),
                "free-energy difference black brane − thermal geometry",
            )
        )
        tables.append(
            TableBlock(
                "free_energy",
                ["T", "z_h", "2 kappa^2 dF / L^3", "error"],
                [
                    [float(a), float(b), float(c), float(d)]
                    for a, b, c, d in zip(
                        tr.temperatures,
                        tr.horizons,
                        tr.free_energy_difference,
                        tr.free_energy_error,
                        strict=True,
                    )
                ],
                "free-energy difference",
                show_rows=10,
            )
        )
    if sc is not None:
        facts.append(
            ("screening status", ("converged: " if sc.converged else "NOT CONVERGED: ") + sc.message)
        )
        if sc.string_tension_below is not None:
            facts.append(
                (
                    "string tension below T_c",
                    f"{fmt(sc.string_tension_below, 10)} (T-independent: the thermal geometry does not change with T)",
                )
            )
        figs.append(
            FigureBlock(
                "screening_length",
                _png(rt.plot_screening(sc)),
                "largest separation and screening length versus T",
            )
        )
        tables.append(
            TableBlock(
                "screening",
                ["T", "L_max", "L_s", "error"],
                [
                    [float(a), _f(b), _f(c), float(d)]
                    for a, b, c, d in zip(
                        sc.temperatures, sc.max_separation, sc.screening_length, sc.errors, strict=True
                    )
                ],
                "screening versus temperature",
                show_rows=12,
            )
        )
    return Section("Temperature", facts=facts, figures=figs, tables=tables)


def _f(x: float) -> float | None:
    return float(x) if np.isfinite(x) else None


def _calibration(cal: Any) -> Section:
    from holostring.report.calibration import plot_residuals

    fitted = [[n, cal.values[n], cal.uncertainties[n], cal.units[n]] for n in cal.names]
    preds = [
        [p.observable, p.value, p.uncertainty, p.unit, p.target, p.target_uncertainty, p.pull]
        for p in cal.predictions
    ]
    chi = f"chi^2 = {cal.chi2:.4g}, dof = {cal.dof}" + (
        f", chi^2/dof = {cal.chi2_per_dof:.4g}" if cal.chi2_per_dof is not None else ""
    )
    return Section(
        "Calibration",
        paragraphs=[
            f"The parameters below were fitted first; every later section uses the calibrated model. {chi}. {cal.message}"
        ],
        figures=[FigureBlock("calibration_residuals", _png(plot_residuals(cal)), "pulls of the targets")],
        tables=[
            TableBlock(
                "calibration_parameters",
                ["parameter", "value", "uncertainty", "unit"],
                fitted,
                "fitted parameters",
            ),
            TableBlock(
                "calibration_predictions",
                ["observable", "model", "± propagated", "unit", "target", "± target", "pull"],
                preds,
                "predictions",
            ),
        ],
    )


def report_data(
    res: Any, command: list[str] | None = None, fits: dict[str, Any] | None = None
) -> dict[str, Any]:
    """Everything for report.json: numbers with errors, settings, formulas, version, input hash."""
    from holostring.provenance import package_version
    from holostring.report.spectrum import spectrum_data
    from holostring.report.thermo import thermo_data

    bg = res.background
    data: dict[str, Any] = {
        "holostring_version": package_version(),
        "command": command,
        "background": bg.describe(),
        "input_sha256": bg.origin_hash,
        "settings": res.settings,
        "limits": limits_statement(),
        "diagnostics": res.diagnostics.to_dict(),
        "skipped": res.skipped,
        "timings_seconds": res.timings,
    }
    if res.calibration is not None:
        data["calibration"] = res.calibration.to_dict()
    if res.potential is not None:
        data["potential"] = res.potential.to_dict()
    fits = regge_fits(res) if fits is None else fits
    data["spectra"] = {name: spectrum_data(spec, fits.get(name)) for name, spec in res.spectra.items()}
    if res.transition is not None:
        data["thermo"] = thermo_data(res.transition, res.screening)
    return data


def write_report(
    res: Any, out: str, *, force: bool = False, profiles: Any = None, command: list[str] | None = None
) -> Any:
    """Write the whole report folder (atomically; an existing folder only with ``force``)."""
    bg = res.background
    fits = regge_fits(res)
    params = ", ".join(f"{k} = {v:g}" for k, v in bg.params.items())
    intro = (
        f"Background '{bg.name}' at {params}"
        + (
            f" (energy unit {bg.energy_unit})"
            if bg.energy_unit
            else " (dimensionless: units of the model's scale)"
        )
        + ". Every number carries the error estimate of its solver (two resolutions); report.json holds them all."
    )
    return write_bundle(
        out,
        f"holostring report: {bg.name}",
        build_sections(res, profiles, fits),
        report_data(res, command, fits),
        force=force,
        intro=intro,
        limits=limits_statement(),
    )
