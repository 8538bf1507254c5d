"""Device descriptions: error figures and gate durations (``figures``); profiles, routing and native gates build
on them."""

from .figures import DeviceFigures, ErrorFigures, GateDurations

__all__ = ["DeviceFigures", "ErrorFigures", "GateDurations"]
