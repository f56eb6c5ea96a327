"""The explorer: a local web page over the selection pipeline (Dash, on 127.0.0.1 only).

Importing this package imports Dash; only the ``explore`` command does so.
"""

from __future__ import annotations

from selector.outputs.explore.app import make_app, serve

__all__ = ["make_app", "serve"]
