"""Channels: which bulk field a spectrum belongs to.

A channel is a bulk field given by its spin, its bulk mass M5^2 (units of the AdS radius), its
coupling to the dilaton (a factor exp(-k Phi) in front of its action) and the frame of the metric
its action is written in. The built-in channels follow the soft-wall convention that exp(-Phi)
multiplies the whole bulk action (Karch-Katz-Son-Stephanov, hep-ph/0602229), in the Einstein frame:

=================  ====  =====  ===  ========  ==========================================
name               spin  M5^2   k    frame     meaning
=================  ====  =====  ===  ========  ==========================================
scalar-glueball    0     0      1    einstein  0++, dual to Tr F^2 (Delta = 4)
tensor-glueball    2     0      1    einstein  2++, transverse-traceless metric fluctuation
vector-meson       1     0      1    einstein  1--, gauge field dual to a conserved current
=================  ====  =====  ===  ========  ==========================================

The transverse-traceless tensor h_ij obeys the equation of a massless scalar; with the same
coupling k = 1 it is degenerate with the scalar glueball on every background built here, as in
the soft-wall literature (Colangelo et al., hep-ph/0703316). A strict Einstein-frame graviton,
whose Einstein-Hilbert term carries no dilaton factor, is the channel with k = 0: declare it in a
background file (``[[fields]]`` with ``spin = 2``, ``dilaton_coupling = 0``).
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import IntEnum
from typing import Any

from holostring.background.frames import Frame
from holostring.errors import InputError


class Spin(IntEnum):
    """Spin of the bulk field."""

    SCALAR = 0
    VECTOR = 1
    TENSOR = 2


@dataclass(frozen=True)
class Channel:
    """A bulk field whose normal modes form a spectrum.

    Attributes
    ----------
    name
        Channel name used in outputs and on the command line.
    spin
        0 scalar, 1 vector (transverse components), 2 transverse-traceless tensor.
    mass_squared
        Bulk mass M5^2 in units of the AdS radius.
    dilaton_coupling
        k in the action factor exp(-k Phi).
    frame
        Frame of the metric in the field's action.
    label
        J^PC-like label for tables (``0++``), empty for user channels.
    """

    name: str
    spin: Spin
    mass_squared: float = 0.0
    dilaton_coupling: float = 1.0
    frame: Frame = Frame.EINSTEIN
    label: str = ""

    def __post_init__(self) -> None:
        try:
            object.__setattr__(self, "spin", Spin(int(self.spin)))
        except ValueError:
            raise InputError(f"channel {self.name}: spin", "must be 0, 1 or 2") from None
        object.__setattr__(self, "frame", Frame(self.frame))
        for key in ("mass_squared", "dilaton_coupling"):
            value = float(getattr(self, key))
            if value != value or abs(value) == float("inf"):
                raise InputError(f"channel {self.name}: {key}", "must be a finite number")
            object.__setattr__(self, key, value)

    def to_dict(self) -> dict[str, Any]:
        """Plain-data view."""
        return {
            "name": self.name,
            "spin": int(self.spin),
            "mass_squared": self.mass_squared,
            "dilaton_coupling": self.dilaton_coupling,
            "frame": str(self.frame),
            "label": self.label,
        }


BUILTIN_CHANNELS: dict[str, Channel] = {
    "scalar-glueball": Channel("scalar-glueball", Spin.SCALAR, 0.0, 1.0, Frame.EINSTEIN, "0++"),
    "tensor-glueball": Channel("tensor-glueball", Spin.TENSOR, 0.0, 1.0, Frame.EINSTEIN, "2++"),
    "vector-meson": Channel("vector-meson", Spin.VECTOR, 0.0, 1.0, Frame.EINSTEIN, "1--"),
}


def channel_from_declaration(decl: Any) -> Channel:
    """Turn a background file's field declaration into a :class:`Channel`."""
    return Channel(
        name=decl.name,
        spin=decl.spin,
        mass_squared=decl.mass_squared,
        dilaton_coupling=decl.dilaton_coupling,
        frame=decl.frame,
    )


def available_channels(background: Any) -> dict[str, Channel]:
    """Built-in channels plus those declared by the background (which take precedence)."""
    out = dict(BUILTIN_CHANNELS)
    for decl in getattr(background, "fields", ()):
        out[decl.name] = channel_from_declaration(decl)
    return out


def resolve_channel(background: Any, channel: str | Channel) -> Channel:
    """Return the channel object for a name (built-in or declared by the background).

    Raises
    ------
    InputError
        For an unknown name, listing the known ones.
    """
    if isinstance(channel, Channel):
        return channel
    known = available_channels(background)
    if channel not in known:
        raise InputError("channel", f"unknown channel '{channel}' (known: {', '.join(known)})")
    return known[channel]
