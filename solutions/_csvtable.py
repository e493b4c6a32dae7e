"""Reading the package's own data tables with the standard ``csv`` module.

The data files under ``solutions/data`` are small, well-formed CSV files. Reading them with
``csv`` instead of a data-frame library keeps ``import solutions`` and every command-line
call light (the data-frame library alone costs a few tenths of a second of CPU to import).

Rows come back as plain dicts, typed the way the tables have always been read:

- ``text=True``: every cell is a string, an empty cell is ``""``;
- otherwise each column is typed as a whole: all cells integers → ``int``; all cells
  numbers → ``float``, an empty or NA cell becoming NaN; all cells ``True``/``False`` →
  ``bool``; else ``str`` with an empty or NA cell as NaN. ``as_text`` names columns kept
  as strings whatever they hold (e.g. ``source``).
"""
from __future__ import annotations

import csv
import math
from pathlib import Path

__all__ = ["read_rows"]

#: cells read as "not available" when a column is typed (the usual CSV spellings)
_NA = frozenset({"", "#N/A", "#N/A N/A", "#NA", "-1.#IND", "-1.#QNAN", "-NaN", "-nan",
                 "1.#IND", "1.#QNAN", "<NA>", "N/A", "NA", "NULL", "NaN", "None", "n/a",
                 "nan", "null"})
_TRUE, _FALSE = frozenset({"True", "TRUE", "true"}), frozenset({"False", "FALSE", "false"})


def _is_int(s: str) -> bool:
    t = s.strip()
    return bool(t) and (t[1:] if t[0] in "+-" else t).isdigit()


def _is_float(s: str) -> bool:
    try:
        float(s)
    except ValueError:
        return False
    return True


def _typed(values: list[str]) -> list:
    present = [v for v in values if v not in _NA]
    if present and len(present) == len(values) and all(_is_int(v) for v in present):
        return [int(v) for v in values]
    if all(_is_float(v) for v in present):
        return [math.nan if v in _NA else float(v) for v in values]
    if present and len(present) == len(values) and all(v in _TRUE or v in _FALSE
                                                       for v in present):
        return [v in _TRUE for v in values]
    return [math.nan if v in _NA else v for v in values]


def read_rows(path, *, text: bool = False, as_text: tuple[str, ...] = ()) -> list[dict]:
    """Rows of a CSV file (header line first, UTF-8) as dicts keyed by the header.

    path : a file path or an ``importlib.resources`` traversable
    text : keep every cell as a string (empty cell ``""``)
    as_text : columns kept as strings when the others are typed
    """
    with open(Path(str(path)), encoding="utf-8", newline="") as fh:
        reader = csv.reader(fh)
        header = next(reader, None)
        if header is None:
            return []
        n = len(header)
        body = [(r + [""] * n)[:n] for r in reader if r]
    columns = [[r[j] for r in body] for j in range(n)]
    if not text:
        columns = [[math.nan if v == "" else v for v in col] if name in as_text else _typed(col)
                   for name, col in zip(header, columns)]
    return [dict(zip(header, vals)) for vals in zip(*columns)] if body else []
