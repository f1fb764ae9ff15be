"""A small block-style YAML writer for case dicts (maps, lists, strings, numbers, booleans, None), so that
a dict is read by the same C++ reader as a file. Strings are double-quoted with JSON escapes, which YAML
reads the same way; no dependency on a YAML library."""
from __future__ import annotations

import json
import math
import os
import re
from typing import Any, List, Mapping

__all__ = ["dump"]

_PLAIN_KEY = re.compile(r"[A-Za-z0-9_][A-Za-z0-9_.\-]*\Z")


_MAX_DEPTH = 24  # as the case reader's nesting limit (ReadLimits::max_depth)


def _too_deep(what: str) -> Exception:
    from ._errors import InputError
    return InputError(f"a case dict {what}", key="(top level)", value="(nested)",
                      expected=f"at most {_MAX_DEPTH} levels of dicts and lists, without cycles")


def _normalise(x: Any, depth: int = 0, seen: frozenset = frozenset()) -> Any:
    """Plain Python values: numpy arrays and tuples to lists, numpy scalars to numbers, paths to text.
    Nesting deeper than the reader takes, or a dict or list holding itself, is an InputError."""
    if isinstance(x, (Mapping, list, tuple)):
        if id(x) in seen:
            raise _too_deep("holds itself (a cycle)")
        if depth >= _MAX_DEPTH:
            raise _too_deep(f"is nested more than {_MAX_DEPTH} levels deep")
        seen = seen | {id(x)}
    if isinstance(x, Mapping):
        out = {}
        for k, v in x.items():
            if not isinstance(k, str):
                raise TypeError(f"case dict keys are strings, not {type(k).__name__} ({k!r})")
            out[k] = _normalise(v, depth + 1, seen)
        return out
    if isinstance(x, (list, tuple)):
        return [_normalise(v, depth + 1, seen) for v in x]
    if isinstance(x, os.PathLike):
        return os.fspath(x)
    if hasattr(x, "tolist") and not isinstance(x, (str, bytes)):  # numpy arrays and scalars
        return _normalise(x.tolist(), depth, seen)
    if x is None or isinstance(x, (bool, int, float, str)):
        return x
    raise TypeError(f"a case dict holds strings, numbers, booleans, lists and dicts, not {type(x).__name__}")


def _scalar(x: Any) -> str:
    if x is None:
        return "null"
    if isinstance(x, bool):
        return "true" if x else "false"
    if isinstance(x, int):
        if abs(x) > 10**300:  # beyond what the reader takes; also keeps str() within Python's digit limit
            return "1e301" if x > 0 else "-1e301"
        return str(x)
    if isinstance(x, float):
        if math.isnan(x):
            return ".nan"
        if math.isinf(x):
            return ".inf" if x > 0 else "-.inf"
        return repr(x)
    return json.dumps(x, ensure_ascii=False)  # a double-quoted YAML string


def _key(k: str) -> str:
    return k if _PLAIN_KEY.match(k) else json.dumps(k, ensure_ascii=False)


def _inline(v: Any) -> str:
    if isinstance(v, dict):
        return "{}"
    if isinstance(v, list):
        return "[]"
    return _scalar(v)


def _map(m: dict, indent: int, out: List[str], first_prefix: str = "") -> None:
    pad = " " * indent
    for i, (k, v) in enumerate(m.items()):
        lead = first_prefix if i == 0 and first_prefix else pad
        if isinstance(v, (dict, list)) and v:
            out.append(f"{lead}{_key(k)}:")
            (_map if isinstance(v, dict) else _list)(v, indent + 2, out)
        else:
            out.append(f"{lead}{_key(k)}: {_inline(v)}")


def _list(items: list, indent: int, out: List[str]) -> None:
    pad = " " * indent
    for v in items:
        if isinstance(v, dict) and v:
            _map(v, indent + 2, out, first_prefix=pad + "- ")
        elif isinstance(v, list) and v:
            out.append(pad + "-")
            _list(v, indent + 2, out)
        else:
            out.append(f"{pad}- {_inline(v)}")


def dump(data: Mapping[str, Any]) -> str:
    """The mapping as block-style YAML text."""
    m = _normalise(data)
    if not isinstance(m, dict):
        raise TypeError("a case is a mapping")
    out: List[str] = []
    if m:
        _map(m, 0, out)
    else:
        out.append("{}")
    return "\n".join(out) + "\n"
