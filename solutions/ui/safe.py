"""What the dashboard accepts and how it shows what a user typed: input limits, plain
text for Streamlit's Markdown elements, the folder the app writes into.

Streamlit renders the body of ``st.markdown``, ``st.caption``, the alerts, metric labels
and values and every cell of ``st.table`` as Markdown (GitHub flavour, with bare URLs
turned into links). A name typed or pasted by a user (``![x](http://…)``,
``<img src=…>``, ``www.example.com``) must show as the characters typed, never as an
image, a link or markup: :func:`plain` escapes it. Nothing here imports Streamlit.
"""
from __future__ import annotations

import os
import re
from pathlib import Path

import pandas as pd

from ..errors import SolutionsError

__all__ = ["plain", "plain_frame", "InputLimitError", "MAX_ROWS", "MAX_CELL_CHARS",
           "max_upload_bytes", "check_text_limits", "check_table_limits",
           "user_library_path", "USER_LIBRARY_ENV", "UPLOAD_ENV"]

#: rows of a recipe table the page reads (a recipe has a few dozen at most)
MAX_ROWS = 200
#: characters in one cell of a recipe table (names and units are short)
MAX_CELL_CHARS = 200
#: environment variable overriding the largest upload [MB] (default: the server's limit)
UPLOAD_ENV = "SOLUTIONS_MAX_UPLOAD_MB"
#: environment variable naming the user's ingredient file (default under ~/.solutions)
USER_LIBRARY_ENV = "SOLUTIONS_USER_LIBRARY"
_DEFAULT_UPLOAD_MB = 2.0


class InputLimitError(SolutionsError, ValueError):
    """A pasted block, uploaded file or table is larger than the page reads."""

    def __init__(self, what: str, value: int, limit: int, unit: str):
        self.what, self.value, self.limit, self.unit = what, value, limit, unit
        super().__init__(f"{what} has {value:,} {unit}; the page reads at most "
                         f"{limit:,} {unit}")


def max_upload_bytes() -> int:
    """The largest recipe file read [bytes]: ``$SOLUTIONS_MAX_UPLOAD_MB`` or 2 MB
    (Streamlit's ``server.maxUploadSize`` stops larger files before they arrive)."""
    try:
        mb = float(os.environ.get(UPLOAD_ENV, "") or _DEFAULT_UPLOAD_MB)
    except ValueError:
        mb = _DEFAULT_UPLOAD_MB
    return int(max(mb, 0.001) * 1024 * 1024)


def check_text_limits(text: str, what: str = "the pasted block") -> None:
    """Raise :class:`InputLimitError` if ``text`` has more lines than :data:`MAX_ROWS` + 1
    (a header) or a cell longer than :data:`MAX_CELL_CHARS` characters."""
    lines = [ln for ln in text.splitlines() if ln.strip()]
    if len(lines) > MAX_ROWS + 1:
        raise InputLimitError(what, len(lines), MAX_ROWS, "rows")
    for i, ln in enumerate(lines, start=1):
        for cell in re.split(r"[\t;,]", ln):
            if len(cell.strip()) > MAX_CELL_CHARS:
                raise InputLimitError(f"line {i} of {what}", len(cell.strip()),
                                      MAX_CELL_CHARS, "characters in a cell")


def check_table_limits(df: pd.DataFrame, what: str = "the recipe table") -> None:
    """Raise :class:`InputLimitError` if ``df`` has more than :data:`MAX_ROWS` rows or a
    cell longer than :data:`MAX_CELL_CHARS` characters (rows numbered from 1)."""
    if len(df) > MAX_ROWS:
        raise InputLimitError(what, len(df), MAX_ROWS, "rows")
    for col in df.columns:
        for i, v in enumerate(df[col].tolist(), start=1):
            if isinstance(v, str) and len(v.strip()) > MAX_CELL_CHARS:
                raise InputLimitError(f"row {i}, column {str(col)[:40]!r} of {what}",
                                      len(v.strip()), MAX_CELL_CHARS,
                                      "characters in a cell")


# ------------------------------------------------------------------ plain text
#: ASCII punctuation that starts Markdown, HTML, Streamlit directives (:red[…],
#: :material/…:), LaTeX ($) or a GFM table/strikethrough; escaped anywhere
_ALWAYS = set("\\`*_[]<>!$~|:&{}#@")
#: WORD JOINER: invisible, and breaks a bare link or e-mail address
WJ = "\u2060"
_LINE_START = re.compile(r"^(\s*)([-+=]|\d+[.)])(?=\s|$|[-+=])", re.MULTILINE)


def plain(text) -> str:
    """``text`` escaped so that Streamlit's Markdown shows it as typed: no link, image,
    HTML tag, emphasis, heading, list, directive or formula; ``None`` → ``""``.

    Backslash-escapes (CommonMark §2.4) the punctuation that opens any of these, a list
    or heading marker at a line start. GitHub-flavoured Markdown also turns bare
    ``http://``, ``www.`` and e-mail addresses into links after escapes are resolved, so
    an invisible word joiner (U+2060) goes after ``http``/``www`` and ``@``. Letters,
    digits, ``.``, ``-``, ``%``, ``/`` and ``°`` inside a line are left alone, so numbers
    and units read back unchanged.

    >>> plain("![x](http://127.0.0.1:1/b.png)").replace(WJ, "+")
    '\\\\!\\\\[x\\\\](http+\\\\://127.0.0.1\\\\:1/b.png)'
    >>> plain("0.9 % w/v sodium chloride")
    '0.9 % w/v sodium chloride'
    """
    if text is None:
        return ""
    s = "".join("\\" + ch if ch in _ALWAYS else ch for ch in str(text))
    s = _LINE_START.sub(lambda m: m.group(1) + re.sub(r"([-+=.)])", r"\\\1", m.group(2)), s)
    # GitHub-flavoured bare links are found in the text after escapes are resolved, so
    # an escape does not stop them: a word joiner (invisible) breaks the pattern
    s = re.sub(r"(?i)\b(https?|ftp)(?=\\:)", "\\1" + WJ, s)
    s = re.sub(r"(?i)\b(www)(?=\.)", "\\1" + WJ, s)
    s = s.replace("\\@", "\\@" + WJ)
    return s


def plain_frame(df: pd.DataFrame) -> pd.DataFrame:
    """A copy of ``df`` with every cell and header passed through :func:`plain` (for
    ``st.table``, which renders cells as Markdown)."""
    out = df.copy()
    out.columns = [plain(c) for c in df.columns]
    for c in out.columns:
        out[c] = [plain(v) if isinstance(v, str) else ("" if v is None else v)
                  for v in out[c]]
    return out


# ------------------------------------------------------------------ files
def user_library_path() -> Path:
    """The user's ingredient file: ``$SOLUTIONS_USER_LIBRARY`` when set and not empty,
    else ``~/.solutions/user_library.csv``. The page reads and writes only this file;
    it never takes a path typed on the page."""
    env = (os.environ.get(USER_LIBRARY_ENV) or "").strip()
    return Path(env).expanduser() if env else Path.home() / ".solutions" / "user_library.csv"
