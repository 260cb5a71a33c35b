"""A draft that always loads: write it, read it back through the claim loader,
the schema and the claim builder exactly as ``claimcheck check`` does, and
move any field they refuse into the draft's "Dropped" list with the loader's
own words, until the file loads.

A field the claim cannot do without (title, metric, estimate) is never
dropped: the draft stops with one line instead.
"""

from __future__ import annotations

from dataclasses import replace

from ..claim import claim_from_document
from ..claim.load import parse_text
from ..errors import ClaimcheckError
from .model import Draft, DraftError
from .needs import missing as still_needed
from .writer import render_yaml

MAX_ROUNDS = 200


def _path(text: str) -> tuple:
    if not text or text.startswith("("):
        return ()
    return tuple(int(p) if p.isdigit() else p for p in text.split("."))


def make_loadable(draft: Draft) -> tuple[Draft, str]:
    """The draft and its YAML text, which the claim loader accepts.

    Raises
    ------
    DraftError
        When a field the claim needs is refused (a metric this version of the
        schema does not know, an estimate that is no finite number).
    """
    for _ in range(MAX_ROUNDS):
        text = render_yaml(draft)
        try:
            claim_from_document(parse_text(text, draft.name, "yaml"))
            if draft.dropped:
                # What a check still needs, now that some fields are gone.
                metric = draft.get(("metric",))
                needed = tuple(still_needed(list(draft.fields), metric.value if metric else ""))
                if needed != draft.missing:
                    draft = replace(draft, missing=needed)
                    text = render_yaml(draft)
            return draft, text
        except ClaimcheckError as exc:
            path = _path(exc.path)
            problem = exc.problem + (f"; {exc.allowed}" if exc.allowed and len(exc.allowed) < 80 else "")
            if not path and "estimate" in exc.problem and draft.get(("estimate",)) is None:
                raise DraftError(draft.name, "prints no number that reads as the estimate",
                                 "paste the sentence with the result") from None
            if not path or path[0] in ("title", "metric", "estimate"):
                what = draft.get(("metric",))
                if path[:1] == ("metric",) and what is not None:
                    raise DraftError(draft.name, f"reads as a {what.value} claim, which this version of the "
                                     f"claim schema does not hold ({exc.problem})",
                                     "write the claim file by hand (claimcheck schema lists the "
                                     "fields the schema holds)") from None
                raise DraftError(draft.name, f"gives a draft the claim loader refuses: {exc.problem}",
                                 exc.allowed or "write the claim by hand") from None
            gone = tuple(f for f in draft.fields if f.path[:len(path)] == path)
            if not gone:
                raise DraftError(draft.name, f"gives a draft the claim loader refuses: {exc.problem}",
                                 exc.allowed or "write the claim by hand") from None
            kept = tuple(f for f in draft.fields if f not in gone)
            draft = replace(draft, fields=kept, dropped=draft.dropped + tuple((f, problem) for f in gone))
    raise DraftError(draft.name, "gives a draft the claim loader keeps refusing", "write the claim by hand")
