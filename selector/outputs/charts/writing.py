"""Writing a chart: self-contained HTML, or PNG/SVG/PDF through kaleido.

Images come from a headless Chromium; ``image_session`` keeps one open for a run of
images (a report's charts, several files) instead of starting one per image.
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

import plotly.graph_objects as go

from selector.errors import OutputError
from selector.outputs.charts.style import IMAGE_FORMATS


def write_chart(
    fig: go.Figure, path: str | Path, *, width: int = 1100, height: int = 760, scale: float = 2.0
) -> Path:
    """Write a chart: ``.html`` (self-contained, works offline) or ``.png``/``.svg``/``.pdf``.

    Images are rendered by kaleido in a headless Chromium, with MathJax off (the browser of
    the open ``image_session``, if any). Every file is written atomically.

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
    write_bytes_atomic(path, figure_image(fig, fmt, width, height, scale, str(path)))
    return path


class ImageSession:
    """One headless Chromium (through kaleido) that renders any number of images.

    Starting Chromium costs seconds; each image after that costs a fraction of one. The
    browser runs on an event loop in a thread of its own, so a session also works where
    an event loop is already running (Jupyter). Open it with ``image_session()``.
    """

    def __init__(self) -> None:
        import asyncio
        import threading

        self._loop = asyncio.new_event_loop()
        self._thread = threading.Thread(target=self._loop.run_forever, name="selector-images", daemon=True)
        self._browser: Any = None

    def _run(self, coroutine: Any, timeout: float | None = None) -> Any:
        import asyncio

        return asyncio.run_coroutine_threadsafe(coroutine, self._loop).result(timeout)

    def open(self) -> None:
        """Start Chromium; raises kaleido's or the system's error when it cannot."""
        import kaleido

        self._thread.start()

        async def start() -> Any:
            browser = kaleido.Kaleido(n=1, mathjax=False)
            await browser.open()
            return browser

        try:
            self._browser = self._run(start(), OPEN_TIMEOUT)
        except BaseException:
            self.close()
            raise

    def render(self, fig: go.Figure, fmt: str, width: int, height: int, scale: float) -> Any:
        """The image bytes of one figure."""
        opts = {"format": fmt, "width": width, "height": height, "scale": scale}
        return self._run(self._browser.calc_fig(fig.to_dict(), opts=opts), RENDER_TIMEOUT)

    def close(self) -> None:
        """Close Chromium and stop the thread (safe to call twice)."""
        if self._browser is not None:
            try:
                self._run(self._browser.close(), OPEN_TIMEOUT)
            finally:
                self._browser = None
        if self._thread.is_alive():
            self._loop.call_soon_threadsafe(self._loop.stop)
            self._thread.join()
        if not self._loop.is_closed() and not self._loop.is_running():
            self._loop.close()


OPEN_TIMEOUT = 120.0
"""Seconds to wait for Chromium to start or close on a loaded machine (a bound, not a pause)."""
RENDER_TIMEOUT = 120.0
"""Seconds to wait for one image."""

_OPEN: list[ImageSession] = []
"""The sessions opened by ``image_session``, innermost last; images use the innermost."""
_ADVICE = (
    "install Chromium (Debian: apt-get install chromium), or write HTML instead "
    "(a .html chart, or a report without --static-charts)"
)


@contextmanager
def image_session(where: str = "images") -> Iterator[ImageSession]:
    """Render every image written inside the block with one Chromium.

    ``write_chart`` and ``figure_image`` use the open session; without one each image
    starts and stops a browser of its own. Nested blocks share the outer session.

    Raises:
        OutputError: no kaleido package or no Chromium, naming ``where``.
    """
    if _OPEN:
        yield _OPEN[-1]
        return
    session = _start(where)
    _OPEN.append(session)
    try:
        yield session
    finally:
        _OPEN.remove(session)
        session.close()


def _start(where: str) -> ImageSession:
    try:
        import kaleido  # noqa: F401
        from kaleido.errors import ChromeNotFoundError
    except ImportError:
        raise OutputError(
            where, "images need the kaleido package; pip install kaleido, or write HTML"
        ) from None
    session = ImageSession()
    try:
        session.open()
    except ChromeNotFoundError:
        raise OutputError(where, f"no Chromium browser found to render images; {_ADVICE}") from None
    except (RuntimeError, OSError, TimeoutError) as exc:
        raise OutputError(where, f"Chromium could not start ({exc}); {_ADVICE}") from None
    return session


def figure_image(fig: go.Figure, fmt: str, width: int, height: int, scale: float, where: str) -> bytes:
    """PNG/SVG/PDF bytes of a figure, in the open ``image_session`` (or a browser of its own)."""
    with image_session(where) as session:
        try:
            data = session.render(fig, fmt, width, height, scale)
        except (RuntimeError, OSError, TimeoutError) as exc:
            raise OutputError(where, f"Chromium could not render .{fmt} ({exc}); {_ADVICE}") from None
    if not isinstance(data, bytes | bytearray) or not data:
        raise OutputError(where, f"the renderer returned no .{fmt} image; {_ADVICE}")
    return bytes(data)
