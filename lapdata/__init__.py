"""Lap traces: reading, checking, resampling, braking zones and the track builder.

This package knows nothing of brakes' heat: it never imports ``thermo``.
"""
from lapdata.errors import LapDataError
from lapdata.trace import LapTrace

__all__ = ["LapDataError", "LapTrace"]
