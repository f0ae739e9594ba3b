"""Plane geometry of a drawing's points (x, y tuples, y up): what reading a chair needs."""

from __future__ import annotations

import math

PARALLEL_DEG = 20.0  # degrees: opposite ring bonds of a chair drawing are parallel within this


def opposite_bonds_parallel(pts) -> bool:
    for k in range(3):
        a = unit(pts[(k + 1) % 6], pts[k])
        b = unit(pts[(k + 4) % 6], pts[(k + 3) % 6])
        if line_angle(a, b) > PARALLEL_DEG:
            return False
    return True


def centroid(pts) -> tuple[float, float]:
    return sum(p[0] for p in pts) / len(pts), sum(p[1] for p in pts) / len(pts)


def dist(p, q) -> float:
    return math.hypot(p[0] - q[0], p[1] - q[1])


def dot(p, q) -> float:
    return p[0] * q[0] + p[1] * q[1]


def unit(p, q) -> tuple[float, float]:
    d = math.hypot(p[0] - q[0], p[1] - q[1]) or 1.0
    return (p[0] - q[0]) / d, (p[1] - q[1]) / d


def line_angle(v, w) -> float:
    """Angle in degrees between the lines along v and w (0..90)."""
    n = math.hypot(*v) * math.hypot(*w)
    c = abs(dot(v, w)) / n if n else 0.0
    return math.degrees(math.acos(min(1.0, c)))


def signed_area(pts) -> float:
    return 0.5 * sum(pts[k - 1][0] * pts[k][1] - pts[k][0] * pts[k - 1][1] for k in range(len(pts)))
