"""selector: material selection for the concept design of load-bearing parts.

The public API (imported lazily so the command line starts fast)::

    from selector import load_materials, load_spec, select, derive
"""

from __future__ import annotations

from typing import Any

__version__ = "0.1.0"

_EXPORTS = {
    "load_materials": "selector.inputs.materials",
    "check_materials_file": "selector.inputs.materials",
    "Spec": "selector.inputs.spec",
    "load_spec": "selector.inputs.spec",
    "spec_from_dict": "selector.inputs.spec",
    "derive": "selector.pipeline.derive",
    "Derivation": "selector.pipeline.derive",
    "select": "selector.interactive",
    "Selection": "selector.interactive",
    "parse_expression": "selector.inputs.expressions",
    "robustness": "selector.pipeline.robust",
    "pareto_front": "selector.pipeline.tradeoff",
    "tradeoff_report": "selector.pipeline.tradeoff",
    "property_chart": "selector.outputs.charts",
    "chart_for_selection": "selector.outputs.charts",
    "write_chart": "selector.outputs.charts",
    "write_report": "selector.outputs.report",
    "SelectorError": "selector.errors",
}
__all__ = ["__version__", *_EXPORTS]


def __getattr__(name: str) -> Any:
    if name in _EXPORTS:
        import importlib

        module = importlib.import_module(_EXPORTS[name])
        return getattr(module, "parse" if name == "parse_expression" else name)
    raise AttributeError(f"module 'selector' has no attribute {name!r}")
