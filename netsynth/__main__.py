"""``python -m netsynth`` runs the command line."""

from netsynth.cli import main

main()
