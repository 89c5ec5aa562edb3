def make(entries):
    (entries / "passwd.yaml").symlink_to("/etc/passwd")
