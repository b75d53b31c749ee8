"""The lines of CSV text as the parser takes them, watched record by record.

``csv.reader`` builds a whole record before it hands it over, so a line of 12 million fields
costs gigabytes before anything can be said about it. :class:`RecordLines` feeds the parser one
physical line at a time and counts the separators of the record under way (a fast C-level
count); only when that count reaches the limit does it walk the record field by field, the way
the parser reads it (quotes respected, stopping one field past the limit), and raise
:class:`TooManyFields` before the parser sees the line. It also tells when the text ended
inside a record (a quote that was never closed) and finds the line where that quote opened.

The parser's rules followed (Python's ``csv`` module, non-strict): a field that starts with a
quote is quoted up to a quote not followed by another (``""`` is a quote inside it); after the
closing quote, characters up to the separator join the field; a quote anywhere else is text.
"""

from __future__ import annotations

import io
import re
from collections.abc import Iterator

__all__ = ["RecordLines", "TooManyFields", "record_fields"]

#: A quoted field: from its opening quote to a closing quote that is not a doubled one.
_QUOTED = re.compile(r'"[^"]*(?:""[^"]*)*"(?!")')


class TooManyFields(Exception):
    """A record with more fields than the limit: the line it starts on, and the limit."""

    def __init__(self, line: int, limit: int) -> None:
        super().__init__(f"line {line} has more than {limit} fields")
        self.line = line
        self.limit = limit


def record_fields(text: str, pos: int, delimiter: str, limit: int) -> tuple[int, int | None]:
    """Walk the record that starts at offset ``pos``: ``(fields, open quote)``, where fields
    stops counting at ``limit + 1`` and open quote is the offset of a quote never closed (or
    ``None``)."""
    unquoted = re.compile(f"[^{re.escape(delimiter)}\r\n]*")
    n = len(text)
    fields = 0
    while fields <= limit:
        fields += 1
        if pos < n and text[pos] == '"':
            m = _QUOTED.match(text, pos)
            if m is None:
                return fields, pos
            pos = m.end()
        pos = unquoted.match(text, pos).end()  # type: ignore[union-attr]  (always matches)
        if pos >= n or text[pos] != delimiter:
            return fields, None
        pos += 1
    return fields, None


class RecordLines:
    """The physical lines of ``text`` for ``csv.reader`` (iterate it once).

    The consumer sets :attr:`fresh` to ``True`` each time the reader hands over a record, so
    that the next line is known to start one. ``max_fields`` (``None``: no limit) is the most
    fields a record may have; :attr:`ended_inside` is ``True`` when the text ended while a
    record was under way (the parser was inside a quoted field). Text without quotes has one
    record per line: it is checked once, by a regular expression, and handed over as it is.
    """

    def __init__(self, text: str, delimiter: str, max_fields: int | None) -> None:
        self._text = text
        self._delimiter = delimiter
        self._limit = max_fields
        self._breaks = "\n" if "\n" in text else "\r"
        self.fresh = True
        self.start = 0
        self.ended_inside = False

    def __iter__(self) -> Iterator[str]:
        text = self._text
        if '"' not in text and (self._breaks == "\n" or "\r" not in text):
            self._check_lines()
            return iter(io.StringIO(text, newline=""))
        return self._watch()

    def _check_lines(self) -> None:
        """Text without quotes: the first line with more fields than the limit, if any."""
        d, limit = self._delimiter, self._limit
        if limit is None or self._text.count(d) < limit:
            return
        m = re.compile(f"(?m)^(?:[^{re.escape(d)}\n]*{re.escape(d)}){{{limit}}}").search(
            self._text)
        if m is not None:
            raise TooManyFields(self.line_of(m.start()), limit)

    def _watch(self) -> Iterator[str]:
        text, d, limit = self._text, self._delimiter, self._limit
        pos = separators = 0
        checked = limit is None
        for line in io.StringIO(text, newline=""):
            if self.fresh:
                self.fresh = False
                self.start = pos
                separators, checked = 0, limit is None
            pos += len(line)
            if not checked:
                separators += line.count(d)
                if separators >= limit:  # type: ignore[operator]  (checked when no limit)
                    fields, _ = record_fields(text, self.start, d, limit)  # type: ignore[arg-type]
                    if fields > limit:  # type: ignore[operator]
                        raise TooManyFields(self.line_of(self.start), limit)  # type: ignore[arg-type]
                    checked = True  # the whole record is within the limit
            yield line
        if not self.fresh:
            self.ended_inside = True

    def line_of(self, offset: int) -> int:
        """The line number (from 1) of the character at ``offset``."""
        return self._text.count(self._breaks, 0, offset) + 1

    def open_quote_line(self) -> int | None:
        """The line where a quote of the current record opened and was never closed."""
        _, quote = record_fields(self._text, self.start, self._delimiter, 2**62)
        return None if quote is None else self.line_of(quote)
