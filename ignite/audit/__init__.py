"""A folder of rooms: worksheets, a register and a summary, compared with a previous audit."""
