"""Shared test setup: float64 everywhere, Agg backend, no GPU."""

import os

os.environ.setdefault("JAX_PLATFORMS", "cpu")
os.environ.setdefault("MPLBACKEND", "Agg")
os.environ.setdefault("JAX_ENABLE_X64", "1")

import pytest


@pytest.fixture(scope="session")
def catalogue_names():
    from holostring.background import catalogue

    return catalogue.names()
