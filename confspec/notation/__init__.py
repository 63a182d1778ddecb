"""Notation: text in, occupancies out, and occupancies back to text. No models here.

The rooms: ``clean`` removes cell noise keeping positions, ``grammar`` (with
``configuration.lark``, the single source of what is accepted) and ``fastpath`` read,
``syntax`` holds the raw items both produce, ``resolve`` applies policy (cores, holes,
Pauli), ``read`` chains them, ``render`` writes styles, ``holes`` writes holes against a
reference, ``xray`` holds IUPAC X-ray level names, ``scripts`` the super/subscript digits.
"""

from __future__ import annotations

from .read import MAX_INPUT_LENGTH, precheck, read_configuration
from .render import CORE_MODES, ORDERS, STYLES, register_style, render
from .xray import XrayLevel, xray_level, xray_name

__all__ = ["CORE_MODES", "MAX_INPUT_LENGTH", "ORDERS", "STYLES", "XrayLevel", "precheck",
           "read_configuration", "register_style", "render", "xray_level", "xray_name"]
