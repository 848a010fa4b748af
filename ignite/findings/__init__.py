"""Bound checks and Results to findings: never prints, never raises on a hazard.

`evaluate.py` runs the checks; `floor.py`, `charge.py` and `cases.py` are the result
families a check may read (`registry.py` holds their names).
"""
