"""A folder of rooms: worksheets, a register and a summary, compared with a previous audit.

`run` assesses the rooms in worker processes and puts the files in place; `io` writes
and reads the register (CSV and JSON); `compare` sets a register against an earlier one.
The register's records themselves live in `ignite.records.register`.
"""
