"""reports layer."""
