"""What a misspelt or misplaced field name, or a misspelt choice, most likely meant.

One rule for claim files (``claimcheck check``) and table columns
(``claimcheck batch``), read from the claim schema so that a new field is
suggested without a word here:

1. the same name in another case or with ``-`` or a space for ``_``
   (``Stat_Error``, ``stat-error``);
2. a name people type for a field of the vocabulary (``shots`` and ``n`` for
   ``samples``, ``ci`` for ``interval``; ``error`` could be either error, so
   both are offered);
3. a field of that name in another section (``sigma`` at the top level belongs
   under ``significance``);
4. the closest spelling among the fields allowed there (``stat_eror``).

The order matters: ``sigma`` is a few letters from ``estimate``, but what the
author meant is ``significance.sigma``.
"""

from __future__ import annotations

import difflib
import re


# Names people type for a field of the vocabulary.  Several targets: ask which.
ALIASES = {
    "shots": ("samples",),
    "n": ("samples",),
    "n_samples": ("samples",),
    "num_samples": ("samples",),
    "sample_size": ("samples",),
    "systematic": ("syst_error",),
    "systematic_error": ("syst_error",),
    "syst": ("syst_error",),
    "statistical": ("stat_error",),
    "statistical_error": ("stat_error",),
    "stat": ("stat_error",),
    "standard_error": ("stat_error",),
    "se": ("stat_error",),
    "confidence_interval": ("interval",),
    "ci": ("interval",),
    "error": ("stat_error", "syst_error"),
    "uncertainty": ("stat_error", "syst_error"),
    "z": ("sigma",),
    "p": ("p_value",),
    "pvalue": ("p_value",),
}


def claim_schema() -> dict:
    from .validate import claim_schema as schema  # validate imports this module

    return schema()


def normalized(name: str) -> str:
    """``Stat-Error`` and ``stat error`` -> ``stat_error``."""
    return re.sub(r"[-\s]+", "_", str(name).strip().lower())


def _node_at(path: tuple) -> dict | None:
    """The schema of the object at ``path`` (list entries numbered or not)."""
    node = claim_schema()
    for key in path:
        if isinstance(key, int):
            node = node.get("items")
        else:
            node = node.get("properties", {}).get(key)
            if node is not None and node.get("type") == "array" and "items" in node:
                node = node["items"]
        if not isinstance(node, dict):
            return None
    return node


def _allowed(here: tuple) -> list[str]:
    node = _node_at(here)
    return sorted(node.get("properties", {})) if node else []


def homes(name: str) -> list[tuple]:
    """Field paths (top level, or one section down) where ``name`` is a field."""
    schema = claim_schema()
    found = [(name,)] if name in schema["properties"] else []
    for section in schema["properties"]:
        if name in _allowed((section,)):
            found.append((section, name))
    return found


def field_suggestions(name: str, here: tuple = ()) -> list[tuple]:
    """The field paths ``name``, written in the object at ``here``, most likely
    meant: one path, several when the name could mean either (ask which), or
    none.  Paths ignore list entry numbers (``("parts", "samples")``)."""
    here = tuple(k for k in here if not isinstance(k, int))
    allowed = _allowed(here)
    key = normalized(name)
    by_norm = {normalized(a): a for a in allowed}
    if key in by_norm and by_norm[key] != name:
        return [here + (by_norm[key],)]
    targets = ALIASES.get(key, (key,) if key != name else ())
    local = [here + (t,) for t in targets if t in allowed]
    if local:
        return local
    elsewhere = [h for t in (*targets, name) for h in homes(t) if h[:-1] != here]
    # A headline's significance is what a stray sigma or p_value most often means; the
    # comparison with a baseline has fields of the same names.
    headline = [h for h in elsewhere if h[0] == "significance"]
    if headline and not here:
        elsewhere = headline
    if elsewhere:
        return list(dict.fromkeys(elsewhere))
    close = difflib.get_close_matches(key, list(by_norm), n=1)
    return [here + (by_norm[close[0]],)] if close else []


def where(path: tuple) -> str:
    """``("significance", "sigma")`` -> "under significance"."""
    return f"under {path[0]}" if len(path) > 1 else "at the top level"


def field_hint(name: str, here: tuple = ()) -> str:
    """The words for a claim file: "did you mean 'samples'? ",
    "it belongs under significance; ", "did you mean 'stat_error' or 'syst_error'? ",
    or ""."""
    found = field_suggestions(name, here)
    plain = tuple(k for k in here if not isinstance(k, int))
    if not found:
        return ""
    if all(p[-1] == name for p in found):  # the name is right, the place is not
        return f"it belongs {' or '.join(where(p) for p in found)}; "
    shown = " or ".join(repr(p[-1]) + (f" ({where(p)})" if p[:-1] != plain else "") for p in found)
    return f"did you mean {shown}? " + ("say which; " if len(found) > 1 else "")


def corrected_path(path: tuple) -> list[tuple]:
    """Full field paths a table column's dotted name most likely meant
    (``signficance.sigma`` -> ``significance.sigma``; ``sigma`` ->
    ``significance.sigma``), list entry numbers kept; empty when some part
    of the name suggests nothing."""
    results: list[tuple] = [()]
    for key in path:
        nxt: list[tuple] = []
        for done in results:
            if isinstance(key, int):
                nxt.append(done + (key,))
                continue
            plain = tuple(k for k in done if not isinstance(k, int))
            if key in _allowed(plain):
                nxt.append(done + (key,))
                continue
            for suggestion in field_suggestions(key, done):
                if suggestion[:-1] == plain:
                    nxt.append(done + suggestion[-1:])
                elif not done:  # moved to another section: list sections take entry 0
                    section = suggestion[0]
                    entry = (0,) if _is_list(section) and len(suggestion) > 1 else ()
                    nxt.append((section, *entry, *suggestion[1:]))
        results = nxt
        if not results:
            return []
    return list(dict.fromkeys(results))


def _is_list(section: str) -> bool:
    node = claim_schema()["properties"].get(section, {})
    return node.get("type") == "array"


def choice_suggestions(value, choices) -> list[str]:
    """The choices a misspelt value most likely meant (``Linear-XEB``,
    ``linear_xeb`` -> ``linear-xeb``; ``inverse variance`` ->
    ``inverse-variance``; ``xeb`` -> ``linear-xeb`` or ``log-xeb``), or none."""
    if not isinstance(value, str):
        return []
    by_norm = {normalized(c).replace("-", "_"): c for c in choices if isinstance(c, str)}
    key = normalized(value).replace("-", "_")
    if key in by_norm:
        return [by_norm[key]]
    compact = {k.replace("_", ""): c for k, c in by_norm.items()}
    if key.replace("_", "") in compact:
        return [compact[key.replace("_", "")]]
    # Part of a name (``xeb``) could be several: offer each that holds it.
    holding = [c for k, c in by_norm.items() if len(key) >= 3 and key in k]
    if holding:
        return holding
    close = difflib.get_close_matches(key, list(by_norm), n=1)
    return [by_norm[close[0]]] if close else []
