"""Pure statistics: no I/O, nothing of ours imported.  Every function takes
numbers and returns numbers or frozen dataclasses."""
