"""Fits of model outputs: observables, calibration targets, least-squares calibration."""
