"""One module per command of the command line; see :mod:`matchup_widgets.cli`."""
