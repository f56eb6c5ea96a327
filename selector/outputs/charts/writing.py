"""Writing a chart: self-contained HTML, or PNG/SVG/PDF through kaleido."""

from __future__ import annotations

from pathlib import Path

import plotly.graph_objects as go

from selector.errors import OutputError
from selector.outputs.charts.style import IMAGE_FORMATS


def write_chart(
    fig: go.Figure, path: str | Path, *, width: int = 1100, height: int = 760, scale: float = 2.0
) -> Path:
    """Write a chart: ``.html`` (self-contained, works offline) or ``.png``/``.svg``/``.pdf``.

    Images are rendered by kaleido in a headless Chromium, with MathJax off. Every file is
    written atomically.

    Raises:
        OutputError: unknown extension, missing folder, or no Chromium/kaleido for images.
    """
    from selector.outputs.files import write_bytes_atomic

    path = Path(path)
    fmt = path.suffix.lower().lstrip(".")
    folder = path.parent if str(path.parent) else Path(".")
    if fmt not in ("html", *IMAGE_FORMATS):
        raise OutputError(
            str(path), f"unknown chart format {path.suffix or '(none)'!r}; expected .html, .png, .svg or .pdf"
        )
    if not folder.is_dir():
        raise OutputError(str(path), f"folder {str(folder)!r} does not exist")
    if fmt == "html":
        text = fig.to_html(
            include_plotlyjs=True,
            include_mathjax=False,
            full_html=True,
            config={
                "displaylogo": False,
                "responsive": True,
                "toImageButtonOptions": {"filename": path.stem, "width": width, "height": height},
            },
        )
        write_bytes_atomic(path, text.encode("utf-8"))
        return path
    write_bytes_atomic(path, _render_image(fig, fmt, width, height, scale, str(path)))
    return path


def _render_image(fig: go.Figure, fmt: str, width: int, height: int, scale: float, where: str) -> bytes:
    """PNG/SVG/PDF bytes from kaleido (≥ 1), MathJax disabled; OutputError when it cannot run."""
    advice = "install Chromium (Debian: apt-get install chromium) or write the chart as .html"
    try:
        import kaleido
        from kaleido.errors import ChromeNotFoundError
    except ImportError:
        raise OutputError(
            where, f"writing .{fmt} needs the kaleido package; pip install kaleido, or write .html"
        ) from None
    try:
        data = kaleido.calc_fig_sync(
            fig.to_dict(),
            opts={"format": fmt, "width": width, "height": height, "scale": scale},
            kopts={"mathjax": False},
        )
    except ChromeNotFoundError:
        raise OutputError(where, f"no Chromium browser found to render .{fmt}; {advice}") from None
    except (RuntimeError, OSError) as exc:
        raise OutputError(where, f"Chromium could not render .{fmt} ({exc}); {advice}") from None
    if not isinstance(data, bytes | bytearray) or not data:
        raise OutputError(where, f"the renderer returned no .{fmt} image; {advice}")
    return bytes(data)
