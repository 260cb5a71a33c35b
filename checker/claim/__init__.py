"""Reading a claim: load (keeping printed text), validate (schema), model (Claim)."""

from pathlib import Path
from typing import Any, Mapping

from .load import Document, document_from_mapping, load_document
from .model import Claim, Reported, build_claim
from .validate import validate_document


def read_claim(source: "str | Path | Mapping[str, Any]") -> Claim:
    """Load, validate and build a claim from a file path or a mapping."""
    doc = document_from_mapping(source) if isinstance(source, Mapping) else load_document(source)
    return claim_from_document(doc)


def claim_from_document(doc: Document) -> Claim:
    validate_document(doc)
    return build_claim(doc)


__all__ = ["Claim", "Document", "Reported", "read_claim", "claim_from_document"]
