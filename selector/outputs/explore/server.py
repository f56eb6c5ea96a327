"""Making the explorer's Dash app and serving it on 127.0.0.1."""

from __future__ import annotations

import socket
import webbrowser
from collections.abc import Callable
from pathlib import Path
from typing import Any

import dash

from selector.errors import InputError
from selector.outputs.explore.guard import install as install_guard
from selector.outputs.explore.layout import layout
from selector.outputs.explore.state import initial_controls, load_start
from selector.outputs.explore.wiring import wire

HOST = "127.0.0.1"
"""The only address the explorer listens on."""
DEFAULT_PORT = 8050
PORT_KEY = "SELECTOR_PORT"
"""The Flask config entry holding the port served, for the Host check."""

_ASSETS = Path(__file__).with_name("assets")
INDEX = (
    (_ASSETS / "index.html")
    .read_text(encoding="utf-8")
    .replace("{%explorer_css%}", (_ASSETS / "explorer.css").read_text(encoding="utf-8"))
)
"""The page template: Dash's placeholders with the explorer's style sheet inlined."""


def make_app(spec_path: str | Path | None = None) -> dash.Dash:
    """The explorer for a spec file (the bundled camera-dolly example without one).

    Raises:
        InputError: the spec or its materials files cannot be read.
    """
    start = load_start(spec_path)
    controls = initial_controls(start)
    app = dash.Dash(
        __name__,
        title=f"{start.spec.title} · selector",
        update_title=None,  # type: ignore[arg-type]  # Dash documents None as "keep the title"
        serve_locally=True,
        include_assets_files=False,  # the style sheet is inlined by INDEX
    )
    app.index_string = INDEX
    app.layout = layout(start, controls)
    wire(app, start)
    install_guard(app.server, lambda: app.server.config.get(PORT_KEY))
    return app


# --------------------------------------------------------------------------- serving


def _quiet_handler() -> type:
    from werkzeug.serving import WSGIRequestHandler

    class Quiet(WSGIRequestHandler):
        """Logs errors, not every request."""

        def log_request(self, code: int | str = "-", size: int | str = "-") -> None:
            return None

    return Quiet


def bind(app: dash.Dash, port: int = DEFAULT_PORT) -> Any:
    """A threaded HTTP server for the app, listening on 127.0.0.1:``port`` (0: any free port).

    The socket listens on return, so a browser pointed at it waits rather than fails.
    Call ``serve_forever()`` to answer and ``shutdown()`` from another thread to stop.

    Raises:
        InputError: the port is out of range or cannot be listened on.
    """
    from werkzeug.serving import make_server

    if isinstance(port, bool) or not isinstance(port, int) or not 0 <= port <= 65535:
        raise InputError(
            "--port", f"{port!r} is not a port", "a whole number from 1 to 65535 (0: any free port)"
        )
    sock = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
    try:
        sock.bind((HOST, port))
        sock.listen(128)
    except OSError as exc:
        sock.close()
        raise InputError(
            "--port", f"cannot listen on {HOST}:{port} ({exc.strerror})", "a free port, e.g. --port 8051"
        ) from None
    try:
        server = make_server(
            HOST,
            sock.getsockname()[1],
            app.server,
            threaded=True,
            request_handler=_quiet_handler(),
            fd=sock.fileno(),
        )
    finally:
        sock.close()
    app.server.config[PORT_KEY] = server.port
    return server


def serve(
    spec_path: str | Path | None = None,
    port: int = DEFAULT_PORT,
    open_browser: bool = True,
    echo: Callable[[str], Any] = print,
) -> None:
    """Serve the explorer on 127.0.0.1 until interrupted, opening the default browser unless asked not to.

    Raises:
        InputError: the spec cannot be read, or the port cannot be listened on.
    """
    app = make_app(spec_path)
    server = bind(app, port)
    url = f"http://{HOST}:{server.port}/"
    echo(f"explorer at {url} (Ctrl+C stops it)")
    if open_browser:
        webbrowser.open(url)
    try:
        server.serve_forever()  # returns on Ctrl+C (werkzeug catches it) or on shutdown()
    except KeyboardInterrupt:
        pass
    finally:
        server.server_close()
    echo("stopped")
