"""charts layer."""
