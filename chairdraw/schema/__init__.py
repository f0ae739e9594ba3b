"""JSON Schemas of chairdraw's JSON outputs."""

from __future__ import annotations

import json
from functools import cache
from importlib import resources


@cache
def load(name: str = "analysis") -> dict:
    return json.loads(
        resources.files("chairdraw").joinpath("schema", f"{name}.schema.json").read_text(encoding="utf-8")
    )
