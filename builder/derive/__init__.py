"""Derive per entry (a pure function of the entry, the stores it names and the code version) and
link across entries; JSON forms for ``cohesion profile`` and the exports."""
