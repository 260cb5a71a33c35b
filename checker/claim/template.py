"""A commented claim skeleton for one metric (``claimcheck template``).

Every field and its comment come from the claim schema, so a field added to
the vocabulary appears here without a word; only which metric a field belongs
to, and words for the sections the schema does not describe, are written
here.  The skeleton loads as it stands (``claimcheck check`` says what it still
needs); the title and estimate it must hold to load are marked for replacing.
"""

from __future__ import annotations

from .validate import claim_schema

XEB = ("linear-xeb", "log-xeb")
# Fields that mean something for some metrics only; every other field is offered for every metric.
FOR_METRICS = {
    "qubits": XEB + ("heavy-output",),
    "sd": ("mean",),
    "integer_data": ("mean",),
    "items": ("mean",),
    "observed": ("counts",),
    "background": ("counts",),
    "background_error": ("counts",),
}
# Fields a metric cannot do without (build_claim refuses the claim otherwise), with a placeholder.
REQUIRED_FOR = {"counts": {"observed": "0", "background": "1"}}
# Words for the fields whose schema entry has no description.
SECTION_WORDS = {
    "interval": "a printed confidence interval, instead of or beside stat_error",
    "significance": "the significance as printed and the conventions behind it",
    "combination": "how the parts were combined, and the combined value as printed",
    "extrapolation": "headline = combined estimate x factor",
    "error_budget": "component error model: predicted = prod (1 - error) ** count",
}
PLACEHOLDER_TITLE = "Replace with what the claim is about"
COMMENT_AT = 32

HEADER = (
    "# Claim skeleton for metric {metric}, written by claimcheck template.",
    "# It loads as it stands: replace the title and the estimate, then remove the '# ' in front of",
    "# each field the paper prints and write its value with the digits the paper printed",
    "# (claimcheck reads the precision from them). Fields left commented out are simply absent;",
    "# claimcheck check says which checks need them.",
)


def _describe(node: dict) -> str:
    words = node.get("description", "")
    if "enum" in node:
        choices = " | ".join(str(c) for c in node["enum"])
        words = f"{words}: {choices}" if words else choices
    return words


def _line(head: str, words: str) -> str:
    return f"{head.ljust(COMMENT_AT - 1)} # {words}" if words else head


def skeleton(metric: str) -> str:
    """The skeleton's YAML text for ``metric`` (one of the schema's metrics).

    Raises
    ------
    ValueError
        For a metric the schema does not name.
    """
    schema = claim_schema()
    metrics = schema["properties"]["metric"]["enum"]
    if metric not in metrics:
        raise ValueError(f"unknown metric {metric!r}; one of {', '.join(metrics)}")
    lines = [h.format(metric=metric) for h in HEADER]
    required = set(schema.get("required", ()))
    for name, node in schema["properties"].items():
        if name.startswith("$") or metric not in FOR_METRICS.get(name, (metric,)):
            continue
        words = _describe(node) or SECTION_WORDS.get(name, "")
        if name == "title":
            lines.append(_line(f'title: "{PLACEHOLDER_TITLE}"', f"{words} (required)"))
        elif name == "metric":
            lines.append(_line(f"metric: {metric}", f"{words} (required)"))
        elif name == "estimate":
            lines.append(_line("estimate: 0", f"{words} (required): replace the 0"))
        elif name in required:
            lines.append(_line(f"{name}:", f"{words} (required)"))
        elif name in REQUIRED_FOR.get(metric, {}):
            value = REQUIRED_FOR[metric][name]
            lines.append(_line(f"{name}: {value}", f"{words} (required for {metric}): replace the {value}"))
        elif node.get("type") == "object":
            lines.append(_line(f"# {name}:", words))
            for sub, sub_node in node.get("properties", {}).items():
                lines.append(_line(f"#   {sub}:", _describe(sub_node)))
        elif node.get("type") == "array":
            item = node.get("items", {}).get("properties", {})
            lines.append(_line(f"# {name}:", words + " (one entry each, each starting with '- ')"))
            for i, (sub, sub_node) in enumerate(item.items()):
                lines.append(_line(f"#   {'- ' if i == 0 else '  '}{sub}:", _describe(sub_node)))
        else:
            lines.append(_line(f"# {name}:", words))
    return "\n".join(lines) + "\n"
