import sys
from pathlib import Path

# The tests import their helpers as ``tests.support...`` from a checkout.
sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
