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
    FigureError,
    FormatError,
    InputError,
    LabelError,
    RingError,
    StereoError,
    UsageError,
)
from .figure import Figure, draw
from .read import Structure, read
from .render.style import Style, load_style
from .results import Analysis, Chair, Position, RingResult
from .verify import Checker, CheckResult, check

__version__ = "0.1.0"

__all__ = [
    "Analysis",
    "Analyzer",
    "Chair",
    "CheckResult",
    "Checker",
    "ChairdrawError",
    "DataFileError",
    "EnergyError",
    "Figure",
    "FigureError",
    "LabelError",
    "FormatError",
    "InputError",
    "Position",
    "RingError",
    "RingResult",
    "StereoError",
    "Style",
    "Structure",
    "UsageError",
    "analyze",
    "check",
    "draw",
    "load_style",
    "read",
    "__version__",
]
