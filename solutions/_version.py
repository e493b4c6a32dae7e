"""The package version (one place; read by the package, the JSON output and the page)."""
__version__ = "0.1.0"
