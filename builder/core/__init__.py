"""Shared by every stage: values with provenance, diagnostics, units, the methods registry, the
entry data model and safe output folders. Imports nothing else of the builder."""
