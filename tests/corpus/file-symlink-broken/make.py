def make(entries):
    (entries / "gone.yaml").symlink_to("missing-target.yaml")
