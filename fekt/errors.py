"""fekt's own exception types.

Library code raises these; only the CLI turns them into exit codes
(2 for :class:`InputError` and its subclasses, 1 for everything else).
Messages name the item, the value and the rule that was broken.
"""

from __future__ import annotations


class FektError(Exception):
    """Base class of every error fekt raises on purpose."""


class InputError(FektError):
    """The user's input (case file, parameters, geometry) is invalid.

    ``item`` names the offending entry (e.g. ``"cutouts[1].diameter"``),
    ``hint`` suggests a fix. Both are optional and appended to the message.
    """

    def __init__(self, message: str, *, item: str | None = None, hint: str | None = None):
        self.item = item
        self.hint = hint
        self.message = message
        text = f"{item}: {message}" if item else message
        if hint:
            text += f" (hint: {hint})"
        super().__init__(text)


class CaseError(InputError):
    """A case file is malformed: syntax, unknown keys, wrong types, bad expressions."""


class GeometryError(InputError):
    """The described part is not a valid planar region (self-intersection, fillet too big, ...)."""


class MeshError(FektError):
    """Meshing failed or produced an unusable mesh (no elements, inverted elements, area mismatch)."""


class SolveError(FektError):
    """The linear-elastic solve failed (singular matrix, restraint reactions not ~0, equilibrium)."""
