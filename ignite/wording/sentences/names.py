"""Names a room file may use, and the provenance flags."""

from __future__ import annotations

# --- names a room file may use; provenance flags (cli: `ignite rules`, issue 15) ------
NAMES_HEADING = (
    "Names a room file may use, by category (any case), with the keys that take them; "
    "`ignite rules NAME` shows the entry a name reaches."
)
NAMES_FOOTWEAR_NOTE = "or a measured resistance through the soles, e.g. 40 MΩ"
NAMES_SUBSTANCES_NOTE = (
    "any substance the chemicals tables know is accepted, by common name or CAS number; "
    "these have ignition data in rules/"
)
