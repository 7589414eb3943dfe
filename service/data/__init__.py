"""Datasets as typed pandas frames, and calendar periods for time series."""
