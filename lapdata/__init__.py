"""Lap traces: reading, checking, resampling, braking zones and the track builder.

This package knows nothing of brakes' heat: it never imports ``thermo``.
"""
from lapdata.errors import LapDataError
from lapdata.reader import read_trace_csv
from lapdata.signal import resample_uniform, smoothed_acceleration
from lapdata.trace import LapTrace
from lapdata.track import CarEnvelope, TrackDescription, TrackSegment, build_speed_trace, read_track_toml
from lapdata.zones import BrakingZone, braking_mask, find_braking_zones

__all__ = [
    "LapDataError", "LapTrace", "read_trace_csv", "resample_uniform", "smoothed_acceleration",
    "BrakingZone", "braking_mask", "find_braking_zones",
    "TrackSegment", "TrackDescription", "CarEnvelope", "build_speed_trace", "read_track_toml",
]
