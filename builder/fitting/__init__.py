"""Model fitting scripts (``python -m builder.fitting.boiling``); never imported at run time."""
