import os


def make(entries):
    (entries / "sources.yaml").unlink()
    os.mkfifo(entries / "sources.yaml")
