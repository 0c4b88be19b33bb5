"""Reporting: plots (matplotlib, Agg), tables and files, all functions of result objects."""
