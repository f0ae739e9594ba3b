"""One exception tree for every stage.

Each error names the record it came from, the stage that failed and a message a chemist can act on.
Every class also inherits the builtin it resembles, so callers can catch ``ValueError`` without
knowing chairdraw's tree.
"""

from __future__ import annotations


class ChairdrawError(Exception):
    """Base of every chairdraw error."""

    stage = "chairdraw"

    def __init__(self, message: str, *, record: str | None = None, detail: str | None = None):
        super().__init__(message)
        self.message = message
        self.record = record
        self.detail = detail  # extra lines (offending text with a caret), shown under the message

    def with_record(self, record: str | None) -> ChairdrawError:
        if record is not None and self.record is None:
            self.record = record
        return self

    def __str__(self) -> str:
        where = f"{self.record}: " if self.record else ""
        text = f"{where}{self.stage}: {self.message}"
        if self.detail:
            text += "\n" + self.detail
        return text


class InputError(ChairdrawError, ValueError):
    """The structure text or file could not be read."""

    stage = "read"


class FormatError(InputError):
    """The format could not be recognised, or a format was asked for that the text is not."""

    stage = "read"


class RingError(ChairdrawError, ValueError):
    """A ring could not be analysed (reported per ring, usually as a refusal, not raised)."""

    stage = "rings"


class StereoError(ChairdrawError, ValueError):
    """The stereo description is inconsistent or cannot be turned into faces."""

    stage = "faces"


class EnergyError(ChairdrawError, ValueError):
    """An energy could not be estimated (bad data file, force-field failure)."""

    stage = "energy"


class DataFileError(EnergyError):
    """A shipped data table is malformed; names the file and the line."""

    stage = "data"


class UsageError(ChairdrawError, ValueError):
    """A bad option or argument value given to the API or the command line."""

    stage = "usage"


class LabelError(ChairdrawError, ValueError):
    """A condensed substituent label could not be read; ``detail`` shows it with a caret."""

    stage = "label"

    def __init__(self, message: str, *, column: int | None = None, **kwargs):
        super().__init__(message, **kwargs)
        self.column = column  # 1-based column of the problem in the label


class FigureError(ChairdrawError, ValueError):
    """A figure could not be laid out or written (bad style value, unknown output type)."""

    stage = "figure"
