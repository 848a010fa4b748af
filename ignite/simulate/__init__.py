"""Room and bound rules to `Results`: the orchestrators that feed the physics."""
