"""Read and validate the entries folder (YAML, entry format, sources, locations, CAS, schema) into
one immutable ``Catalog``."""
