"""Every number and sentence a user reads: numbers with units, and the wording of notes and advice."""
