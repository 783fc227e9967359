"""finkit: finned surfaces and heat sinks for air cooling, from physics to a signed note."""

from importlib.metadata import PackageNotFoundError, version

try:
    __version__ = version("finkit")
except PackageNotFoundError:  # running from a source tree that is not installed
    __version__ = "0+unknown"

__all__ = ["__version__"]
