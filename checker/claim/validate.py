"""Validate a loaded document against schemas/claim.schema.json and turn the
first problem into one line a person can act on."""

from __future__ import annotations

import functools
import json
import re
from pathlib import Path

from ..errors import ClaimSchemaError
from .load import Document, dotted
from .suggest import choice_suggestions, field_hint

SCHEMA_PATH = Path(__file__).resolve().parent.parent / "data" / "claim.schema.json"

_OCTAL = re.compile(r"^[+-]?0[0-9]+$")
_SEXAGESIMAL = re.compile(r"^[+-]?[0-9]+(:[0-5]?[0-9])+(\.[0-9]*)?$")
_HEX = re.compile(r"^[+-]?0[xXoObB][0-9a-fA-F]+$")
_YAML11_BOOL = {"yes", "no", "on", "off", "y", "n"}
_NONFINITE = {".nan", "nan", ".inf", "inf", "+.inf", "-.inf", "infinity", "-infinity", "+inf", "-inf"}


@functools.lru_cache(maxsize=1)
def claim_schema() -> dict:
    with open(SCHEMA_PATH, encoding="utf-8") as handle:
        return json.load(handle)


@functools.lru_cache(maxsize=1)
def _validator():
    from jsonschema import Draft202012Validator

    return Draft202012Validator(claim_schema())


def validate_document(doc: Document) -> None:
    """Raise ClaimSchemaError for the first (earliest in the file) problem."""
    errors = list(_validator().iter_errors(doc.data))
    if not errors:
        return
    errors.sort(key=lambda e: (doc.line_of(_where(e)) or 0, len(e.absolute_path)))
    err = errors[0]
    path = _where(err)
    problem, allowed = describe(err, doc)
    raise ClaimSchemaError(doc.file, problem, allowed, path=dotted(path) or "(top level)",
                           line=doc.line_of(path))


def _where(err) -> tuple:
    """The field an error is about: for an unknown field, the unknown field
    itself (its own line), not the mapping that holds it."""
    path = tuple(err.absolute_path)
    if err.validator == "additionalProperties" and isinstance(err.instance, dict):
        extra = sorted(set(err.instance) - set(err.schema.get("properties", {})))
        if extra:
            return path + (extra[0],)
    return path


# Fields that may be written as an exact fraction (the schema's fraction pattern).
FRACTION_FIELDS = ("threshold, tolerance, interval.level, significance.required_sigma, "
                   "significance.upcrossing_sigma")


def _number_advice(text: str, path: tuple = ()) -> str | None:
    """Why a text that looks numeric is refused, for the YAML 1.1 surprises
    and for fractions."""
    t = text.strip()
    low = t.lower()
    if re.fullmatch(r"[+-]?[0-9.]+\s*/\s*[0-9.]+", t):
        if dotted(tuple(k for k in path if not isinstance(k, int))) in FRACTION_FIELDS.split(", "):
            return (f"{t} is not a fraction claimcheck reads",
                    "write whole numbers without spaces and a denominator of at least 1, such as 2/3")
        return (f"{t} is a fraction, which claimcheck reads only where a definition is exact "
                f"({FRACTION_FIELDS})", "write the value with the digits the paper printed, such as 0.667")
    if _OCTAL.match(t):
        return (f"{t} has a leading zero, which YAML 1.1 reads as an octal number "
                f"({int(t, 8) if set(t.lstrip('+-')) <= set('01234567') else 'not a number'})",
                "write the number without leading zeros")
    if _SEXAGESIMAL.match(t):
        return (f"{t} would be read by YAML 1.1 as a base-60 number",
                "write a plain decimal number")
    if _HEX.match(t):
        return (f"{t} is written in base 16, 8 or 2", "write a plain decimal number")
    if "_" in t and re.fullmatch(r"[+-]?[0-9_.eE+-]+", t):
        return (f"{t} uses underscores, which YAML 1.1 silently drops",
                "write the digits without underscores")
    if low in _YAML11_BOOL:
        return (f"{t} is a YAML 1.1 true/false word, not a number", "write a number")
    if low in _NONFINITE:
        return (f"{t} is not a finite number", "numbers must be finite: no NaN or infinity")
    if "," in t and re.fullmatch(r"[+-]?[0-9,]+(\.[0-9]*)?", t):
        return (f"{t} uses thousands separators", "write the digits without commas")
    return None


def _text_at(doc: Document, path) -> str | None:
    return doc.texts.get(tuple(path))


def describe(err, doc: Document) -> tuple[str, str]:
    """(what is wrong, what is allowed) for one jsonschema error."""
    schema = err.schema
    path = tuple(err.absolute_path)
    text = _text_at(doc, path)
    field = (f"{path[-2]} entry {path[-1]}" if len(path) > 1 and isinstance(path[-1], int) else str(path[-1])) if path else "the claim"
    validator = err.validator
    if validator == "additionalProperties":
        allowed_names = sorted(schema.get("properties", {}))
        extra = sorted(set(err.instance) - set(allowed_names)) if isinstance(err.instance, dict) else []
        name = extra[0] if extra else "?"
        hint = field_hint(name, path)
        where = dotted(path) if path else "a claim"
        return (f"unknown field {name!r}",
                f"{hint}allowed fields of {where}: {', '.join(allowed_names)}")
    if validator == "required":
        missing = re.findall(r"'([^']+)' is a required property", err.message)
        name = missing[0] if missing else err.message
        return (f"the required field {name!r} is missing",
                f"{'a claim' if not path else dotted(path)} needs {', '.join(schema.get('required', []))}")
    if validator == "enum":
        choices = " | ".join(str(c) for c in schema["enum"])
        close = choice_suggestions(err.instance, schema["enum"])
        hint = f"did you mean {' or '.join(map(repr, close))}? " if close else ""
        return (f"{field} is {err.instance!r}", f"{hint}allowed: {choices}")
    if validator in ("anyOf", "oneOf") and path == ("error_level",):
        shown = text if text is not None else json.dumps(err.instance)[:60]
        return (f"error_level must be a coverage or a multiple of sigma, got {shown!r}",
                "a coverage such as 0.95 or 95% (a 95% half-width), or a multiple such as '2 sigma'")
    if validator in ("anyOf", "oneOf"):
        kinds = {s.get("type") for s in schema[validator]}
        instance = err.instance
        if "number" in kinds or "integer" in kinds:
            counting = "integer" in kinds
            if isinstance(instance, str):
                advice = _number_advice(instance, path)
                if advice:
                    return advice
            if isinstance(instance, bool):
                return (f"{field} is {text or json.dumps(instance)}, a true/false value", "write a number")
            least = next((a.get("minimum", 1) for a in schema[validator] if a.get("type") == "integer"), 1)
            if counting and isinstance(instance, (int, float)):
                return (f"{field} must be a whole number of at least {least}, got {text or instance}",
                        "counts are whole numbers such as " + ("0, 47 or 1200" if least == 0 else "30 or 2.5e7"))
            if isinstance(instance, (int, float)):
                low = next((s.get("minimum") for s in schema[validator] if "minimum" in s), None)
                if low is not None:
                    return (f"{field} must be at least {low}, got {text or instance}", "write a larger number")
            shown = text if text is not None else json.dumps(instance)[:60]
            what = f"a whole number of at least {least}" if counting else "a number"
            return (f"{field} must be {what}, got {shown!r}",
                    "write digits such as 2.24e-3, 0.0224 or 2.24%")
    if validator == "type":
        expected = schema.get("type")
        shown = text if text is not None else json.dumps(err.instance)[:60]
        if expected == "boolean":
            return (f"{field} must be true or false, got {shown!r}", "write true or false")
        if expected == "object":
            return (f"{field} must be a mapping of fields, got {shown!r}",
                    f"allowed fields: {', '.join(sorted(schema.get('properties', {})))}")
        if expected == "array":
            return (f"{field} must be a list, got {shown!r}", "write a list of entries, one per line with '- '")
        if expected == "string":
            return (f"{field} must be text, got {shown!r}", "write the text, quoted if it looks like a number")
        return (f"{field} has the wrong kind of value ({shown!r})", f"expected {expected}")
    if validator in ("minItems", "maxItems") and schema.get("minItems") == schema.get("maxItems"):
        return (f"{field} holds {len(err.instance)} entries, not {schema['minItems']}",
                "write [items only ours got right, items only the baseline got right]")
    if validator == "minItems":
        return (f"{field} is empty", "give at least one entry or leave the field out")
    if validator == "minLength":
        return (f"{field} is empty", "write some text")
    if validator == "minimum":
        return (f"{field} must be at least {schema['minimum']}, got {text or err.instance}",
                "write a larger number")
    if validator == "pattern":
        advice = _number_advice(str(err.instance), path)
        if advice:
            return advice
        return (f"{field} must be a number, got {err.instance!r}",
                "write digits such as 2.24e-3, 0.0224 or 2.24%")
    return (f"{field}: {err.message}", "see `claimcheck schema`")
