"""``python -m fuelsys`` runs the ``fuelsys`` command."""

import sys

from fuelsys.cli import main

sys.exit(main())
