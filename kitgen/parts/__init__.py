"""Parts of the kit: pure functions from a PartContext to a geometry Part.

No module here imports a drawing library or holds a printed word.
"""

from .alidade import alidade
from .mater_back import mater_back
from .mater_front import mater_front
from .plate import plate
from .rete import rete
from .rule import rule

#: Every part, in the order the kit prints them.
PART_BUILDERS = {
    "mater_front": mater_front,
    "mater_back": mater_back,
    "plate": plate,
    "rete": rete,
    "rule": rule,
    "alidade": alidade,
}
