"""Every sentence a user reads, worded once.

Lower layers (physics, the simulations, the findings) return numbers and codes; the text
table, the JSON notes, the worksheet and the audit summary take their words from here, so
the same thing is said the same way everywhere.
"""

from __future__ import annotations

# --- cautions, labels and verdicts (report) ------------------------------------------


# --- notes of the preparations, drying and the drape pocket (simulate) ----------------


# --- the room's warnings and the floor, charge and case notes (simulate) --------------


# --- findings: details and mitigations (findings) --------------------------------------
