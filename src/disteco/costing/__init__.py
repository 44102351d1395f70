"""costing layer."""
