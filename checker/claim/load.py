"""Load a YAML or JSON claim file, keeping every number's printed text and line.

PyYAML follows YAML 1.1, where ``1e-3`` is a string, ``017`` is octal 15,
``1:30`` is 90 and ``yes`` is true.  So the YAML text is only *composed* into a
node tree (no object is ever constructed, which also makes the load safe) and
each scalar is resolved here by one plain rule: a plain scalar in decimal
notation is a number and keeps its text; ``true``/``false`` are booleans;
``null``/``~``/empty are null; everything else is a string.  The schema and the
claim builder then refuse the surprising forms with a message that says why.

JSON is read with ``json.loads`` (``parse_float``/``parse_int`` keep the text,
``parse_constant`` refuses NaN and Infinity) and parsed once more by the YAML
parser only to learn line numbers.
"""

from __future__ import annotations

import json
import math
import re
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType
from typing import Any, Mapping

import yaml

from ..errors import InputFileError
from ..input_files import read_limited, regular_file
from ..stats.precision import is_number_text

MAX_BYTES = 1_000_000
MAX_DEPTH = 32
# libyaml's loader where PyYAML was built with it (PyPI's wheels are): it composes
# a 1,000-part file about 6x faster than the pure-Python one, with the same nodes,
# tags and marks (tests/claim/test_load.py compares them).
SAFE_LOADER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)
PathKey = tuple  # a field path: ("parts", 2, "estimate")

_STANDARD_TAGS = {f"tag:yaml.org,2002:{t}" for t in
                  ("str", "int", "float", "bool", "null", "map", "seq", "timestamp")}
_NULLS = {"", "~", "null", "Null", "NULL"}
_TRUE = {"true", "True", "TRUE"}
_FALSE = {"false", "False", "FALSE"}


@dataclass(frozen=True)
class Document:
    """A parsed claim document.

    Attributes
    ----------
    file : str
        Name used in messages.
    data : Any
        Plain Python values: dict, list, str, int, float, bool, None.
    texts : mapping
        Field path -> the text the number was printed with.
    lines : mapping
        Field path -> 1-based line number (where known).
    """

    file: str
    data: Any
    texts: Mapping[PathKey, str] = field(default_factory=dict)
    lines: Mapping[PathKey, int] = field(default_factory=dict)

    def line_of(self, path: PathKey) -> int | None:
        """Line of ``path``, or of its nearest enclosing field."""
        path = tuple(path)
        while path:
            if path in self.lines:
                return self.lines[path]
            path = path[:-1]
        return self.lines.get((), None)


def dotted(path: PathKey) -> str:
    return ".".join(str(p) for p in path)


def load_document(path: str | Path) -> Document:
    """Read a claim file (``.yaml``, ``.yml`` or ``.json``).

    Raises
    ------
    InputFileError
        Missing, not a regular file (a directory, a FIFO, a device), unreadable,
        larger than 1 MB, not UTF-8 text, or not a single YAML/JSON mapping.
    """
    p = Path(path)
    name = str(path)
    allowed = "give the path of a YAML or JSON claim file"
    regular_file(name, allowed)
    fmt = _format_of(p)
    raw = read_limited(name, MAX_BYTES, allowed)  # read-only, always; never more than the limit
    return parse_bytes(raw, name, fmt)


def _format_of(p: Path) -> str:
    suffix = p.suffix.lower()
    if suffix == ".json":
        return "json"
    if suffix in (".yaml", ".yml"):
        return "yaml"
    raise InputFileError(str(p), f"has the extension {p.suffix or '(none)'!r}",
                         "a claim file ends in .yaml, .yml or .json")


def parse_bytes(raw: bytes, name: str, fmt: str) -> Document:
    """Parse the bytes of a claim file; ``fmt`` is ``yaml`` or ``json``."""
    if len(raw) > MAX_BYTES:
        raise InputFileError(name, f"is larger than {MAX_BYTES:,} bytes",
                             "a claim file is a short text file")
    if not raw.strip():
        raise InputFileError(name, "is empty", "a claim file holds one mapping of fields")
    if b"\x00" in raw:
        raise InputFileError(name, "holds binary data (a NUL byte)", "a claim file is UTF-8 text")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputFileError(name, f"is not UTF-8 text (byte {exc.start})",
                             "save the file as UTF-8") from None
    if fmt == "json":
        return _parse_json(text, name)
    return _parse_yaml(text, name)


def parse_text(text: str, name: str, fmt: str) -> Document:
    return parse_bytes(text.encode("utf-8"), name, fmt)


# --- YAML -----------------------------------------------------------------

def _depth_bound(text: str) -> int:
    """An upper bound on the nesting depth of a YAML text, from its characters:
    a flow collection opens with a bracket, a block sequence with a "-", a
    block mapping with its first key's ":" (or a "?"), so their count bounds
    the depth.  Short claim files pass at once, and the parser's events are
    walked only for the rest."""
    return sum(text.count(c) for c in "[{-:?")


def _refuse_deep_nesting(text: str, name: str) -> None:
    """Walk the parser's events (iteratively) and stop at the first level past
    MAX_DEPTH, before the recursive composer would spend seconds on it.

    The events, not the characters: brackets inside comments and quoted text
    are no nesting.  The walk stops as soon as it is too deep, and the parser
    looks at most about a thousand characters ahead, so a file of a million
    "[" is refused in a tenth of a second (measured).
    """
    if _depth_bound(text) <= MAX_DEPTH:
        return
    try:
        _walk_depth(text, name, SAFE_LOADER)
    except yaml.MarkedYAMLError as exc:
        # libyaml's refusal is read again by the reference loader (see _compose_nodes).
        if SAFE_LOADER is yaml.SafeLoader or "nesting depth" in (exc.problem or ""):
            raise
        _walk_depth(text, name, yaml.SafeLoader)


def _walk_depth(text: str, name: str, loader) -> None:
    depth = 0
    for event in yaml.parse(text, Loader=loader):
        if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
            depth += 1
            if depth > MAX_DEPTH:
                raise InputFileError(name, "is nested too deeply",
                                     f"a claim file nests at most {MAX_DEPTH} levels",
                                     line=event.start_mark.line + 1)
        elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
            depth -= 1


def _compose_nodes(text: str, name: str) -> list:
    """The documents' nodes, by libyaml where it is built in; a text libyaml
    refuses is read again by the pure-Python loader, the reference, so that
    what is accepted and each message do not depend on the build (libyaml
    refuses escapes such as "\\ud800" that the reference reads)."""
    _refuse_deep_nesting(text, name)
    if SAFE_LOADER is not yaml.SafeLoader:
        try:
            return list(yaml.compose_all(text, Loader=SAFE_LOADER))
        except yaml.MarkedYAMLError as exc:
            if "nesting depth" in (exc.problem or ""):
                raise
        except yaml.YAMLError:
            pass
    return list(yaml.compose_all(text, Loader=yaml.SafeLoader))


def _compose(text: str, name: str):
    try:
        nodes = _compose_nodes(text, name)
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark is not None else None
        problem = (exc.problem or exc.context or "malformed YAML").strip()
        if "nesting depth" in problem:  # libyaml's own limit, met while scanning ahead
            raise InputFileError(name, "is nested too deeply", f"a claim file nests at most {MAX_DEPTH} levels",
                                 line=line) from None
        raise InputFileError(name, f"is not valid YAML ({problem})",
                             "fix the syntax at that line", line=line) from None
    except yaml.YAMLError as exc:
        raise InputFileError(name, f"is not valid YAML ({exc})", "fix the syntax") from None
    except RecursionError:
        raise InputFileError(name, "is nested too deeply",
                             f"a claim file nests at most {MAX_DEPTH} levels") from None
    nodes = [n for n in nodes if n is not None]
    if not nodes:
        raise InputFileError(name, "holds no document", "a claim file holds one mapping of fields")
    if len(nodes) > 1:
        raise InputFileError(name, f"holds {len(nodes)} YAML documents",
                             "one claim per file", line=nodes[1].start_mark.line + 1)
    return nodes[0]


def _parse_yaml(text: str, name: str) -> Document:
    root = _compose(text, name)
    texts: dict = {}
    lines: dict = {}
    data = _convert(root, (), name, texts, lines, set(), 0)
    _require_mapping(data, name)
    return Document(name, data, MappingProxyType(texts), MappingProxyType(lines))


def _convert(node, path, name, texts, lines, seen, depth):
    if depth > MAX_DEPTH:
        raise InputFileError(name, "is nested too deeply",
                             f"a claim file nests at most {MAX_DEPTH} levels",
                             path=dotted(path), line=node.start_mark.line + 1)
    if id(node) in seen:
        # The composer hands an alias back as the very node it names: a node met
        # twice is an alias.  Refusing it also stops exponential "laughs" documents.
        # That node's own mark is the anchor's line; the alias's line is its field's.
        raise InputFileError(name, "uses a YAML alias (*name)",
                             "write each value out; anchors and aliases are not accepted",
                             path=dotted(path), line=lines.get(path, node.start_mark.line + 1))
    seen.add(id(node))
    if node.tag not in _STANDARD_TAGS:
        raise InputFileError(name, f"uses the YAML tag {node.tag!r}",
                             "plain values only; tags are not accepted",
                             path=dotted(path), line=node.start_mark.line + 1)
    lines.setdefault(path, node.start_mark.line + 1)
    if isinstance(node, yaml.MappingNode):
        out: dict = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode):
                raise InputFileError(name, "has a field name that is not plain text",
                                     "field names are words such as estimate",
                                     path=dotted(path), line=key_node.start_mark.line + 1)
            if key_node.tag == "tag:yaml.org,2002:merge" or key_node.value == "<<":
                raise InputFileError(name, "uses a YAML merge key (<<)",
                                     "write each field out", path=dotted(path),
                                     line=key_node.start_mark.line + 1)
            key = key_node.value
            if key in out:
                raise InputFileError(name, f"gives the field {key!r} twice",
                                     "each field appears once", path=dotted(path + (key,)),
                                     line=key_node.start_mark.line + 1)
            lines[path + (key,)] = key_node.start_mark.line + 1
            out[key] = _convert(value_node, path + (key,), name, texts, lines, seen, depth + 1)
        return out
    if isinstance(node, yaml.SequenceNode):
        return [_convert(item, path + (i,), name, texts, lines, seen, depth + 1)
                for i, item in enumerate(node.value)]
    value = node.value
    if node.style:  # quoted or a block scalar: always text (plain is None, or "" from libyaml)
        texts[path] = value
        return value
    return _plain_scalar(value, path, texts)


def _plain_scalar(value: str, path, texts):
    texts[path] = value
    if value in _NULLS:
        return None
    if value in _TRUE:
        return True
    if value in _FALSE:
        return False
    if is_number_text(value) and not value.endswith("%"):
        number = float(value)
        if math.isfinite(number):
            if re.fullmatch(r"[+-]?[0-9]+", value):
                return int(value)
            return number
    return value


def _require_mapping(data, name):
    if not isinstance(data, dict):
        kind = type(data).__name__ if data is not None else "nothing"
        kind = {"list": "a list", "str": "a single text", "int": "a single number",
                "float": "a single number", "bool": "a single true/false"}.get(kind, kind)
        raise InputFileError(name, f"holds {kind}, not a mapping of fields",
                             "a claim file holds fields such as title, metric and estimate")


# --- JSON -----------------------------------------------------------------

class _JsonNumber(str):
    """A JSON number's text, kept until the walk turns it into a value."""


def _refuse_constant(token: str):
    raise ValueError(f"the constant {token} is not a finite number")


def _pairs(pairs):
    out = {}
    for key, value in pairs:
        if key in out:
            raise _DuplicateKey(key)
        out[key] = value
    return out


class _DuplicateKey(Exception):
    pass


def _parse_json(text: str, name: str) -> Document:
    try:
        data = json.loads(text, parse_float=_JsonNumber, parse_int=_JsonNumber,
                          parse_constant=_refuse_constant, object_pairs_hook=_pairs)
    except json.JSONDecodeError as exc:
        raise InputFileError(name, f"is not valid JSON ({exc.msg})", "fix the syntax at that line",
                             line=exc.lineno) from None
    except _DuplicateKey as exc:
        raise InputFileError(name, f"gives the field {exc.args[0]!r} twice",
                             "each field appears once") from None
    except ValueError as exc:
        raise InputFileError(name, f"is not usable JSON ({exc})",
                             "numbers must be finite: no NaN or Infinity") from None
    except RecursionError:
        raise InputFileError(name, "is nested too deeply",
                             f"a claim file nests at most {MAX_DEPTH} levels") from None
    texts: dict = {}
    data = _walk_json(data, (), name, texts, 0)
    _require_mapping(data, name)
    return Document(name, data, MappingProxyType(texts), MappingProxyType(_json_lines(text)))


def _walk_json(value, path, name, texts, depth):
    if depth > MAX_DEPTH:
        raise InputFileError(name, "is nested too deeply",
                             f"a claim file nests at most {MAX_DEPTH} levels", path=dotted(path))
    if isinstance(value, dict):
        return {k: _walk_json(v, path + (k,), name, texts, depth + 1) for k, v in value.items()}
    if isinstance(value, list):
        return [_walk_json(v, path + (i,), name, texts, depth + 1) for i, v in enumerate(value)]
    if isinstance(value, _JsonNumber):
        texts[path] = str(value)
        number = float(value)
        if not math.isfinite(number):
            raise InputFileError(name, f"the number {value} is not finite",
                                 "numbers must be finite", path=dotted(path))
        if re.fullmatch(r"-?[0-9]+", value):
            return int(value)
        return number
    if isinstance(value, str):
        texts[path] = value
    return value


class _NotJsonEvents(Exception):
    """An event stream a JSON text never gives (a non-text key, an alias, a second document)."""


_OPENING = (yaml.ScalarEvent, yaml.MappingStartEvent, yaml.SequenceStartEvent)
_CLOSING = (yaml.MappingEndEvent, yaml.SequenceEndEvent)


def _json_lines(text: str) -> dict:
    """Line numbers of a JSON document's fields, learnt from the YAML parser
    (JSON is valid YAML flow syntax): the map :func:`json_lines_composed` makes
    from the composed nodes, read from the parser's events instead, whose marks
    the nodes take.  Building no nodes and resolving no tags, it costs about half
    (it was a quarter of loading a 1,000-part claim); tests/claim/test_load.py
    holds the two equal.  Empty when the parser disagrees, as there."""
    try:
        return _event_lines(text)
    except _NotJsonEvents:
        return json_lines_composed(text)
    except (yaml.YAMLError, RecursionError):
        return {}


def _event_lines(text: str) -> dict:
    lines: dict = {}
    # Per open collection: [its path, a mapping?, the current key or the next index, a key next?]
    stack: list = []
    documents = 0
    for event in yaml.parse(text, Loader=SAFE_LOADER):
        kind = type(event)
        if kind in _OPENING:
            if not stack:
                path = ()
            else:
                top = stack[-1]
                if top[1] and top[3]:  # a mapping's key
                    if kind is not yaml.ScalarEvent:
                        raise _NotJsonEvents
                    top[2], top[3] = event.value, False
                    lines[top[0] + (event.value,)] = event.start_mark.line + 1
                    continue
                path = top[0] + (top[2],)
                if top[1]:
                    top[3] = True
                else:
                    top[2] += 1
                if len(path) > MAX_DEPTH:
                    raise _NotJsonEvents
            lines.setdefault(path, event.start_mark.line + 1)
            if kind is yaml.MappingStartEvent:
                stack.append([path, True, None, True])
            elif kind is yaml.SequenceStartEvent:
                stack.append([path, False, 0, False])
        elif kind in _CLOSING:
            stack.pop()
        elif kind is yaml.DocumentStartEvent:
            documents += 1
            if documents > 1:
                raise _NotJsonEvents
        elif kind is yaml.AliasEvent:
            raise _NotJsonEvents
    return lines


def json_lines_composed(text: str) -> dict:
    """Line numbers of a JSON document's fields, learnt from the YAML composer
    (the reference of :func:`_json_lines`).  Empty when the composer disagrees."""
    try:
        root = yaml.compose(text, Loader=SAFE_LOADER)
    except (yaml.YAMLError, RecursionError):
        return {}
    lines: dict = {}

    def walk(node, path, depth):
        if depth > MAX_DEPTH:
            return
        lines.setdefault(path, node.start_mark.line + 1)
        if isinstance(node, yaml.MappingNode):
            for k, v in node.value:
                key = getattr(k, "value", None)
                if isinstance(key, str):
                    lines[path + (key,)] = k.start_mark.line + 1
                    walk(v, path + (key,), depth + 1)
        elif isinstance(node, yaml.SequenceNode):
            for i, v in enumerate(node.value):
                walk(v, path + (i,), depth + 1)

    if root is not None:
        walk(root, (), 0)
    return lines


def document_from_mapping(mapping: Mapping[str, Any], name: str = "<mapping>") -> Document:
    """A Document from Python values (the notebook API).  A float's printed
    text is its shortest round-trip representation."""
    texts: dict = {}

    def walk(value, path, depth):
        if depth > MAX_DEPTH:
            raise InputFileError(name, "is nested too deeply",
                                 f"a claim nests at most {MAX_DEPTH} levels", path=dotted(path))
        if isinstance(value, Mapping):
            return {str(k): walk(v, path + (str(k),), depth + 1) for k, v in value.items()}
        if isinstance(value, (list, tuple)):
            return [walk(v, path + (i,), depth + 1) for i, v in enumerate(value)]
        if isinstance(value, bool) or value is None:
            return value
        if isinstance(value, (int, float)):
            if isinstance(value, float) and not math.isfinite(value):
                raise InputFileError(name, f"the number {value} is not finite",
                                     "numbers must be finite", path=dotted(path))
            # numpy.float64 is a float whose repr is "np.float64(0.25)": use the plain one.
            value = float(value) if isinstance(value, float) else int(value)
            texts[path] = repr(value)
            return value
        if hasattr(value, "item") and callable(value.item):  # numpy scalars
            return walk(value.item(), path, depth)
        if isinstance(value, str):
            texts[path] = value
            return value
        raise InputFileError(name, f"holds a {type(value).__name__}",
                             "values are numbers, text, true/false, lists and mappings",
                             path=dotted(path))

    data = walk(mapping, (), 0)
    _require_mapping(data, name)
    return Document(name, data, MappingProxyType(texts), {})
