"""QA templates: workbooks with a data block and SF_ formulas, written ready and filled headless.

:func:`write_template` writes one ready template (:data:`KINDS` lists them), :func:`write_all`
every kind into a folder; both write the same bytes every time (:mod:`.writer`).
"""

from .kinds import KINDS
from .layout import CELLS_MARK, ArrayArea, Block
from .writer import FIXED_TIME, HOSTS, WrittenTemplate, template_parts, write_all, write_template

__all__ = [
    "KINDS", "HOSTS", "FIXED_TIME", "CELLS_MARK", "ArrayArea", "Block", "WrittenTemplate", "write_template",
    "write_all", "template_parts",
]
