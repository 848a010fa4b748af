"""The records every layer shares: the result record (the JSON contract) and the audit register."""
