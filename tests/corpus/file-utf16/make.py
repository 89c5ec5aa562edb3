def make(entries):
    (entries / "wide.yaml").write_bytes("name: Wide\nsmiles: CCO\n".encode("utf-16"))
