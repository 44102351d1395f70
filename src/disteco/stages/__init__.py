"""stages layer."""
