"""Checking a whole survey: every check on every claim, then, across the set,
the recomputed significance of each claim and its Holm and Benjamini-Hochberg
adjusted p-values.

The per-claim work (reading a row, the schema, the checks) runs in worker
processes for large tables; each claim's z and p are read from its
``significance`` findings (the check recomputes them at the printed central
values), and their adjustment across the set runs once over whole columns with
numpy.  A row that cannot be
used becomes a row with verdict ``unusable`` and the reason, and the batch
goes on.
"""

from __future__ import annotations

import itertools
import math
import os
from dataclasses import dataclass, field, fields
from typing import Any, Callable, Sequence

from ..checks import run_checks
from ..claim import claim_from_document, read_claim
from ..claim.model import build_claim
from ..errors import ClaimcheckError
from ..report import log10_of_printed
from ..visible import visible
from .columns import ColumnPlan
from .table import Folder, Row, StreamedTable, SurveyTable, read_source, stream_source

UNUSABLE = "unusable"
NAN = math.nan
LN10 = math.log(10.0)
VERDICTS = ("consistent", "inconsistent", "incomplete", UNUSABLE)
PARALLEL_FROM = 2000  # rows: below this one process is faster than starting workers
CHUNK = 1000


@dataclass(frozen=True)
class ClaimRecord:
    """What a worker sends back for one claim: its verdict and counts, and the
    significance its ``significance`` check recomputed at the printed central
    values (NaN when the check could not recompute it)."""

    source: str
    title: str = ""
    claim_source: str = ""
    metric: str = ""
    verdict: str = UNUSABLE
    failed_checks: str = ""
    flagged: int = 0
    noted: int = 0
    agree: int = 0
    not_checked: int = 0
    for_information: int = 0
    sigma_printed: str = ""
    p_printed: str = ""
    log10_p_printed: float = NAN
    required_sigma: float = NAN
    sigma: float = NAN
    log_p: float = NAN
    # The look-elsewhere-corrected (global) significance at the same central values, for a
    # claim that states trials (Sidak) or upcrossings (Gross-Vitells); "" and NaN otherwise.
    look_elsewhere: str = ""
    sigma_global: float = NAN
    log_p_global: float = NAN
    two_sided: bool = False
    # The kind of claim and, for a comparison, the difference with its error and significance at
    # the printed central values; for local and global significances alone, the trials they imply.
    kind: str = ""
    difference: float = NAN
    difference_error: float = NAN
    sigma_difference: float = NAN
    log10_p_difference: float = NAN
    implied_trials: float = NAN
    problem: str = ""


# The summary table's columns, in order (DESIGN.md fixes the first names).
COLUMNS = ("source", "title", "verdict", "failed_checks", "sigma_recomputed", "p_recomputed",
           "p_holm", "p_bh", "required_sigma", "clears_required", "clears_holm", "clears_bh",
           "sigma_holm", "sigma_bh", "look_elsewhere", "sigma_global", "p_global", "log10_p_global",
           "sigma_printed", "p_printed", "log10_p_printed", "log10_p_recomputed",
           "log10_p_holm", "log10_p_bh", "kind", "difference_recomputed", "difference_error_recomputed",
           "sigma_difference", "log10_p_difference", "implied_trials", "metric", "claim_source",
           "flagged", "noted", "agree", "not_checked", "for_information", "problem")



@dataclass(frozen=True)
class BatchResult:
    """The outcome of one batch.

    Attributes
    ----------
    name : str
        The table or folder.
    frame : pandas.DataFrame
        One row per claim, columns :data:`COLUMNS`.
    summary : dict
        Counts across the set (see :func:`summarize`).
    problems : tuple of str
        One line per row that could not be used.
    """

    name: str
    frame: Any
    summary: dict
    problems: tuple = field(default_factory=tuple)

    @property
    def exit_status(self) -> int:
        return worst_status(self.summary)


def worst_status(summary: dict) -> int:
    """A batch's exit status, the worst as ``check`` ranks it: 2 when a row
    could not be used; otherwise 1 when a claim failed a check; otherwise 0."""
    if summary["unusable"]:
        return 2
    return 1 if summary["verdicts"]["inconsistent"] else 0


def _value(rep) -> float:
    return rep.value if rep is not None else NAN


def _log10_printed(rep) -> float:
    # log10 of a printed p from its text, so that 1e-400 keeps its size (checker.report)
    if rep is None:
        return NAN
    value = log10_of_printed(rep.text, rep.value)
    return NAN if value is None else value


def recomputed_significance(report) -> tuple[float, float]:
    """(z, natural log p) of a claim as its ``significance`` check recomputed
    them at the printed central values; NaN when it could not.

    The set-wide adjustment reads them from the findings rather than
    recomputing them (benchmarks/against_main.py measures what this costs)."""
    for f in report.findings:
        if f.check == "significance" and f.details.get("sigma_central") is not None:
            return f.details["sigma_central"], f.details["log10_p_central"] * LN10
    return NAN, NAN


def global_significance(claim, sigma: float, log_p: float) -> tuple[str, float, float]:
    """(method, z, natural log p) after the look-elsewhere correction the claim
    calls for: Gross-Vitells when it states upcrossings at a reference level,
    else Sidak when it states trials, as the ``look-elsewhere`` check takes
    them; ("", NaN, NaN) when it states neither or there is no local value."""
    from ..stats.multiplicity import log_gross_vitells, log_sidak
    from ..stats.tails import sigma_from_log_p

    sig = claim.significance
    if not (math.isfinite(sigma) and math.isfinite(log_p)):
        return "", NAN, NAN
    if sig.upcrossings is not None and sig.upcrossing_sigma is not None:
        method = "gross-vitells"
        log_g = log_gross_vitells(log_p, sigma, sig.upcrossings.value, sig.upcrossing_sigma.value)
    elif claim.trials is not None and claim.trials.value >= 1:
        method, log_g = "sidak", log_sidak(log_p, claim.trials.value)
    else:
        return "", NAN, NAN
    return method, sigma_from_log_p(log_g, sig.sided), log_g


def claim_kind(claim) -> str:
    """``comparison`` (a baseline), ``counts``, ``runs`` (a mean over a few runs, tested with
    Student's t), ``significances`` (no estimate: local and global significances only) or
    ``threshold`` (an estimate against a threshold)."""
    from ..checks.significance import few_runs

    if claim.baseline is not None:
        return "comparison"
    if claim.metric == "counts":
        return "counts"
    if few_runs(claim):
        return "runs"
    if claim.estimate is None:
        return "significances"
    return "threshold"


def kind_columns(report) -> dict:
    """The comparison's central difference and the implied trials, read from the findings."""
    out = {}
    for f in report.findings:
        d = f.details
        if f.check == "comparison" and isinstance(d.get("central"), dict) and "difference" not in out:
            c = d["central"]
            out.update(difference=c["difference"], difference_error=_or_nan(c.get("difference_error")),
                       sigma_difference=_or_nan(c.get("sigma")), log10_p_difference=_or_nan(c.get("log10_p")))
        elif f.check == "look-elsewhere" and f.statement == "implied_trials" and "implied_trials" not in out:
            out["implied_trials"] = _or_nan(d.get("trials_central"))  # at the printed central values
    return out


def _or_nan(x) -> float:
    return NAN if x is None else float(x)


def claim_record(claim, report, source: str) -> ClaimRecord:
    """The record of one checked claim: its verdict, counts and recomputed significance."""
    sig = claim.significance
    counts = report.counts()
    sigma, log_p = recomputed_significance(report)
    method, sigma_global, log_p_global = global_significance(claim, sigma, log_p)
    return ClaimRecord(
        source=source, title=claim.title, claim_source=claim.source or "", metric=claim.metric,
        verdict=report.verdict, failed_checks=";".join(report.failed_checks()), flagged=counts["fail"],
        noted=counts["warn"], agree=counts["pass"], not_checked=counts["skip"],
        for_information=counts["info"],
        sigma_printed=sig.sigma.text if sig.sigma else "", p_printed=sig.p_value.text if sig.p_value else "",
        log10_p_printed=_log10_printed(sig.p_value),
        required_sigma=_value(sig.required_sigma), sigma=sigma, log_p=log_p, look_elsewhere=method,
        sigma_global=sigma_global, log_p_global=log_p_global, two_sided=sig.sided == "two",
        kind=claim_kind(claim), **kind_columns(report))


def unusable_record(source: str, problem: str, title: str = "") -> ClaimRecord:
    return ClaimRecord(source=source, title=title, problem=problem)


def _internal(exc: Exception) -> str:
    return (f"claimcheck could not check this claim (internal error {type(exc).__name__}: {exc}); "
            "please report it with the row")


def check_row(plan: ColumnPlan, row: Row) -> tuple:
    """Read, validate, check and summarize one table row."""
    source = f"row {row.number}"
    name = f"{plan.table} {source}"
    title = ""
    try:
        doc, quick = plan.document(row.cells, name, row.line)
        title = doc.data.get("title") if isinstance(doc.data.get("title"), str) else ""
        # A row that passed the quick schema test is valid; any other goes
        # through the full validator for the message ``check`` would print.
        claim = build_claim(doc) if quick else claim_from_document(doc)
        return claim_record(claim, run_checks(claim), source)
    except ClaimcheckError as exc:
        return unusable_record(source, exc.one_line(), title)
    except Exception as exc:  # a bug in one claim's checks must not sink the whole survey
        return unusable_record(source, f"{name}: {_internal(exc)}", title)


def check_file(path: str) -> tuple:
    try:
        claim = read_claim(path)
        return claim_record(claim, run_checks(claim), path)
    except ClaimcheckError as exc:
        return unusable_record(path, exc.one_line())
    except Exception as exc:
        return unusable_record(path, f"{path}: {_internal(exc)}")


# --- worker processes ----------------------------------------------------

_WORKER: dict = {}


def _start_worker(header, name) -> None:
    _WORKER["plan"] = ColumnPlan(header, name) if header is not None else None


def _work(chunk) -> list:
    plan = _WORKER["plan"]
    if plan is None:
        return [check_file(p) for p in chunk]
    return [check_row(plan, r) for r in chunk]


def available_cpus() -> int:
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:  # not on every platform
        return os.cpu_count() or 1


def _items(source) -> tuple:
    """(header or None, the number of items, a fresh iterator over them) of a table or folder."""
    if isinstance(source, StreamedTable):
        return source.header, source.count, source.rows()
    if isinstance(source, SurveyTable):
        return source.header, len(source.rows), iter(source.rows)
    return None, len(source.files), iter(source.files)


def _chunks(items, size: int):
    while True:
        chunk = list(itertools.islice(items, size))
        if not chunk:
            return
        yield chunk


def record_chunks(source: SurveyTable | StreamedTable | Folder, jobs: int | None, progress):
    """The records of every claim, one list per chunk of :data:`CHUNK` claims, in order.

    At most two chunks per worker are in flight, so the parent holds a few
    thousand rows and records at any time whatever the table's length (issue 13)."""
    header, total, items = _items(source)
    plan = ColumnPlan(header, source.name) if header is not None else None  # header problems: before any work
    if jobs is None:
        jobs = 1 if total < PARALLEL_FROM else min(available_cpus(), 8)
    jobs = max(1, min(int(jobs), max(1, total // 2)))
    done = 0
    if jobs == 1:
        for chunk in _chunks(items, CHUNK):
            if plan is not None:
                records = [check_row(plan, r) for r in chunk]
            else:
                records = [check_file(p) for p in chunk]
            done += len(records)
            if progress:
                progress(done, total)
            yield records
        return
    import multiprocessing
    from collections import deque
    from concurrent.futures import ProcessPoolExecutor

    methods = multiprocessing.get_all_start_methods()
    context = multiprocessing.get_context("fork" if "fork" in methods else None)
    with ProcessPoolExecutor(max_workers=jobs, mp_context=context, initializer=_start_worker,
                             initargs=(header, source.name)) as pool:
        pending: deque = deque()
        chunks = _chunks(items, CHUNK)
        while True:
            for chunk in chunks:
                pending.append(pool.submit(_work, chunk))
                if len(pending) >= 2 * jobs:
                    break
            if not pending:
                return
            records = pending.popleft().result()
            done += len(records)
            if progress:
                progress(done, total)
            yield records


def _records(source, jobs: int | None, progress) -> list:
    out: list = []
    for records in record_chunks(source, jobs, progress):
        out.extend(records)
    return out


# --- across the set ------------------------------------------------------

METHODS = ("", "sidak", "gross-vitells")


@dataclass(frozen=True)
class Family:
    """What the set-wide adjustment and counts need of each claim, as compact
    columns (some 30 bytes a claim): the log p it is adjusted by (its
    look-elsewhere-corrected one where it states trials or upcrossings), its
    sidedness, required sigma, look-elsewhere method (index into
    :data:`METHODS`) and verdict (index into :data:`VERDICTS`)."""

    log_p_used: Any
    sigma_used: Any
    two_sided: Any
    required_sigma: Any
    method: Any
    verdict: Any


def family_of(records: list) -> Family:
    import numpy as np

    corrected = np.fromiter((bool(r.look_elsewhere) for r in records), bool, len(records))
    log_p = np.fromiter((r.log_p for r in records), float, len(records))
    log_p_global = np.fromiter((r.log_p_global for r in records), float, len(records))
    sigma = np.fromiter((r.sigma for r in records), float, len(records))
    sigma_global = np.fromiter((r.sigma_global for r in records), float, len(records))
    return Family(
        log_p_used=np.where(corrected, log_p_global, log_p),
        sigma_used=np.where(corrected, sigma_global, sigma),
        two_sided=np.fromiter((r.two_sided for r in records), bool, len(records)),
        required_sigma=np.fromiter((r.required_sigma for r in records), float, len(records)),
        method=np.fromiter((METHODS.index(r.look_elsewhere) for r in records), np.int8, len(records)),
        verdict=np.fromiter((VERDICTS.index(r.verdict) for r in records), np.int8, len(records)))


def join_families(parts: list) -> Family:
    import numpy as np

    return Family(*(np.concatenate([getattr(f, k.name) for f in parts]) for k in fields(Family)))


@dataclass(frozen=True)
class SetWide:
    """The adjustment across the whole set and what follows from it, per claim."""

    adjusted: Any  # stats.adjust.Adjustment
    sigma_holm: Any
    sigma_bh: Any

    def part(self, start: int, stop: int) -> "SetWide":
        a = self.adjusted
        return SetWide(type(a)(a.tested, a.p_holm[start:stop], a.p_bh[start:stop], a.log_p_holm[start:stop],
                               a.log_p_bh[start:stop]), self.sigma_holm[start:stop], self.sigma_bh[start:stop])


def set_wide(family: Family) -> SetWide:
    from ..stats.adjust import adjust_log_p_values
    from ..stats.columnwise import sigma_from_log_p

    adjusted = adjust_log_p_values(family.log_p_used)
    return SetWide(adjusted, sigma_from_log_p(adjusted.log_p_holm, family.two_sided),
                   sigma_from_log_p(adjusted.log_p_bh, family.two_sided))


def _clears(need, sigma):
    import numpy as np

    known = np.isfinite(need) & ~np.isnan(sigma)
    return known, np.where(known, sigma >= need, False)


def summary_of(family: Family, wide: SetWide, name: str, unit: str) -> dict:
    """The set-wide counts (see :func:`summarize`)."""
    import numpy as np

    corrected = family.method > 0
    known, raw = _clears(family.required_sigma, family.sigma_used)
    _, holm = _clears(family.required_sigma, wide.sigma_holm)
    _, bh = _clears(family.required_sigma, wide.sigma_bh)
    counts = np.bincount(family.verdict, minlength=len(VERDICTS))
    verdicts = {v: int(counts[i]) for i, v in enumerate(VERDICTS)}
    used = ~np.isnan(family.log_p_used)
    rows = int(family.verdict.size)
    return {
        "table": name,
        "unit": unit,
        "rows": rows,
        "checked": rows - verdicts[UNUSABLE],
        "unusable": verdicts[UNUSABLE],
        "verdicts": {k: verdicts[k] for k in VERDICTS[:3]},
        "tested": wide.adjusted.tested,
        "with_required_sigma": int(known.sum()),
        # claims whose required-sigma test and adjustment used the look-elsewhere-corrected value
        "look_elsewhere_corrected": int(corrected[used].sum()),
        "look_elsewhere_methods": {m: int(((family.method == METHODS.index(m)) & used).sum())
                                   for m in ("sidak", "gross-vitells")},
        "look_elsewhere_required": int((known & corrected).sum()),
        "clear_required_sigma": {"recomputed": int(raw[known].sum()), "holm": int(holm[known].sum()),
                                 "bh": int(bh[known].sum())},
    }


def frame_of(records: list, wide: SetWide):
    """The summary frame (columns :data:`COLUMNS`) of some consecutive claims,
    given the set-wide adjustment of those claims."""
    import numpy as np
    import pandas as pd

    names = [f.name for f in fields(ClaimRecord)]
    col = {k: [getattr(r, k) for r in records] for k in names}
    # Text from the claims and their file names is shown safely (a lone surrogate from an
    # undecodable name or a "\ud800" escape is not even storable in a string column).
    for key in ("source", "title", "claim_source", "problem", "sigma_printed", "p_printed"):
        col[key] = [visible(x) for x in col[key]]
    sigma = np.asarray(col["sigma"], dtype=float)
    log_p = np.asarray(col["log_p"], dtype=float)
    sigma_global = np.asarray(col["sigma_global"], dtype=float)
    log_p_global = np.asarray(col["log_p_global"], dtype=float)
    corrected = np.asarray([bool(m) for m in col["look_elsewhere"]], dtype=bool)
    with np.errstate(under="ignore"):
        p = np.exp(log_p)
        p_global = np.exp(log_p_global)
    # A claim that states trials or upcrossings is held to its required sigma, and adjusted
    # across the set, by its look-elsewhere-corrected significance; any other by its local one.
    sigma_used = np.where(corrected, sigma_global, sigma)
    adjusted = wide.adjusted
    need = np.asarray(col["required_sigma"], dtype=float)
    known, raw = _clears(need, sigma_used)
    _, holm = _clears(need, wide.sigma_holm)
    _, bh = _clears(need, wide.sigma_bh)

    def maybe(flag):
        # True / False, and missing where the claim states no required_sigma
        # or has no recomputed significance.
        return pd.arrays.BooleanArray(np.asarray(flag, dtype=bool), ~known)

    return pd.DataFrame({
        "source": col["source"], "title": col["title"], "verdict": col["verdict"],
        "failed_checks": col["failed_checks"], "sigma_recomputed": sigma, "p_recomputed": p,
        "p_holm": adjusted.p_holm, "p_bh": adjusted.p_bh, "required_sigma": need,
        "clears_required": maybe(raw), "clears_holm": maybe(holm), "clears_bh": maybe(bh),
        "sigma_holm": wide.sigma_holm, "sigma_bh": wide.sigma_bh, "look_elsewhere": col["look_elsewhere"],
        "sigma_global": sigma_global, "p_global": p_global, "log10_p_global": log_p_global / LN10,
        "sigma_printed": col["sigma_printed"], "p_printed": col["p_printed"],
        # log10 p beside every p: exact where p itself underflows to 0 (issue 16)
        "log10_p_printed": np.asarray(col["log10_p_printed"], dtype=float),
        "log10_p_recomputed": log_p / LN10, "log10_p_holm": adjusted.log_p_holm / LN10,
        "log10_p_bh": adjusted.log_p_bh / LN10, "kind": col["kind"],
        "difference_recomputed": np.asarray(col["difference"], dtype=float),
        "difference_error_recomputed": np.asarray(col["difference_error"], dtype=float),
        "sigma_difference": np.asarray(col["sigma_difference"], dtype=float),
        "log10_p_difference": np.asarray(col["log10_p_difference"], dtype=float),
        "implied_trials": np.asarray(col["implied_trials"], dtype=float), "metric": col["metric"],
        "claim_source": col["claim_source"],
        "flagged": np.asarray(col["flagged"], dtype=int), "noted": np.asarray(col["noted"], dtype=int),
        "agree": np.asarray(col["agree"], dtype=int), "not_checked": np.asarray(col["not_checked"], dtype=int),
        "for_information": np.asarray(col["for_information"], dtype=int),
        "problem": col["problem"],
    }, columns=list(COLUMNS))


def summarize(records: list, name: str, unit: str = "row"):
    """The summary frame and the set-wide counts from the per-claim records
    (``unit`` is what one record came from: a table ``row`` or a ``file``)."""
    family = family_of(records)
    wide = set_wide(family)
    frame = frame_of(records, wide)
    summary = summary_of(family, wide, name, unit)
    problems = tuple(visible(r.problem) for r in records if r.problem)
    return frame, summary, problems


def run_batch(source: Any, jobs: int | None = None,
              progress: Callable[[int, int], None] | None = None) -> BatchResult:
    """Check every claim of a survey and adjust their p-values across the set.

    Parameters
    ----------
    source : str, Path, pandas.DataFrame or list of mappings
        A CSV/TSV/Parquet table (one claim per row, columns named after the
        claim vocabulary with dots for nesting), a folder of claim files, a
        DataFrame with such columns, or a list of claim mappings.
    jobs : int, optional
        Worker processes; by default one for small tables and every available
        CPU (at most 8) from 2,000 claims up.
    progress : callable, optional
        Called as ``progress(done, total)`` after each chunk of claims.

    Returns
    -------
    BatchResult

    Raises
    ------
    InputFileError, DataError
        When the table as a whole cannot be used (missing, not a table, a
        column outside the vocabulary).  Single bad rows never raise.
    """
    table = read_source(source)
    records = _records(table, jobs, progress)
    frame, summary, problems = summarize(records, table.name, "row" if isinstance(table, SurveyTable) else "file")
    problems = getattr(table, "notes", ()) + problems  # a folder's second names of one file
    return BatchResult(table.name, frame, summary, problems)


# --- a batch that does not hold its table ---------------------------------

SHOW_FIRST = 20  # problems and flagged claims kept for the terminal summary (it shows 20)


@dataclass(frozen=True)
class StreamedBatch:
    """A batch checked without holding its table (``claimcheck batch``, issue 13).

    The parent keeps the compact columns the set-wide adjustment needs
    (:class:`Family`), the summary counts, the first :data:`SHOW_FIRST`
    problems and flagged claims, and, when the table is to be written, the
    records in a temporary spool file read back by :meth:`frames`.

    Attributes
    ----------
    name, summary : as :class:`BatchResult`
    problems : tuple of str
        The first problems (folder notes first), of ``problem_count`` in all.
    flagged : pandas.DataFrame
        source, title, verdict and failed_checks of the first inconsistent claims.
    """

    name: str
    summary: dict
    problems: tuple
    problem_count: int
    flagged: Any
    wide: Any
    spool: Any = None

    @property
    def exit_status(self) -> int:
        return worst_status(self.summary)

    def frames(self):
        """The summary frame (columns :data:`COLUMNS`) a chunk at a time, in
        order: together, row for row, the frame :func:`run_batch` makes."""
        import pickle

        if self.spool is None:
            raise ValueError("this batch kept no rows (stream_batch with keep_rows=False)")
        self.spool.seek(0)
        start = 0
        while True:
            try:
                records = pickle.load(self.spool)
            except EOFError:
                return
            stop = start + len(records)
            yield frame_of(records, self.wide.part(start, stop))
            start = stop

    def close(self) -> None:
        if self.spool is not None:
            self.spool.close()


def stream_batch(source: Any, jobs: int | None = None, progress: Callable[[int, int], None] | None = None,
                 keep_rows: bool = True) -> StreamedBatch:
    """:func:`run_batch` without holding the table: a CSV/TSV path is read a
    chunk at a time, and each chunk's records go to a temporary spool file
    (``keep_rows``) rather than staying in memory; the parent keeps some 30
    bytes a claim for the adjustment across the set.  Same parameters and
    errors as :func:`run_batch`; the caller closes the result."""
    import pickle
    import tempfile

    import pandas as pd

    table = stream_source(source)
    unit = "file" if isinstance(table, Folder) else "row"
    spool = tempfile.TemporaryFile(prefix="claimcheck-batch-") if keep_rows else None
    try:
        families, problems, flagged, count = [], [], [], 0
        for records in record_chunks(table, jobs, progress):
            families.append(family_of(records))
            for r in records:
                if r.problem:
                    count += 1
                    if len(problems) < SHOW_FIRST:
                        problems.append(visible(r.problem))
                if r.verdict == "inconsistent" and len(flagged) < SHOW_FIRST:
                    flagged.append((visible(r.source), visible(r.title), r.verdict, r.failed_checks))
            if spool is not None:
                pickle.dump(records, spool, protocol=pickle.HIGHEST_PROTOCOL)
        family = join_families(families)
        del families
        wide = set_wide(family)
        summary = summary_of(family, wide, table.name, unit)
    except BaseException:
        if spool is not None:
            spool.close()
        raise
    notes = tuple(getattr(table, "notes", ()))  # a folder's second names of one file
    frame = pd.DataFrame(flagged, columns=["source", "title", "verdict", "failed_checks"])
    return StreamedBatch(table.name, summary, notes + tuple(problems), len(notes) + count, frame, wide, spool)
