"""Table columns named after the claim vocabulary, and one row turned into a
claim Document.

A column is a field path with dots for nesting: ``significance.sigma``,
``combination.method``, ``parts.0.estimate`` (list entries numbered from 0).
A column whose name starts with ``#`` is a note and is ignored.  Every cell is
kept as the text it was written with, so printed precision works exactly as in
a claim file; an empty cell means the field is absent.

The columns are checked against the claim schema once per table.  Each row
then passes a quick test compiled from the same schema (a regular expression
or a set of choices per column, the required fields per group); a row that
passes it is valid under the schema, and any other row goes through the full
validator, so that its message is the one ``claimcheck check`` would print.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any, Callable, Sequence

from ..claim.load import Document, dotted
from ..claim.suggest import corrected_path
from ..claim.validate import claim_schema
from ..errors import DataError

NOTE_PREFIX = "#"
_TRUE = {"true", "True", "TRUE"}
_FALSE = {"false", "False", "FALSE"}
# Schema keywords that only describe.
_DESCRIPTIVE = {"description", "title", "$comment", "examples", "default", "$schema", "$id"}
_OBJECT_KEYS = {"type", "properties", "additionalProperties", "required", "$defs"} | _DESCRIPTIVE
_ARRAY_KEYS = {"type", "items", "minItems"} | _DESCRIPTIVE
_NUMBER_KEYS = {"type", "minimum", "maximum", "exclusiveMinimum", "exclusiveMaximum", "multipleOf"}


def _plain(root: dict, node: dict, more: bool) -> dict:
    """A schema node with a local ``$ref`` followed, and a field that is either
    a single value or a group (a rate printed as ``83.3%`` or as
    ``{value, interval}``) seen as the group when the column goes inside it
    (``more``) and as the single value otherwise."""
    while "$ref" in node and node["$ref"].startswith("#/"):
        target = root
        for part in node["$ref"][2:].split("/"):
            target = target[part]
        node = {**{k: v for k, v in node.items() if k != "$ref"}, **target}
    alternatives = node.get("anyOf", ())
    groups = [a for a in alternatives if a.get("type") == "object"]
    if groups and len(groups) < len(alternatives):
        if more:
            return groups[0]
        return {**{k: v for k, v in node.items() if k != "anyOf"},
                "anyOf": [a for a in alternatives if a.get("type") != "object"]}
    return node


@dataclass(frozen=True)
class Column:
    """One table column: its field path and how its cells are read."""

    name: str
    path: tuple  # ("significance", "sigma") or ("parts", 0, "estimate"); () for a note
    boolean: bool = False  # a true/false field: "true"/"false" cells become booleans

    @property
    def note(self) -> bool:
        return not self.path


def parse_column_name(name: str) -> tuple:
    """``"parts.0.estimate"`` -> ``("parts", 0, "estimate")``."""
    return tuple(int(p) if p.isdigit() else p for p in name.split("."))


def _leaf_test(schema: dict) -> Callable[[Any], bool] | None:
    """A quick test that implies the schema accepts a cell's value, or None when
    this schema uses keywords the quick test does not know (then every row is
    validated in full)."""
    keys = set(schema) - _DESCRIPTIVE
    if keys == {"enum"}:
        choices = frozenset(c for c in schema["enum"] if isinstance(c, str))
        return lambda v: isinstance(v, str) and v in choices
    if schema.get("type") == "boolean" and keys == {"type"}:
        return lambda v: isinstance(v, bool)
    if schema.get("type") == "string" and keys <= {"type", "minLength", "pattern"}:
        pattern = re.compile(schema["pattern"]) if "pattern" in schema else None
        shortest = schema.get("minLength", 0)
        return lambda v: (isinstance(v, str) and len(v) >= shortest
                          and (pattern is None or pattern.search(v) is not None))
    if keys == {"anyOf"}:
        tests = []
        for alternative in schema["anyOf"]:
            if alternative.get("type") in ("number", "integer") and set(alternative) - _DESCRIPTIVE <= _NUMBER_KEYS:
                continue  # cells are text or true/false, never numbers
            test = _leaf_test(alternative)
            if test is None:
                return None
            tests.append(test)
        patterns = [a for a in schema["anyOf"] if a.get("type") == "string"
                    and set(a) - _DESCRIPTIVE <= {"type", "pattern"} and "pattern" in a]
        if len(patterns) == len(tests):
            # Only patterns: one regular expression per alternative, tried in turn (the common
            # number-or-printed-text field, tested once per cell of every row).
            searches = tuple(re.compile(a["pattern"]).search for a in patterns)
            return lambda v: isinstance(v, str) and any(search(v) is not None for search in searches)
        return lambda v: any(t(v) for t in tests)
    return None


@dataclass(frozen=True)
class _Group:
    """An object in the schema that some column lies inside: its path and the
    fields it requires."""

    path: tuple
    required: tuple


class ColumnPlan:
    """The columns of one table, checked against the claim schema.

    Parameters
    ----------
    names : sequence of str
        The header.
    table : str
        The table's name, for messages.

    Raises
    ------
    DataError
        A column that is empty, repeated, or not in the claim vocabulary.
    """

    def __init__(self, names: Sequence[str], table: str):
        self.table = table
        schema = claim_schema()
        columns: list[Column] = []
        tests: list = []
        groups: dict[tuple, _Group] = {}
        seen: dict[tuple, str] = {}
        self.quick = _object_known(schema)
        self.has_lists = False
        for index, raw in enumerate(names):
            name = raw.strip()
            if not name:
                raise DataError(table, f"column {index + 1} of the header has no name",
                                "name every column after a claim field, such as significance.sigma")
            if name.startswith(NOTE_PREFIX):
                columns.append(Column(name, ()))
                tests.append(None)
                continue
            path = parse_column_name(name)
            if path in seen:
                raise DataError(table, f"the column {name!r} appears twice", "give each field one column")
            seen[path] = name
            leaf = self._resolve(schema, path, name, groups)
            test = _leaf_test(leaf)
            if test is None:
                self.quick = False
            columns.append(Column(name, path, boolean=leaf.get("type") == "boolean"))
            tests.append(test)
        if not seen:
            raise DataError(table, "names no claim field in its header",
                            "the first row names the fields: title, metric, estimate, ...")
        self.columns = tuple(columns)
        self._tests = tuple(tests)
        # The claim columns, as (cell index, field path, quick test, true/false field).
        self._active = tuple((i, c.path, t, c.boolean) for i, (c, t) in enumerate(zip(columns, tests))
                             if not c.note)
        self._root_required = tuple(schema.get("required", ()))
        self._groups = tuple(groups.values())

    def _resolve(self, schema: dict, path: tuple, name: str, groups: dict) -> dict:
        """The schema node a column's path names (a group or a single value)."""
        node = _plain(schema, schema, more=bool(path))
        for depth, key in enumerate(path):
            here = path[:depth]
            kind = node.get("type")
            if kind == "object" or "properties" in node:
                if depth:
                    groups.setdefault(here, _Group(here, tuple(node.get("required", ()))))
                    self.quick = self.quick and _object_known(node)
                props = node.get("properties", {})
                if isinstance(key, int) or key not in props:
                    known = sorted(props)
                    hint = _column_hint(path)
                    where = f"of {dotted(here)}" if here else "of a claim"
                    raise DataError(self.table, f"the column {name!r} is not in the claim vocabulary",
                                    f"{hint}fields {where}: {', '.join(known)}; "
                                    f"start a column's name with {NOTE_PREFIX} to keep notes")
                node = _plain(schema, props[key], more=depth + 1 < len(path))
            elif kind == "array":
                if not isinstance(key, int):
                    raise DataError(self.table, f"the column {name!r} needs an entry number after "
                                    f"{dotted(here)}", f"write {dotted(here)}.0.{key}, "
                                    f"{dotted(here)}.1.{key}, ... (entries numbered from 0)")
                self.has_lists = True
                self.quick = self.quick and set(node) - _DESCRIPTIVE <= _ARRAY_KEYS
                node = node.get("items", {})
            else:
                raise DataError(self.table, f"the column {name!r} goes inside {dotted(here)}, "
                                "which holds a single value", f"name the column {dotted(here)}")
        if node.get("type") in ("object", "array") or "properties" in node:
            example = next(iter(node.get("properties", node.get("items", {}).get("properties", {}))), "field")
            sub = f"{name}.{example}" if node.get("type") == "object" else f"{name}.0.{example}"
            raise DataError(self.table, f"the column {name!r} names a group of fields",
                            f"give each of its fields its own column, such as {sub}")
        return node

    def document(self, cells: Sequence[str], name: str, line: int | None) -> tuple[Document, bool]:
        """The Document of one row and whether it passed the quick schema test.

        Raises
        ------
        DataError
            When the row has a different number of cells from the header, or
            numbers list entries with a gap.
        """
        if len(cells) != len(self.columns):
            raise DataError(name, f"has {len(cells)} cells but the header names {len(self.columns)} columns",
                            "give every row one cell per column (empty for a field left out)", line=line)
        data: dict = {}
        texts: dict = {}
        quick = self.quick
        for index, path, test, boolean in self._active:
            cell = cells[index].strip()
            if not cell:
                continue
            value: Any = cell
            if boolean:
                value = True if cell in _TRUE else False if cell in _FALSE else cell
            texts[path] = cell
            if len(path) == 1:
                data[path[0]] = value
            else:
                node = data
                for key in path[:-1]:
                    node = node.setdefault(key, {})
                node[path[-1]] = value
            if quick and not test(value):
                quick = False
        if self.has_lists:
            data = _lists(data, (), name, line)
        if quick:
            quick = all(k in data for k in self._root_required) and all(
                _group_complete(data, g.path, g.required) for g in self._groups)
        return Document(name, data, texts, {(): line} if line is not None else {}), quick


def _column_hint(path: tuple) -> str:
    """"did you mean 'significance.sigma'? " for a misspelt or misplaced column
    (the same rule as a claim file's fields, the whole dotted name suggested)."""
    found = corrected_path(path)
    if not found:
        return ""
    names = " or ".join(repr(dotted(p)) for p in found)
    if len(found) == 1 and len(path) == 1 and found[0][-1] == path[-1]:
        return f"it belongs under {found[0][0]}: name the column {names}; "
    return f"did you mean {names}? " + ("say which; " if len(found) > 1 else "")


def _object_known(node: dict) -> bool:
    return set(node) - _DESCRIPTIVE <= _OBJECT_KEYS and node.get("additionalProperties", False) is False


def _group_complete(data: dict, path: tuple, required: tuple) -> bool:
    """Every present instance of the group at ``path`` holds its required fields."""
    nodes = [data]
    for key in path:
        nxt = []
        for node in nodes:
            if isinstance(node, dict) and key in node:
                nxt.append(node[key])
            elif isinstance(node, list) and isinstance(key, int) and key < len(node):
                nxt.append(node[key])
        nodes = nxt
    return all(isinstance(n, dict) and all(k in n for k in required) for n in nodes)


def _lists(node, path, name, line):
    """Dicts keyed 0, 1, 2, ... (from numbered columns) become lists."""
    if not isinstance(node, dict):
        return node
    keys = list(node)
    if keys and all(isinstance(k, int) for k in keys):
        ordered = sorted(keys)
        if ordered != list(range(len(ordered))):
            missing = next(i for i in range(len(ordered) + 1) if i not in node)
            raise DataError(name, f"gives {dotted(path + (ordered[-1],))} but leaves {dotted(path + (missing,))} empty",
                            "number list entries from 0 without gaps", path=dotted(path), line=line)
        return [_lists(node[i], path + (i,), name, line) for i in ordered]
    return {k: _lists(v, path + (k,), name, line) for k, v in node.items()}
