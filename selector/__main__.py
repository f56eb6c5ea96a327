"""`python -m selector` runs the command-line interface."""

from selector.cli import main

main()
