"""Every sentence a user reads, worded once.

Lower layers (physics, the simulations, the findings) return numbers and codes; the text
table, the JSON notes, the worksheet and the audit summary take their words from here, so
the same thing is said the same way everywhere.

The sentences live in one module per topic (labels, documents, prep_notes, room_notes,
findings, electrical, names, ranges); this package gives them all under one name, so a
caller writes `from ignite.wording import sentences as say` and `say.NAME` whichever
module holds it. Add a sentence to the module of its topic.
"""

from ignite.wording.sentences.documents import *  # noqa: F403
from ignite.wording.sentences.electrical import *  # noqa: F403
from ignite.wording.sentences.findings import *  # noqa: F403
from ignite.wording.sentences.labels import *  # noqa: F403
from ignite.wording.sentences.names import *  # noqa: F403
from ignite.wording.sentences.prep_notes import *  # noqa: F403
from ignite.wording.sentences.ranges import *  # noqa: F403
from ignite.wording.sentences.room_notes import *  # noqa: F403
