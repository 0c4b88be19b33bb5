"""String- and Einstein-frame conversion: the one place where the frame factor lives.

Two conventions are in use in the literature, and a background states which one it follows:

- ``10d``: g_string = exp(Phi/2) g_einstein (ten-dimensional type II convention). With an AdS
  Einstein metric and Phi = c z^2 this gives the string-frame warp exp(c z^2/2)/z^2 of the soft
  wall for strings (Andreev-Zakharov, hep-ph/0604204).
- ``5d``: g_string = exp(4 Phi/3) g_einstein, i.e. A_s = A_E + (2/3) Phi for a warp
  exp(2 A)/z^2 (the common five-dimensional normalisation of bottom-up models).
"""

from __future__ import annotations

from enum import StrEnum

import sympy as sp


class Frame(StrEnum):
    """The frame in which a metric is written."""

    STRING = "string"
    EINSTEIN = "einstein"


class FrameRule(StrEnum):
    """Which dilaton factor relates the string to the Einstein frame."""

    TEN_D = "10d"
    FIVE_D = "5d"


def frame_factor(rule: FrameRule, phi: sp.Expr) -> sp.Expr:
    """Return Omega with g_string = Omega g_einstein.

    Parameters
    ----------
    rule
        The convention (see the module docstring).
    phi
        The dilaton.

    Returns
    -------
    sympy.Expr
        ``exp(Phi/2)`` for ``10d``, ``exp(4 Phi/3)`` for ``5d``.
    """
    if FrameRule(rule) is FrameRule.TEN_D:
        return sp.exp(phi / 2)
    return sp.exp(sp.Rational(4, 3) * phi)


def convert(component: sp.Expr, phi: sp.Expr, rule: FrameRule, source: Frame, target: Frame) -> sp.Expr:
    """Convert one metric component between frames.

    Parameters
    ----------
    component
        A metric component written in the ``source`` frame.
    phi, rule
        The dilaton and the frame convention.
    source, target
        Frames to convert from and to.

    Returns
    -------
    sympy.Expr
        The component in the ``target`` frame.
    """
    source, target = Frame(source), Frame(target)
    if source is target or phi == 0:
        return component
    omega = frame_factor(rule, phi)
    if target is Frame.STRING:
        return sp.powsimp(component * omega)
    return sp.powsimp(component / omega)
