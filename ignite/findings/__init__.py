"""Results and bound checks to findings: never prints, never raises on a hazard."""
