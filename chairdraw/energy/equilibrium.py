"""Free-energy differences to populations (Boltzmann), and unit conversion."""

from __future__ import annotations

import math

R_KCAL = 1.987204259e-3  # gas constant, kcal mol-1 K-1 (CODATA 2018, R = 8.314462618 J mol-1 K-1)
KJ_PER_KCAL = 4.184  # thermochemical calorie
DEGENERATE_KCAL = 0.05  # below this the two chairs are reported as equal (common practice)


def populations(energies: list[float], temperature: float) -> list[float]:
    """Boltzmann fractions of states with the given free energies (kcal/mol) at T (K)."""
    if temperature <= 0:
        raise ValueError("temperature must be above 0 K")
    low = min(energies)
    weights = [math.exp(-(e - low) / (R_KCAL * temperature)) for e in energies]
    total = sum(weights)
    return [w / total for w in weights]


def to_kj(kcal: float) -> float:
    return kcal * KJ_PER_KCAL
