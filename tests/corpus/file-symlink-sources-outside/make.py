def make(entries):
    outside = entries.parent / "sources-elsewhere.yaml"
    outside.write_bytes((entries / "sources.yaml").read_bytes())
    (entries / "sources.yaml").unlink()
    (entries / "sources.yaml").symlink_to(outside)
