"""Exception hierarchy: every error the tool raises on purpose derives from HolostringError.

The CLI catches exactly ``HolostringError``, prints its one-line message and exits with code 2.
"""

from __future__ import annotations

from typing import Any


class HolostringError(Exception):
    """Root of all deliberate holostring errors; the message is one line, meant for a user."""


class InputError(HolostringError, ValueError):
    """A value given by the user (option, parameter, range) is invalid.

    Parameters
    ----------
    field
        The name of the offending option or parameter.
    reason
        Why it is refused, in a few words.
    """

    def __init__(self, field: str, reason: str) -> None:
        self.field = field
        self.reason = reason
        super().__init__(f"{field}: {reason}")


class BackgroundFileError(HolostringError, ValueError):
    """A background file is malformed; names the file, the key and the offending token."""

    def __init__(self, path: str, key: str | None, reason: str, token: str | None = None) -> None:
        self.path = path
        self.key = key
        self.token = token
        self.reason = reason
        where = path if key is None else f"{path}: key '{key}'"
        what = reason if token is None else f"{reason} (at '{token}')"
        super().__init__(f"{where}: {what}")


class FormulaError(HolostringError, ValueError):
    """A formula uses a construct, function or symbol that the whitelist refuses."""

    def __init__(self, reason: str, token: str | None = None) -> None:
        self.reason = reason
        self.token = token
        super().__init__(reason if token is None else f"{reason} (at '{token}')")


class ConvergenceError(HolostringError, RuntimeError):
    """A solver did not reach its tolerance; ``partial`` holds the unconverged result."""

    def __init__(self, message: str, partial: Any = None) -> None:
        self.partial = partial
        super().__init__(message)


class NotApplicableError(HolostringError):
    """An analysis does not apply to this background (for example: not asymptotically AdS)."""
