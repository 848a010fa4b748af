"""The rules in force: `rules/*.yaml` read into a `Rulebook`, then bound to one room."""
