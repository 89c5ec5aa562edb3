"""Chemistry: pure functions of a structure or of SI floats, one published method each."""
