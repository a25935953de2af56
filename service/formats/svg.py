"""An SVG drawing of a realized transformer: a top view of strip steps, or a coax cut-away.

Horizontal and vertical scales are set separately so that short, wide and long, narrow sections
all stay visible; both scales are printed on the drawing. Every section is one <rect> of class
"section" with a tooltip of its impedance, width (or inner diameter) and length, and the same
words as a label beside it (every k-th section only, when there are more than can be read).
"""

from __future__ import annotations

import math
from xml.sax.saxutils import escape

from service.schemas.results import AnalysisResult

WIDTH_PX = 960
DRAW_LEFT, DRAW_RIGHT = 70, 890
AXIS_Y = 172
MAX_HALF_HEIGHT_PX = 90
MIN_HALF_HEIGHT_PX = 1.0
MAX_VISIBLE_LABELS = 24  # beyond this many sections every k-th is labelled; each keeps its own tooltip
LABEL_TOP = 290
FEED_PX = 40  # the feed line stubs drawn at each end (not to the horizontal scale)
COPPER = "#b8733a"
BOARD = "#20423a"
SHIELD = "#8a96a3"
INK = "#1d2731"


def _size(section, kind: str) -> float:
    """The drawn transverse size of a section: width, inner diameter, or 1/Z on the ideal line."""
    if kind == "coax":
        return section.inner_diameter_m
    if section.width_m is not None:
        return section.width_m
    return 1.0 / section.impedance_ohm


def _label(section, kind: str) -> str:
    if kind == "coax":
        size = f"d {section.inner_diameter_m * 1e3:.3f} mm"
    elif section.width_m is not None:
        size = f"W {section.width_m * 1e3:.3f} mm"
    else:
        size = f"{section.electrical_length_deg:.1f} deg"
    return f"{section.impedance_ohm:.2f} ohm | {size} | L {section.length_m * 1e3:.3f} mm"


def transformer_svg(
    design: AnalysisResult,
    title: str,
    outer_diameter_m: float | None = None,
    feed_widths_m: tuple[float, float] | None = None,
) -> str:
    """The drawing as SVG text; with feed_widths_m (planar lines) a feed line stub at each end."""
    kind = design.medium
    sections = design.sections
    total = max(sum(s.length_m for s in sections), 1e-12)  # sections may have (nearly) vanished
    sizes = [_size(s, kind) for s in sections]
    largest = max([*sizes, *(feed_widths_m or ()), outer_diameter_m or 0.0, 1e-12])
    x_scale = (DRAW_RIGHT - DRAW_LEFT) / total
    y_scale = MAX_HALF_HEIGHT_PX / (0.5 * largest)
    labelled_every = math.ceil(len(sections) / MAX_VISIBLE_LABELS)
    label_step = max(9.0, min(14.0, (DRAW_RIGHT - DRAW_LEFT) / max(len(sections) / labelled_every, 1)))
    height_px = LABEL_TOP + 300
    parts = [
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{WIDTH_PX}" height="{height_px}" '
        f'viewBox="0 0 {WIDTH_PX} {height_px}" font-family="sans-serif" font-size="11" fill="{INK}">',
        f"<title>{escape(title)}</title>",
        f'<rect x="0" y="0" width="{WIDTH_PX}" height="{height_px}" fill="#f4f1ea"/>',
        f'<text x="{DRAW_LEFT}" y="24" font-size="15" font-weight="bold">{escape(title)}</text>',
    ]
    if kind == "coax" and outer_diameter_m:
        half = 0.5 * outer_diameter_m * y_scale
        parts.append(
            f'<rect class="shield" x="{DRAW_LEFT}" y="{AXIS_Y - half:.2f}" width="{DRAW_RIGHT - DRAW_LEFT}" '
            f'height="{2 * half:.2f}" fill="none" stroke="{SHIELD}" stroke-width="3"/>'
        )
    elif kind in ("microstrip", "stripline"):
        parts.append(
            f'<rect class="board" x="{DRAW_LEFT - FEED_PX - 10}" y="{AXIS_Y - MAX_HALF_HEIGHT_PX - 20}" '
            f'width="{DRAW_RIGHT - DRAW_LEFT + 2 * FEED_PX + 20}" height="{2 * MAX_HALF_HEIGHT_PX + 40}" '
            f'fill="{BOARD}" rx="6"/>'
        )
    feeds = zip((DRAW_LEFT - FEED_PX, DRAW_RIGHT), ("source", "load"), feed_widths_m or (), strict=False)
    for x0, name, width_m in feeds:
        half = max(MIN_HALF_HEIGHT_PX, 0.5 * width_m * y_scale)
        parts.append(
            f'<rect class="feed" x="{x0}" y="{AXIS_Y - half:.3f}" width="{FEED_PX}" height="{2 * half:.3f}" '
            f'fill="{COPPER}" opacity="0.6"><title>{name} feed line, W {width_m * 1e3:.3f} mm</title></rect>'
        )
        parts.append(
            f'<text x="{x0 + FEED_PX / 2}" y="{AXIS_Y + MAX_HALF_HEIGHT_PX + 34}" text-anchor="middle" '
            f'font-size="10">{name} feed, W {width_m * 1e3:.3f} mm</text>'
        )
    top = AXIS_Y - MAX_HALF_HEIGHT_PX - 28
    parts.append(f'<text x="{DRAW_LEFT}" y="{top}">source side</text>')
    parts.append(f'<text x="{DRAW_RIGHT}" y="{top}" text-anchor="end">load side</text>')
    x = float(DRAW_LEFT)
    for index, (section, size) in enumerate(zip(sections, sizes, strict=True), start=1):
        width_px = section.length_m * x_scale
        half = max(MIN_HALF_HEIGHT_PX, 0.5 * size * y_scale)
        parts.append(
            f'<rect class="section" data-index="{index}" x="{x:.3f}" y="{AXIS_Y - half:.3f}" '
            f'width="{width_px:.3f}" height="{2 * half:.3f}" fill="{COPPER}" stroke="#5b3416" stroke-width="0.5">'
            f"<title>section {index}: {escape(_label(section, kind))}</title></rect>"
        )
        if (index - 1) % labelled_every == 0 or index == len(sections):
            middle = x + width_px / 2
            parts.append(
                f'<text x="{middle:.2f}" y="{LABEL_TOP}" font-size="{min(11.0, label_step - 1):.1f}" '
                f'transform="rotate(60 {middle:.2f} {LABEL_TOP})">{index}: {escape(_label(section, kind))}</text>'
            )
        x += width_px
    parts.append(
        f'<text x="{DRAW_LEFT}" y="{height_px - 14}" font-size="10">horizontal: 1 px = {1e3 / x_scale:.4g} mm; '
        f"vertical: 1 px = {1e3 / y_scale:.4g} mm (scales differ); total length {total * 1e3:.3f} mm</text>"
    )
    parts.append("</svg>")
    return "\n".join(parts)
