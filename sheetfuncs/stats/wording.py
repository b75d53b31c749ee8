"""Small pieces of plain-words output shared by the core's readings and the report's text."""

from __future__ import annotations

__all__ = ["sentence", "df_text"]


def sentence(text: str, *, capital: bool = True) -> str:
    """The text as a sentence: a closing full stop unless it already ends in one (or in ``!`` or
    ``?``), and a capital first letter unless ``capital=False`` (text that follows a colon)."""
    text = text.strip()
    if not text:
        return text
    if capital:
        text = text[0].upper() + text[1:]
    return text if text.endswith((".", "!", "?")) else text + "."


def df_text(*dfs: float) -> str:
    """Degrees of freedom as a reader sees them: whole numbers as such, others with two
    decimals, joined by ", " (e.g. ``3, 17.42``)."""
    return ", ".join(str(int(v)) if float(v).is_integer() else f"{v:.2f}" for v in dfs)
