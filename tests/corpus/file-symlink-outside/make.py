def make(entries):
    outside = entries.parent / "outside.yaml"
    outside.write_text("name: Outside\nsmiles: CCO\n", encoding="utf-8")
    (entries / "linked.yaml").symlink_to(outside)
