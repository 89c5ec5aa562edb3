def make(entries):
    text = "name: Huge\nsmiles: CCO\nnotes: >-\n" + "  padding padding padding padding padding padding\n" * 6000
    (entries / "huge.yaml").write_text(text, encoding="utf-8")
