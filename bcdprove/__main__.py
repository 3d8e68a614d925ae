"""``python -m bcdprove`` runs the command line."""
from .cli import console

console()
