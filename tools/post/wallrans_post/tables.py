"""Tables with named columns: wallrans' CSV files (header line, comma-separated) and the reference
tables of tests/data (whitespace-separated, names in a '# columns:' comment, columns separated
there by two or more spaces; a parenthesised remark after a name is dropped). A column whose every
value is a number reads as numbers; others (a wall's segment name) as text."""
import re

import numpy as np

from .cli import InputError


class Table:
    """Columns by name, all of one length. `path` names the file in messages; `line_numbers` are
    the file lines of the rows (for messages about a value)."""

    def __init__(self, path, names, rows, line_numbers=None):
        self.path, self.names, self.n_rows = str(path), list(names), len(rows)
        self._lines = line_numbers or list(range(1, len(rows) + 1))
        self._text = {name: [str(row[k]) for row in rows] for k, name in enumerate(self.names)}
        self._numbers = {}
        for name, values in self._text.items():
            try:
                self._numbers[name] = np.array([float(v) for v in values], dtype=float)
            except ValueError:
                pass  # a text column; asking for it as numbers names its first non-number

    def __contains__(self, name):
        return name in self._text

    def __getitem__(self, name):
        """The column as numbers."""
        self._require(name)
        if name not in self._numbers:
            for line, value in zip(self._lines, self._text[name]):
                try:
                    float(value)
                except ValueError:
                    raise InputError(
                        f"{self.path}:{line}: column '{name}': expected a number, got '{value}'"
                    ) from None
        return self._numbers[name]

    def text(self, name):
        """The column as text."""
        self._require(name)
        return list(self._text[name])

    def first_of(self, *names):
        """The first of `names` that the table has (files of other versions name columns differently)."""
        for name in names:
            if name in self._text:
                return self[name]
        return self[names[0]]

    def _require(self, name):
        if name not in self._text:
            raise InputError(f"{self.path}: no column '{name}'; the columns are: {', '.join(self.names)}")


def _column_names(comment):
    """Names from '# columns: a  b  c (remark)'."""
    text = comment.split(":", 1)[1].strip()
    names = []
    for token in re.split(r"\s{2,}", text):
        if not token or token.startswith("("):
            continue
        names.append(token.split(" (", 1)[0].strip())
    return names


def _is_number(text):
    try:
        float(text)
        return True
    except ValueError:
        return False


def read_table(path, names=None):
    """Reads a CSV file with a header line, or a whitespace table whose names come from a
    '# columns:' comment, a first non-numeric line, or `names` (which override either)."""
    try:
        with open(path, encoding="utf-8") as stream:
            lines = stream.read().splitlines()
    except FileNotFoundError:
        raise InputError(f"{path}: no such file") from None
    except (OSError, UnicodeDecodeError) as error:
        raise InputError(f"{path}: cannot read: {error}") from None
    header, rows, line_numbers, comma = None, [], [], None
    for line_no, line in enumerate(lines, start=1):
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            if header is None and re.match(r"#\s*columns\s*:", stripped):
                header = _column_names(stripped)
            continue
        if comma is None:
            comma = "," in stripped
        fields = [f.strip() for f in stripped.split(",")] if comma else stripped.split()
        if not rows and not _is_number(fields[0]) and (header is None or names):
            header = fields  # a header line (names given on the command line still win)
            continue
        if names:
            header = list(names)
        if header is None:
            raise InputError(
                f"{path}:{line_no}: no column names (a header line, a '# columns:' comment "
                "or names given on the command line)"
            )
        if len(fields) != len(header):
            raise InputError(
                f"{path}:{line_no}: expected {len(header)} fields ({', '.join(header)}), got {len(fields)}"
            )
        rows.append(fields)
        line_numbers.append(line_no)
    if not rows:
        raise InputError(f"{path}: no data rows")
    return Table(path, list(names) if names else header, rows, line_numbers)


def interpolate(x_ref, y_ref, x):
    """Linear interpolation in a table sorted by x_ref (ascending after sorting); NaN outside."""
    order = np.argsort(x_ref)
    xs, ys = np.asarray(x_ref)[order], np.asarray(y_ref)[order]
    values = np.interp(x, xs, ys)
    outside = (np.asarray(x) < xs[0]) | (np.asarray(x) > xs[-1])
    return np.where(outside, np.nan, values)
