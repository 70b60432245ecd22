"""The section's axes named in words beside their symbols: Iz is about the section's horizontal
axis (depth along y), Iy about its vertical one; whichever is the larger second moment is the major
axis. docs/output.md maps these to the handbooks' axis names.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from sizer.sections.properties import SectionProperties

SAME = 1e-3  # second moments this close (relative): no major or minor axis


def axis_words(props: SectionProperties) -> tuple[str, str]:
    """("major", "minor") for (Iz, Iy), or the reverse where Iy is larger; ("equal", "equal") for a
    section equally stiff about both."""
    if abs(props.Iz - props.Iy) <= SAME * max(props.Iz, props.Iy):
        return "equal", "equal"
    return ("major", "minor") if props.Iz > props.Iy else ("minor", "major")


def named(symbol: str, props: SectionProperties) -> str:
    """"Iz (major)", "Iy (minor)", "Mz (major)" ...: a symbol whose last letter is its axis, with the
    word; the bare symbol for a section equally stiff about both axes."""
    z_word, y_word = axis_words(props)
    word = z_word if symbol.endswith("z") else y_word
    return f"{symbol} ({word})" if word != "equal" else symbol


def inertia_pair(props: SectionProperties, value: Any) -> str:
    """"Iz (major) = 833.2 cm⁴, Iy (minor) = 443.6 cm⁴", or "Iz = Iy = 131.2 cm⁴ (no major axis)";
    `value(x)` writes a second moment with its unit."""
    if axis_words(props)[0] == "equal":
        return f"Iz = Iy = {value(props.Iz)} (no major axis)"
    return f"{named('Iz', props)} = {value(props.Iz)}, {named('Iy', props)} = {value(props.Iy)}"
