"""The exception type of the output layer (JSON summary, HDF5 file, report, plots)."""
from thermo.errors import BrakeheatError


class OutputError(BrakeheatError):
    """A results object that cannot be written as asked, or a results file that is not ours.

    The message names the file, corner, node or key, and what was expected.
    """
