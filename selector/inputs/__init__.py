"""What the user gives: the property registry, units, the spec model and material tables."""
