"""sizing layer."""
