"""QA templates: workbooks with a data block and SF_ formulas, written ready and filled headless.

:func:`write_template` writes one ready template (:data:`KINDS` lists them), :func:`write_all`
every kind into a folder; both write the same bytes every time (:mod:`.writer`, with
:mod:`.kinds`, :mod:`.layout` and :mod:`.examples`). :func:`fill_template` puts a data file
into any template's data block and stores every formula's value with the formula kept;
:func:`fill_batch` does it for several data files (:mod:`.fill`, with :mod:`.book`,
:mod:`.cells`, :mod:`.arguments`, :mod:`.compute` and :mod:`.evaluate`).
"""

from .fill import Batch, Filled, fill_batch, fill_template
from .kinds import KINDS
from .layout import CELLS_MARK, ArrayArea, Block
from .writer import FIXED_TIME, HOSTS, WrittenTemplate, template_parts, write_all, write_template

__all__ = [
    "KINDS", "HOSTS", "FIXED_TIME", "CELLS_MARK", "ArrayArea", "Block", "WrittenTemplate", "write_template",
    "write_all", "template_parts", "Filled", "Batch", "fill_template", "fill_batch",
]
