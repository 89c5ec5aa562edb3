def make(entries):
    (entries / "sources.yaml").unlink()
