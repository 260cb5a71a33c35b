"""Raw per-sample data: chunked readers, per-circuit estimators, model fits,
the claim comparison, and simulation of datasets with known truth.

The entry point is :func:`checker.raw.analysis.analyse`, which returns a
:class:`checker.raw.result.RawResult`.
"""
