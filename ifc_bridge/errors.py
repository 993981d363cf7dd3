"""The reader's error, importable without loading the IFC parser (the job worker matches it)."""

from __future__ import annotations


class ModelReadError(Exception):
    """An IFC model (or its load table) cannot be used; the message is one line."""
