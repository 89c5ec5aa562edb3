def make(entries):
    (entries.parent / "elsewhere.yaml").write_text("name: X\nsmiles: C\n", encoding="utf-8")
    (entries / "up.yaml").symlink_to("../elsewhere.yaml")
