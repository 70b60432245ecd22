"""The progress bar (sizer.progress): drawn on a terminal; a bar that goes when done is not made at all
where stderr is a file or a pipe (rich draws a live display only on a terminal or in a notebook, so
it would show nothing there), while a bar that stays is (rich writes its last state to a file)."""

from __future__ import annotations

import pytest

from sizer.progress import ProgressBar


def test_a_passing_bar_is_not_made_when_stderr_is_a_pipe(monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]) -> None:
    for name in ("FORCE_COLOR", "TTY_COMPATIBLE", "TTY_INTERACTIVE"):
        monkeypatch.delenv(name, raising=False)
    with ProgressBar("Section properties", 3) as bar:
        bar.report(1, 3, "IPE 200")
        assert bar.bar is None
        bar.report(2, 3, "IPE 220")
        bar.advance("IPE 240")
    assert bar.done == 3 and capsys.readouterr().err == ""


def test_a_passing_bar_is_drawn_on_a_terminal(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("FORCE_COLOR", "1")  # rich: the console is a terminal
    with ProgressBar("Section properties", 3) as bar:
        bar.report(1, 3, "IPE 200")
        assert bar.bar is not None


def test_a_bar_that_stays_is_written_to_a_pipe(monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]) -> None:
    for name in ("FORCE_COLOR", "TTY_COMPATIBLE", "TTY_INTERACTIVE"):
        monkeypatch.delenv(name, raising=False)
    with ProgressBar("Building", 2, transient=False) as bar:
        bar.begin()
        bar.advance("IPE 200")
        bar.advance("IPE 220")
    assert "Building" in capsys.readouterr().err
