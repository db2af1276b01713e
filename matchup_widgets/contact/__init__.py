"""contact layer."""
