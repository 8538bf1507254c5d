"""Devices: error figures and gate durations (``figures``), profiles (``profile``, ``builtins``), connectivity
graphs, native gate sets, placement and routing onto a device (``compile``), the compiled circuit
(``device_circuit``), time on device (``timing``), OpenQASM export (``export``), comparison across devices."""

from .builtins import BUILTIN_DEVICES
from .comparison import compare_devices
from .compile import compile_for_device
from .device_circuit import DeviceCircuit
from .export import device_openqasm
from .figures import DeviceFigures, ErrorFigures, GateDurations
from .profile import DeviceProfile, as_device

__all__ = ["BUILTIN_DEVICES", "DeviceCircuit", "DeviceFigures", "DeviceProfile", "ErrorFigures", "GateDurations",
           "as_device", "compare_devices", "compile_for_device", "device_openqasm"]
