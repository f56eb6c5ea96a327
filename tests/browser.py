"""Headless Chromium for browser tests (charts, report, explorer).

Tests that need a browser call :func:`need_browser` (or use :func:`chromium` /
:func:`chromium_page`): they skip with the reason when Debian's ``chromium`` or the
``playwright`` package is missing, and fail instead when ``SELECTOR_REQUIRE_BROWSER=1``.
Playwright drives the system Chromium; it never downloads a browser of its own.
"""

from __future__ import annotations

import os
import shutil
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any

import pytest

BROWSER_WAIT_MS = 30_000
"""The longest any browser action or ``expect`` assertion waits, fit for a loaded two-core CI
machine (a bound on waiting for a condition, never a pause)."""

CHROMIUM_ARGS = (
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
)


def browser_required() -> bool:
    """Whether a missing browser is a failure rather than a skip."""
    return os.environ.get("SELECTOR_REQUIRE_BROWSER") == "1"


def missing_browser(*modules: str) -> str | None:
    """Why browser tests cannot run here (None when they can); ``modules`` are extra imports needed."""
    if shutil.which("chromium") is None:
        return "no chromium on PATH (Debian: apt-get install chromium)"
    for name in ("playwright", *modules):
        try:
            __import__(name)
        except ImportError:
            return f"the {name} package is not installed (pip install {name})"
    return None


def need_browser(*modules: str) -> str:
    """Skip (or fail under SELECTOR_REQUIRE_BROWSER=1) unless Chromium can run; returns its path."""
    reason = missing_browser(*modules)
    if reason is not None:
        if browser_required():
            pytest.fail(f"SELECTOR_REQUIRE_BROWSER=1 but {reason}")
        pytest.skip(reason)
    path = shutil.which("chromium")
    assert path is not None
    return path


@dataclass
class PageLog:
    """What a page did: console errors, uncaught errors, dialogs and requests off the machine."""

    page: Any
    console_errors: list[str] = field(default_factory=list)
    page_errors: list[str] = field(default_factory=list)
    dialogs: list[str] = field(default_factory=list)
    outside_requests: list[str] = field(default_factory=list)


@contextmanager
def chromium() -> Iterator[Any]:
    """A headless Chromium browser (Playwright ``Browser``), closed afterwards."""
    path = need_browser()
    from playwright.sync_api import expect, sync_playwright

    expect.set_options(timeout=BROWSER_WAIT_MS)  # set_default_timeout does not reach expect
    with sync_playwright() as p:
        browser = p.chromium.launch(executable_path=path, args=list(CHROMIUM_ARGS))
        try:
            yield browser
        finally:
            browser.close()


@contextmanager
def chromium_page(browser: Any = None, width: int = 1200, height: int = 800) -> Iterator[PageLog]:
    """A fresh page that records errors and dialogs and blocks every request that leaves the machine.

    Dialogs (``alert`` and the like) are recorded and dismissed; requests other than
    ``file:``, ``data:``, ``blob:`` and ``about:`` are recorded and aborted, so a page
    that works here works offline.
    """
    if browser is None:
        with chromium() as own, chromium_page(own, width, height) as log:
            yield log
        return
    context = browser.new_context(viewport={"width": width, "height": height})
    context.set_default_timeout(BROWSER_WAIT_MS)
    context.set_default_navigation_timeout(BROWSER_WAIT_MS)
    page = context.new_page()
    log = PageLog(page)

    def on_console(msg: Any) -> None:
        if msg.type == "error":
            log.console_errors.append(msg.text)

    def on_dialog(dialog: Any) -> None:
        log.dialogs.append(f"{dialog.type}: {dialog.message}")
        dialog.dismiss()

    def on_route(route: Any) -> None:
        url = route.request.url
        if url.split(":", 1)[0] in ("file", "data", "blob", "about"):
            route.continue_()
        else:
            log.outside_requests.append(url)
            route.abort()

    page.on("console", on_console)
    page.on("pageerror", lambda exc: log.page_errors.append(str(exc)))
    page.on("dialog", on_dialog)
    page.route("**/*", on_route)
    try:
        yield log
    finally:
        context.close()
