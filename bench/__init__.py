"""Benchmark of picker against baselines; run ``python -m bench`` from the repository root.

Not shipped with the package. Needs the ``bench`` extra (DuckDB).
"""
