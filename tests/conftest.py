"""Shared test set-up: an isolated section cache for every test session."""

from __future__ import annotations

import os

for _name in ("OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "OMP_NUM_THREADS"):  # as the sizer command does (sizer.cli.main)
    os.environ.setdefault(_name, "1")

import pytest  # noqa: E402


@pytest.fixture(autouse=True)
def isolated_cache(tmp_path_factory, monkeypatch):
    """Every test writes section caches to a temporary folder, never the user's."""
    monkeypatch.setenv("SIZER_CACHE_DIR", str(tmp_path_factory.getbasetemp() / "section-cache"))


def pytest_collection_modifyitems(items: list[pytest.Item]) -> None:
    """The fast subset (`pytest -m "not slow"`) leaves out every property test (hypothesis draws
    many members each) besides the tests marked slow by hand."""
    for item in items:
        function = getattr(item, "function", None)
        if getattr(function, "is_hypothesis_test", False):
            item.add_marker(pytest.mark.slow)
