"""Training-data helpers for the span reader (invented data only)."""
