from builder.cli import run

run()
