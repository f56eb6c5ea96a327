"""The ``select`` and ``Selection`` of the public API: the pipeline's result, able to show itself.

``from selector import select`` returns this Selection. It is the pipeline's complete
result (``selector.pipeline.selection``) with two views for notebooks, which read it
only (``selector.outputs.notebook``); the pipeline itself imports no output.
"""

from __future__ import annotations

from dataclasses import fields
from typing import TYPE_CHECKING, Any

from selector.pipeline import selection as _pipeline

if TYPE_CHECKING:
    import plotly.graph_objects as go


class Selection(_pipeline.Selection):
    """The pipeline's result that, in Jupyter, shows the top of its shortlist, what governs
    and the caution (``_repr_html_``), and draws itself (``chart``)."""

    def _repr_html_(self) -> str:
        from selector.outputs.notebook import selection_html

        return selection_html(self)

    def chart(self, x: str | None = None, y: str | None = None, **options: object) -> go.Figure:
        """A plotly figure of this Selection: properties ``x`` against ``y`` (the index's axes
        by default; the face × core pairs for a sandwich); ``options`` as ``chart_for_selection``."""
        from selector.outputs.notebook import selection_chart

        return selection_chart(self, x, y, **options)


def select(*args: Any, **kwargs: Any) -> Selection:
    """Run the pipeline: the arguments of ``selector.pipeline.selection.select``."""
    result = _pipeline.select(*args, **kwargs)
    return Selection(**{f.name: getattr(result, f.name) for f in fields(result) if f.init})


select.__doc__ = _pipeline.select.__doc__
