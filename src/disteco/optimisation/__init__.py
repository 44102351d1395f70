"""optimisation layer."""
