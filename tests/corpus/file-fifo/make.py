import os


def make(entries):
    os.mkfifo(entries / "blocked.yaml")
