"""acidload's exceptions: one hierarchy of ValueError subclasses, raised with the program's messages.

    Error (ValueError)      anything acidload reports
    ├── InputError          a value given is wrong: where it came from, the key path, the value, what is expected
    ├── NotModelledError    a valid request outside what the model covers (e.g. rich combustion, λ < 1)
    ├── NoAnswerError       an inverse question with no answer in the range searched
    └── FitRefusedError     a calibration the data cannot identify, with the reason

The C++ library's exceptions are translated into these by acidload._core.
"""
from __future__ import annotations

from typing import Optional

__all__ = ["Error", "InputError", "NotModelledError", "NoAnswerError", "FitRefusedError"]


class Error(ValueError):
    """Anything acidload reports (acidload::Error)."""


class InputError(Error):
    """A value given is missing, malformed or outside its accepted range (acidload::InputError).

    Attributes:
        key: the key path of the value, e.g. ``"engine.jacket-water-out"`` or ``"variants[1].fuel.h2s"``
            (for a case file, a YAML text or a dict alike), or a field name for a direct call.
        value: the value as given (text).
        expected: what is accepted.
        file: the file (or ``"<text>"`` name) the value came from; None for dicts, keyword
            arguments and direct calls.
        line, column: 1-based position in ``file``; None when there is no file position.
        line_text: the offending line of the file, for the caret display; None without a file.
        keyword: the keyword argument of :func:`acidload.case` the value came from, if any.
    """

    def __init__(self, message: str, *, key: Optional[str] = None, value: Optional[str] = None,
                 expected: Optional[str] = None, file: Optional[str] = None, line: Optional[int] = None,
                 column: Optional[int] = None, line_text: Optional[str] = None,
                 keyword: Optional[str] = None) -> None:
        super().__init__(message)
        self.key = key
        self.value = value
        self.expected = expected
        self.file = file
        self.line = line
        self.column = column
        self.line_text = line_text
        self.keyword = keyword


class NotModelledError(Error):
    """A valid request outside what the model covers (acidload::NotModelledError)."""


class NoAnswerError(Error):
    """An inverse question whose answer does not lie in the range searched (acidload::NoAnswerError)."""


class FitRefusedError(Error):
    """A fit the data cannot identify: too few readings, a flat or rank-deficient direction, or no
    contaminant signal (acidload::FitRefusedError); the message says which."""
