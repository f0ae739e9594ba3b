"""chairdraw: chair conformations of six-membered rings from flat wedge/hash structures.

    >>> import chairdraw
    >>> result = chairdraw.analyze("C[C@H]1CC[C@@H](O)CC1")
    >>> result.rings[0].favored.name
    ...

chairdraw models conformations from tabulated energies; it does not replace experimental proof
of configuration or an organisation's registration rules.
"""

from . import _rdkit  # noqa: F401  (fixes RDKit's stereo perception mode and log once)
from .analyze import Analyzer, analyze
from .errors import (
    ChairdrawError,
    DataFileError,
    EnergyError,
    FormatError,
    InputError,
    RingError,
    StereoError,
    UsageError,
)
from .read import Structure, read
from .results import Analysis, Chair, Position, RingResult

__version__ = "0.1.0"

__all__ = [
    "Analysis",
    "Analyzer",
    "Chair",
    "ChairdrawError",
    "DataFileError",
    "EnergyError",
    "FormatError",
    "InputError",
    "Position",
    "RingError",
    "RingResult",
    "StereoError",
    "Structure",
    "UsageError",
    "analyze",
    "read",
    "__version__",
]
