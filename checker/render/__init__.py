"""Renderers: pure functions Report -> str.  They never compute a statistic."""
