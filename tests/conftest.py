"""Shared test set-up: an isolated section cache for every test session."""

from __future__ import annotations

import pytest


@pytest.fixture(autouse=True)
def isolated_cache(tmp_path_factory, monkeypatch):
    """Every test writes section caches to a temporary folder, never the user's."""
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.getbasetemp() / "section-cache"))
