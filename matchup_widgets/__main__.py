"""``python -m matchup_widgets`` runs the command line."""

import sys

from matchup_widgets.cli import main

sys.exit(main())
