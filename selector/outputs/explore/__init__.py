"""The explorer's page: controls that edit a spec, and the pipeline's answer drawn live.

The page computes no engineering of its own. Every change of a control builds a new
spec from the loaded one (``spec_from_dict`` on its dict with the change) and runs
``select`` over the same materials table, exactly as ``selector rank`` does; the chart,
the shortlist, the downloads and the class data are the library's own
(``charts.chart_for_selection``, ``tables.selection_frame``, ``tables.render_selection``,
``export.xlsx_bytes``, ``report.build_report``, ``tables.class_frame``).

The callbacks are plain functions (``refresh``, ``reload``, ``sync_screen``,
``pick_class``, ``download``) over frozen dataclasses, so they can be called without a
browser; ``make_app`` only wires them to the page. The server listens on 127.0.0.1 alone.

Modules: ``state`` (Start, Controls, View and the spec they make), ``fields`` (the
editable spec fields), ``editor`` (the spec's controls), ``layout`` (the page and its
views), ``callbacks`` (the plain callbacks), ``wiring`` (their connection to the page),
``address`` (the view in the page address), ``spec_files`` (spec download and upload),
``guard`` (requests refused), ``server`` (the app and its server); the page template and
style sheet are files under ``assets/``. Importing this package
imports Dash; only the ``explore`` command does so.
"""

from __future__ import annotations

from selector.outputs.explore.server import make_app, serve

__all__ = ["make_app", "serve"]
