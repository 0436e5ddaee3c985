"""Command line of the workbench: serve the dashboards, print a demo calculation.

``workbench serve [--port N] [--host H] [--no-browser]`` starts Voila over the notebooks
folder with the code hidden and kernels started ahead of the first visitor, and prints the
address of each dashboard.  ``workbench demo`` prints one compressor and one turbine
calculation made with the public API.  ``python -m workbench ...`` does the same.

References
----------
Voila documentation, "Customizing Voila" (configuration options ``strip_sources``,
``preheat_kernel``, ``default_pool_size``), https://voila.readthedocs.io.
"""

from __future__ import annotations

import argparse
import signal
import socket
import subprocess
import sys
import threading
import time
import webbrowser
from pathlib import Path

from . import SAFETY_CAUTION

DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8866

#: Dashboards served, in the order their addresses are printed.
DASHBOARDS = ("compressor.ipynb", "turbine.ipynb")

#: Kernels kept started per dashboard, so a visitor gets a running panel at once.
POOL_SIZE = 1

LOCAL_HOSTS = ("127.0.0.1", "localhost", "::1")

EXPOSED_WARNING = (
    "WARNING: host {host} makes the dashboards reachable from other machines on the "
    "network. Anyone who can reach this port can run calculations on this computer. "
    "Use the default host 127.0.0.1 unless you mean to share them."
)


def notebooks_dir() -> Path:
    """Folder of the dashboard notebooks.

    The ``notebooks/`` folder beside the package (a checkout or an editable install) wins;
    else the copy a wheel installs under ``<prefix>/share/turbo-workbench/notebooks``.

    Returns
    -------
    Path
        Existing folder holding ``compressor.ipynb`` and ``turbine.ipynb``.

    Raises
    ------
    FileNotFoundError
        When neither folder holds the dashboards.
    """
    checkout = Path(__file__).resolve().parent.parent / "notebooks"
    shipped = Path(sys.prefix) / "share" / "turbo-workbench" / "notebooks"
    for folder in (checkout, shipped):
        if all((folder / name).is_file() for name in DASHBOARDS):
            return folder
    raise FileNotFoundError(
        f"dashboard notebooks not found in {checkout} or {shipped}: reinstall the package"
    )


def is_exposed(host: str) -> bool:
    """True when ``host`` is not a loopback address (other machines can connect)."""
    return host not in LOCAL_HOSTS and not host.startswith("127.")


def format_host(host: str) -> str:
    """Host as written in a URL (IPv6 addresses in brackets)."""
    return f"[{host}]" if ":" in host and not host.startswith("[") else host


def dashboard_names(folder: Path) -> list[str]:
    """Notebooks served from ``folder``: the compressor and turbine first, then the rest."""
    others = sorted(p.name for p in folder.glob("*.ipynb") if p.name not in DASHBOARDS)
    return [name for name in DASHBOARDS if (folder / name).is_file()] + others


def dashboard_urls(host: str, port: int, names=DASHBOARDS) -> list[str]:
    """Addresses of the dashboards ``names`` served by :func:`voila_argv`.

    A server bound to every interface (``0.0.0.0``/``::``) is shown at ``127.0.0.1`` for
    the local browser.
    """
    shown = DEFAULT_HOST if host in ("0.0.0.0", "::", "") else format_host(host)
    return [f"http://{shown}:{port}/voila/render/{name}" for name in names]


def voila_argv(folder: Path, host: str = DEFAULT_HOST, port: int = DEFAULT_PORT,
               pool_size: int = POOL_SIZE) -> list[str]:
    """Command line that starts Voila over ``folder`` (not started here).

    Parameters
    ----------
    folder : Path
        Folder of the notebooks to serve.
    host : str
        Interface to bind (``127.0.0.1`` by default: this computer only).
    port : int
        TCP port [-].
    pool_size : int
        Kernels pre-started per notebook [-].

    Returns
    -------
    list of str
        ``[python, -m, voila, ...]``; the browser is never opened by Voila itself.
    """
    return [
        sys.executable, "-m", "voila", str(folder),
        "--no-browser",
        f"--port={int(port)}",
        f"--Voila.ip={host}",
        "--strip_sources=True",
        "--show_tracebacks=False",
        "--preheat_kernel=True",
        f"--pool_size={int(pool_size)}",
        "--Voila.port_retries=0",
    ]


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="workbench",
        description="Turbomachinery energy-balance workbench: dashboards and demo.",
    )
    commands = parser.add_subparsers(dest="command", required=True)
    serve = commands.add_parser("serve", help="serve the compressor and turbine dashboards")
    serve.add_argument("--port", type=int, default=DEFAULT_PORT,
                       help=f"TCP port (default {DEFAULT_PORT})")
    serve.add_argument("--host", default=DEFAULT_HOST,
                       help=f"interface to bind (default {DEFAULT_HOST}: this computer only)")
    serve.add_argument("--no-browser", action="store_true",
                       help="do not open the compressor dashboard in a browser")
    commands.add_parser("demo", help="print a demo compressor and turbine calculation")
    return parser


def serve(host: str, port: int, open_browser: bool) -> int:
    """Run Voila in the foreground until it stops or Ctrl-C; returns its exit code."""
    if not 0 < port < 65536:
        print(f"port {port} is outside 1 to 65535", file=sys.stderr)
        return 2
    if is_exposed(host):
        print(EXPOSED_WARNING.format(host=host), file=sys.stderr, flush=True)
    folder = notebooks_dir()
    argv = voila_argv(folder, host=host, port=port)
    urls = dashboard_urls(host, port, dashboard_names(folder))
    print("Serving the workbench dashboards (Ctrl-C stops):")
    for url in urls:
        print("  " + url)
    print(SAFETY_CAUTION, flush=True)
    process = subprocess.Popen(argv)
    previous = None
    if threading.current_thread() is threading.main_thread():
        # a plain kill of this command stops Voila and its kernels too (no orphans)
        previous = signal.signal(signal.SIGTERM, _raise_interrupt)
    try:
        if open_browser:
            threading.Thread(target=_open_when_ready, args=(urls[0], port, process),
                             daemon=True).start()
        return process.wait()
    except KeyboardInterrupt:
        return stop_process(process)
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)


def _raise_interrupt(signum, frame):
    raise KeyboardInterrupt


def stop_process(process: subprocess.Popen, timeout: float = 30.0) -> int:
    """Terminate ``process`` (Voila shuts its kernels down), kill it after ``timeout`` [s]."""
    if process.poll() is None:
        process.terminate()
    try:
        return process.wait(timeout=timeout)
    except subprocess.TimeoutExpired:
        process.kill()
        return process.wait()


def wait_for_port(port: int, host: str = DEFAULT_HOST, timeout: float = 60.0,
                  process: subprocess.Popen | None = None) -> bool:
    """Wait until ``host:port`` accepts a TCP connection; False after ``timeout`` [s].

    Gives up early when ``process`` (the server) has stopped.
    """
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        if process is not None and process.poll() is not None:
            return False
        try:
            with socket.create_connection((host, port), timeout=1.0):
                return True
        except OSError:
            time.sleep(0.2)
    return False


def _open_when_ready(url: str, port: int, process: subprocess.Popen) -> None:
    if wait_for_port(port, process=process):
        webbrowser.open(url)


def demo() -> int:
    """Print a compressor and a turbine calculation made with the public API."""
    from . import Q_, Fluid, compressor, turbine

    gas = Fluid({"Methane": 0.9, "Ethane": 0.07, "Propane": 0.03})
    inlet = gas.state(P=Q_(30, "bar"), T=Q_(25, "degC"))
    stage = compressor(inlet, P_out=Q_(60, "bar"), isentropic_efficiency=0.78,
                       mass_flow=Q_(10, "kg/s"))
    print("Gas-gathering compressor (natural-gas mixture, 30 -> 60 bar, 10 kg/s, "
          "isentropic efficiency 0.78):")
    print(f"  power                  {stage.power / 1e3:10.1f} kW")
    print(f"  outlet temperature     {stage.outlet.T - 273.15:10.2f} degC")
    print(f"  polytropic efficiency  {stage.polytropic_efficiency:10.4f}")

    steam = Fluid("Water")
    throttle = steam.state(P=Q_(40, "bar"), T=Q_(400, "degC"))
    stage = turbine(throttle, P_out=Q_(0.5, "bar"), isentropic_efficiency=0.80,
                    mass_flow=Q_(5, "kg/s"))
    print("Back-pressure steam turbine (40 bar 400 degC -> 0.5 bar, 5 kg/s, "
          "isentropic efficiency 0.80):")
    print(f"  power                  {stage.power / 1e3:10.1f} kW")
    print(f"  exhaust temperature    {stage.outlet.T - 273.15:10.2f} degC")
    quality = stage.outlet.quality
    shown = f"{quality:.4f}" if stage.outlet.two_phase else "superheated"
    print(f"  exhaust quality        {shown:>10}")
    print(SAFETY_CAUTION)
    return 0


def main(argv: list[str] | None = None) -> int:
    """Entry point of the ``workbench`` command."""
    args = build_parser().parse_args(argv)
    if args.command == "serve":
        return serve(args.host, args.port, open_browser=not args.no_browser)
    return demo()


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
