"""The legend's corner search: segments and boxes meet a box exactly when they do (checked against
brute force: many points read along each segment), and corners are tried in order."""

from __future__ import annotations

import numpy as np

from rankwise.ui.charts.legend_room import CLEARANCE, EDGE_GAP, Obstacles, corner_box, free_corner


def _sampled_meet(segment, box, samples: int = 4001) -> bool:
    x0, y0, x1, y1 = segment
    t = np.linspace(0.0, 1.0, samples)
    x, y = x0 + t * (x1 - x0), y0 + t * (y1 - y0)
    left, top, right, bottom = box
    return bool(np.any((x >= left) & (x <= right) & (y >= top) & (y <= bottom)))


def test_segments_meet_a_box_exactly_when_points_along_them_fall_inside_it():
    """Brute force: 2000 random segments (long, short, upright, level) against one box."""
    rng = np.random.default_rng(11)
    box = (40.0, 30.0, 90.0, 60.0)
    segments = rng.uniform(0, 130, size=(2000, 4))
    segments[:300, 2] = segments[:300, 0]  # upright
    segments[300:600, 3] = segments[300:600, 1]  # level
    segments[600:900, 2:] = segments[600:900, :2] + rng.uniform(-3, 3, size=(300, 2))  # short
    grown = (box[0] - CLEARANCE, box[1] - CLEARANCE, box[2] + CLEARANCE, box[3] + CLEARANCE)
    for segment in segments:
        found = Obstacles()
        found.add_segments(segment)
        assert found.meet(box) == _sampled_meet(segment, grown), segment


def test_a_marker_box_meets_only_the_boxes_it_overlaps_and_corners_go_in_order():
    plot, legend = (400.0, 300.0), (120.0, 50.0)
    found = Obstacles()
    top_right = corner_box("top-right", *plot, *legend)
    assert top_right == (400 - EDGE_GAP - 120, EDGE_GAP, 400 - EDGE_GAP, EDGE_GAP + 50)
    found.add_boxes([300.0, 20.0, 309.0, 29.0])  # a marker inside the top-right corner's box
    assert free_corner(found, plot, legend, "top-right") == "top-left"
    found.add_boxes([10.0, 10.0, 19.0, 19.0])  # and one in the top-left
    assert free_corner(found, plot, legend, "top-right") == "bottom-right"
    assert free_corner(Obstacles(), (100.0, 60.0), legend) is None  # a legend larger than the plot
