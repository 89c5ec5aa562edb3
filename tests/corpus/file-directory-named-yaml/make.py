def make(entries):
    (entries / "folder.yaml").mkdir()
