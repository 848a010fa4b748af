"""The room file: YAML text in, a validated `Room` of SI floats out (units, source, model, load, template)."""
