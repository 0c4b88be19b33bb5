"""Command-line interface: the root Typer app. Each command lives in its own module.

Only typer and the standard library are imported at start-up; each command imports the analysis
and report layers it needs when it runs, so ``holostring --help`` stays fast.
"""

from __future__ import annotations

import typer

app = typer.Typer(
    name="holostring",
    help=(
        "Holographic confinement from a background formula: diagnostics, static potentials, "
        "spectra and temperature. Classical string at large N and strong coupling; model "
        "numbers are not QCD predictions."
    ),
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)


def _version(value: bool) -> None:
    if value:
        from holostring.provenance import package_version

        typer.echo(f"holostring {package_version()}")
        raise typer.Exit()


@app.callback()
def _root(
    version: bool = typer.Option(
        False, "--version", callback=_version, is_eager=True, help="Print the version and exit."
    ),
) -> None:
    """Holographic confinement from a background formula."""


def _register() -> None:
    """Register every command module present (the one list of commands)."""
    import importlib

    for module_name, command in (
        ("backgrounds", "backgrounds"),
        ("inspect", "inspect"),
        ("potential", "potential"),
        ("spectrum", "spectrum"),
        ("thermo", "thermo"),
        ("calibrate", "calibrate"),
        ("scan", "scan"),
        ("analyze", "analyze"),
    ):
        try:
            module = importlib.import_module(f"holostring.cli.{module_name}")
        except ModuleNotFoundError as err:
            if err.name == f"holostring.cli.{module_name}":
                continue
            raise
        app.command(command)(getattr(module, command))


_register()


def main() -> None:
    """Console-script entry point."""
    app()
