"""Property charts: material classes as boxes on log axes, index lines, pass regions, trade-offs.

Every chart is a plain ``plotly.graph_objects.Figure`` (it displays in Jupyter as is).
Each class is one translucent box spanning its low–high range on both axes, with a
marker at its geometric mean (the midpoint on a linear axis). Boxes are drawn as one
filled trace per family (closed paths separated by ``None``) so a click on the
family's legend entry hides its boxes and markers together.

Units come from ``outputs.display_units``, the one place that chooses them, in the
system asked for (``"si"`` or ``"us"``). A property axis is shown in its property's
unit (hover text in the unit that suits each range: a rubber's modulus in MPa). A
monomial expression axis (``"price*rho"``) and the index line are shown in the unit
the shortlist table gives the same index (density in Mg/m³), so the line through the
leader reads the leader's number in the table. An expression's range is its interval
over the classes' ranges; one that is no monomial is evaluated over its properties'
displayed values.

The package is split by idea: ``style`` (palette), ``markup`` (chart text), ``axes``,
``classes`` (boxes and markers), ``labels`` (shortlist labels), ``guides`` (index lines
and the pass region), ``property`` and ``tradeoff`` (the two charts) and ``writing``.
plotly is imported here, so callers import this package lazily.
"""

from selector.outputs.charts.axes import AxisSpec, axis_spec, axis_values
from selector.outputs.charts.guides import IndexLine, index_line
from selector.outputs.charts.labels import place_labels
from selector.outputs.charts.markup import symbol_html
from selector.outputs.charts.property import chart_for_selection, default_axes, property_chart
from selector.outputs.charts.style import (
    FAMILY_COLOURS,
    FAMILY_SYMBOLS,
    IMAGE_FORMATS,
    OKABE_ITO,
    REJECTED_GREY,
)
from selector.outputs.charts.tradeoff import tradeoff_chart
from selector.outputs.charts.writing import write_chart

__all__ = [
    "FAMILY_COLOURS",
    "FAMILY_SYMBOLS",
    "IMAGE_FORMATS",
    "OKABE_ITO",
    "REJECTED_GREY",
    "AxisSpec",
    "IndexLine",
    "axis_spec",
    "axis_values",
    "chart_for_selection",
    "default_axes",
    "index_line",
    "place_labels",
    "property_chart",
    "symbol_html",
    "tradeoff_chart",
    "write_chart",
]
