"""selector: material selection for the concept design of load-bearing parts.

The public API (imported lazily so the command line starts fast)::

    from selector import load_materials, load_spec, select, derive
"""

from __future__ import annotations

from typing import Any

__version__ = "0.1.0"

_EXPORTS = {
    "load_materials": "selector.materials",
    "check_materials_file": "selector.materials",
    "Spec": "selector.spec",
    "load_spec": "selector.spec",
    "spec_from_dict": "selector.spec",
    "derive": "selector.derive",
    "Derivation": "selector.derive",
    "select": "selector.selection",
    "Selection": "selector.selection",
    "parse_expression": "selector.expressions",
    "robustness": "selector.robust",
    "pareto_front": "selector.tradeoff",
    "tradeoff_report": "selector.tradeoff",
    "property_chart": "selector.charts",
    "chart_for_selection": "selector.charts",
    "write_chart": "selector.charts",
    "write_report": "selector.report",
    "SelectorError": "selector.errors",
}
__all__ = ["__version__", *_EXPORTS]


def __getattr__(name: str) -> Any:
    if name in _EXPORTS:
        import importlib

        module = importlib.import_module(_EXPORTS[name])
        return getattr(module, "parse" if name == "parse_expression" else name)
    raise AttributeError(f"module 'selector' has no attribute {name!r}")
