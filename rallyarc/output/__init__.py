"""Outputs: atomic file writes (:mod:`.export`), text tables for people (:mod:`.tables`) and
values JSON can hold (:mod:`.jsonsafe`)."""
