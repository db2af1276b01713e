"""widgets layer."""
