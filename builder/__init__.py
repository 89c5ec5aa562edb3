"""cohesion: an offline catalog of material datasheets built from YAML entries."""

__version__ = "0.1.0"
