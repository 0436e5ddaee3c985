"""Shared fixtures.

Browser fixtures: a system Chromium driven by Playwright (never downloaded), a
``workbench serve`` subprocess on a free port, and a page that records what the browser
reported (console, failed requests, any request leaving this computer).  Without Chromium
or Playwright the browser tests are skipped, unless ``WORKBENCH_REQUIRE_BROWSER=1`` (as in
CI), where they fail.
"""

from __future__ import annotations

import copy
import os
import shutil
import socket
import subprocess
import sys
import tempfile
import time
import urllib.parse
import urllib.request
from pathlib import Path

import pytest

CHROMIUM_ARGS = [
    "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
    "--disable-background-networking", "--disable-component-update", "--disable-sync",
]


def _no_browser(reason: str):
    if os.environ.get("WORKBENCH_REQUIRE_BROWSER") == "1":
        pytest.fail(f"{reason} (WORKBENCH_REQUIRE_BROWSER=1 makes this a failure)")
    pytest.skip(reason)


def chromium_executable() -> str | None:
    """Path of the system Chromium, or None."""
    if os.path.exists("/usr/bin/chromium"):
        return "/usr/bin/chromium"
    return shutil.which("chromium") or shutil.which("chromium-browser")


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


@pytest.fixture(scope="session")
def browser():
    """A headless system Chromium (Playwright sync API), closed at the end of the session."""
    executable = chromium_executable()
    if executable is None:
        _no_browser("no Chromium found at /usr/bin/chromium or on PATH")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        _no_browser("the playwright Python package is not installed")
    with sync_playwright() as playwright:
        chromium = playwright.chromium.launch(executable_path=executable, headless=True,
                                              args=CHROMIUM_ARGS, timeout=60_000)
        yield chromium
        chromium.close()


def _wait_for_warm_kernels(process, deadline):
    """Wait until the server's preheated kernels (one a notebook) have run their notebooks:
    all started and together below a tenth of a core for two seconds running.  On a loaded
    2-core machine the first dashboard otherwise waits for every kernel's warm-up at once."""
    psutil = pytest.importorskip("psutil")
    from workbench.cli import POOL_SIZE

    expected = POOL_SIZE * len(list((Path(__file__).parents[1] / "notebooks").glob("*.ipynb")))
    server, quiet, last = psutil.Process(process.pid), 0, None
    while quiet < 2 and time.monotonic() < deadline:
        kernels = server.children(recursive=True)
        try:
            used = sum(sum(k.cpu_times()[:2]) for k in kernels)
        except psutil.NoSuchProcess:
            used = None
        started = len(kernels) >= expected
        quiet = quiet + 1 if (started and used is not None and last is not None
                              and used - last < 0.1) else 0
        last = used
        time.sleep(1.0)


#: Server of each base URL handed out by ``served_dashboards``: its process and log file.
_SERVERS: dict = {}


def _server_report(base: str) -> str:
    """Kernel processes (CPU used, state) and the last lines of the server's log."""
    server = _SERVERS.get(base)
    if server is None:
        return "(no server record)"
    lines = []
    try:
        import psutil

        for kernel in psutil.Process(server["process"].pid).children(recursive=True):
            with kernel.oneshot():
                lines.append(f"  pid {kernel.pid} {kernel.status()} cpu "
                             f"{sum(kernel.cpu_times()[:2]):.1f} s threads "
                             f"{kernel.num_threads()}")
    except Exception as exc:  # a report must not hide the failure it explains
        lines.append(f"  (process list unavailable: {exc!r})")
    log = server["log"]
    log.flush()
    log.seek(0)
    tail = log.read()[-4000:]
    log.seek(0, os.SEEK_END)
    return "server processes:\n" + "\n".join(lines) + "\nserver log (end):\n" + tail


@pytest.fixture()
def page(browser):
    """A fresh page (own context, downloads accepted) that records the browser's console
    messages, failed requests and requests to other machines.  ``page.wb_report()`` returns
    that record with the server's state; ``page.wb_wait(js, arg, timeout, what)`` waits for
    a condition and fails with that report.  At the end the
    page must have asked nothing of another machine: the dashboards work on a plant network
    without internet access."""
    context = browser.new_context(viewport={"width": 1400, "height": 1000},
                                  accept_downloads=True)
    page = context.new_page()
    events, offsite = [], []

    from workbench.cli import LOCAL_HOSTS

    def on_request(request):
        host = urllib.parse.urlsplit(request.url).hostname
        if request.url.startswith(("http:", "https:", "ws:", "wss:")) and host not in LOCAL_HOSTS:
            offsite.append(request.url)

    page.on("console", lambda m: events.append(f"console {m.type}: {m.text[:300]}"))
    page.on("pageerror", lambda e: events.append(f"page error: {str(e)[:300]}"))
    page.on("requestfailed", lambda r: events.append(f"failed: {r.url[:200]} {r.failure}"))
    page.on("request", on_request)

    def report() -> str:
        try:
            body = page.evaluate("() => document.body ? document.body.innerText : ''")
        except Exception as exc:
            body = f"(page text unavailable: {exc!r})"
        base = next((b for b in _SERVERS if page.url.startswith(b)), "")
        shot = Path(tempfile.gettempdir()) / f"wb-failed-page-{os.getpid()}-{time.time():.0f}.png"
        try:
            page.screenshot(path=str(shot), full_page=True)
        except Exception as exc:
            shot = f"(no screenshot: {exc!r})"
        return (f"page {page.url} (screenshot {shot})\npage text (start): {body[:800]!r}\n"
                f"browser events (last 25):\n  " + "\n  ".join(events[-25:]) +
                f"\nrequests to other machines: {offsite}\n" + _server_report(base))

    def wait(expression: str, arg=None, timeout: float = 30_000, what: str = "the page"):
        """``page.wait_for_function`` whose timeout fails with :func:`report` attached."""
        from playwright.sync_api import TimeoutError as PlaywrightTimeout

        try:
            page.wait_for_function(expression, arg=arg, timeout=timeout)
        except PlaywrightTimeout:
            pytest.fail(f"{what}: not there after {timeout / 1000:.0f} s\n{report()}")

    page.wb_report, page.wb_wait = report, wait
    yield page
    context.close()
    assert not offsite, f"the page asked other machines for {offsite}"


@pytest.fixture(scope="module")
def served_dashboards():
    """Base URL of a ``workbench serve`` subprocess on a free port (stopped at module end)."""
    port = free_port()
    log = tempfile.TemporaryFile(mode="w+")
    process = subprocess.Popen(
        [sys.executable, "-m", "workbench", "serve", "--port", str(port), "--no-browser"],
        stdout=log, stderr=subprocess.STDOUT, text=True)
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 90
    try:
        while True:
            if process.poll() is not None:
                log.seek(0)
                pytest.fail("workbench serve stopped early:\n" + log.read())
            try:
                # the folder listing, not a dashboard: a render would use up a warm kernel
                with urllib.request.urlopen(base + "/", timeout=5):
                    break
            except OSError:
                if time.monotonic() > deadline:
                    pytest.fail("workbench serve did not answer within 90 s")
                time.sleep(0.5)
        _wait_for_warm_kernels(process, time.monotonic() + 240)
        _SERVERS[base] = {"process": process, "log": log}
        yield base
    finally:
        _SERVERS.pop(base, None)
        process.terminate()
        try:
            process.wait(timeout=45)
        except subprocess.TimeoutExpired:
            process.kill()
            process.wait()
        log.close()


@pytest.fixture()
def edited():
    """``edited(setup, "a.b", value)``: a copy of a nested dict with the key at the dotted path
    set to ``value`` (``...`` deletes it); for the refusals of setup and case files."""

    def edit(setup, dotted, value):
        out = copy.deepcopy(setup)
        *parents, last = dotted.split(".")
        where = out
        for key in parents:
            where = where[key]
        if value is ...:
            del where[last]
        else:
            where[last] = value
        return out

    return edit
