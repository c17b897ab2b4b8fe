"""Lap traces: reading, checking, resampling, braking zones and the track builder.

This package knows nothing of brakes' heat: it never imports ``thermo``. Its names are imported
on first use, so that importing one small module of it (``lapdata.echo``, ``lapdata.units``)
does not load numpy's and scipy's signal tools.
"""
from lapdata.lazy import lazy_exports

_PUBLIC = {
    "LapDataError": "lapdata.errors", "LapTrace": "lapdata.trace", "read_trace_csv": "lapdata.reader",
    "resample_uniform": "lapdata.signal", "smoothed_acceleration": "lapdata.signal",
    "BrakingZone": "lapdata.zones", "braking_mask": "lapdata.zones", "find_braking_zones": "lapdata.zones",
    "TrackSegment": "lapdata.track", "TrackDescription": "lapdata.track", "CarEnvelope": "lapdata.track",
    "build_speed_trace": "lapdata.track", "read_track_toml": "lapdata.track",
}

__all__ = list(_PUBLIC)

__getattr__, __dir__ = lazy_exports("lapdata", _PUBLIC)
