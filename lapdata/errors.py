"""The one exception type of the lap-data layer."""


class LapDataError(ValueError):
    """Bad lap data: the message names the file, the row or column, and what was expected."""
