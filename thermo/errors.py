"""Typed exceptions of the model layers. They never print or exit: only the command line does."""
from lapdata.errors import LapDataError


class BrakeheatError(ValueError):
    """Base of brakeheat's own errors: the message names the file, key or row and what was expected."""


class ScenarioError(BrakeheatError):
    """A scenario file or an override is wrong (unknown key, missing key, bad value)."""


class MaterialError(BrakeheatError):
    """An unknown material, or a material property outside its data."""


class CorrelationError(BrakeheatError):
    """A correlation called outside its validity range under the 'raise' policy, or unknown by name."""


class ModelError(BrakeheatError):
    """A network or corner model that cannot be built (bad geometry, a link to a missing node)."""


class SolveError(BrakeheatError):
    """The integration failed: the message names the phase and the time."""


__all__ = [
    "BrakeheatError", "ScenarioError", "MaterialError", "CorrelationError", "ModelError",
    "SolveError", "LapDataError",
]
