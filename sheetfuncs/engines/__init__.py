"""Exact analyses pushed down to database engines: per-group exact sums computed where the data live.
"""
