"""Test-wide settings: hypothesis runs derandomized so that every run checks the same cases."""

from hypothesis import settings

settings.register_profile("rallyarc", derandomize=True, deadline=None)
settings.load_profile("rallyarc")
