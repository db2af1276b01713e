"""matchup-widgets: batter-versus-pitcher matchup analysis for Jupyter and voila."""

__version__ = "0.1.0"
