"""Workflows that chain the analyses (one background to every result that applies)."""

from holostring.workflow.analyze import AnalysisResult, analyze

__all__ = ["AnalysisResult", "analyze"]
