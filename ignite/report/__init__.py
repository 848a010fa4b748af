"""What a user reads: the terminal table, the JSON record and the PDF worksheet."""
