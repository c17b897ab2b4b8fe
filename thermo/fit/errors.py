"""The exception of the fit layer."""
from thermo.errors import BrakeheatError


class FitError(BrakeheatError):
    """Measured data that cannot be used for a fit: the message names the file, channel or key."""
