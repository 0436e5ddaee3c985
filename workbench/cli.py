"""Command line of the workbench: serve the dashboards, print a demo calculation.

``workbench serve [--port N] [--host H] [--token T] [--allow-host NAME] [--no-browser]``
starts Voila over the notebooks folder with the code hidden and kernels started ahead of the
first visitor, and prints the address of each dashboard.  The pages use the package's own
Voila template (``served/voila/templates/workbench``): Voila's "lab" page without its links
to a public CDN, so the dashboards load from this computer alone, also on a plant network
without internet access.  ``workbench demo`` prints one
compressor and one turbine calculation made with the public API.  ``python -m workbench ...``
does the same.

Access control, as in Jupyter:

- On a loopback host (127.0.0.1, the default) no token is asked unless ``--token`` is given.
- On any other host (``--host 0.0.0.0``, a LAN address) an access token is required: the one
  given with ``--token``, else one generated with :func:`secrets.token_urlsafe` and printed
  with the addresses.  A request without it is refused (the login page); ``?token=...`` in the
  address logs the browser in.  The token reaches Voila through the ``JUPYTER_TOKEN``
  environment variable (jupyter_server's ``IdentityProvider.token``), never its command line.
- The ``Host`` header of every request is checked (DNS rebinding: a page of another site
  whose name was pointed at this machine must not drive the widgets).  Allowed: loopback
  addresses, ``localhost``, the host served (and, when bound to every interface, this
  machine's names and any address of it written as an IP literal) and names given with
  ``--allow-host``.  The check sits in the identity provider Voila is told to use
  (:class:`HostCheckingIdentityProvider`, Voila's ``identity_provider_class`` option),
  which every Jupyter request handler consults before serving.  jupyter_server's own
  ``allow_remote_access``/``local_hostnames`` check is not used: Voila switches it off, its
  command line passes ``tornado_settings`` values only as text, and it admits no IP address
  but loopback ones, so a dashboard served on a LAN address could not be reached.

References
----------
Voila documentation, "Customizing Voila" (configuration options ``strip_sources``,
``preheat_kernel``, ``default_pool_size``, ``token``), https://voila.readthedocs.io.
Jupyter Server documentation, "Security in the Jupyter Server" (tokens, ``?token=`` in the
URL, ``allow_remote_access`` and ``local_hostnames`` against DNS rebinding),
https://jupyter-server.readthedocs.io.
"""

from __future__ import annotations

import argparse
import ipaddress
import os
import re
import secrets
import signal
import socket
import subprocess
import sys
import threading
import time
import webbrowser
from pathlib import Path

from jupyter_server.auth.identity import PasswordIdentityProvider
from tornado import web
from traitlets import Unicode

from . import SAFETY_CAUTION

DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8866

#: Dashboards served, in the order their addresses are printed.
DASHBOARDS = ("compressor.ipynb", "turbine.ipynb")

#: Kernels kept started per dashboard, so a visitor gets a running panel at once.
POOL_SIZE = 1

#: Longest wait [s] for a cell's output messages after the kernel's reply, when Voila runs
#: a dashboard notebook (nbclient's ``iopub_timeout``; its default of 4 s loses panels on a
#: loaded machine).
IOPUB_TIMEOUT = 120

#: Voila page template of the dashboards (Voila's "lab" page that loads nothing from
#: outside this computer), found under :data:`TEMPLATE_ROOT` through ``JUPYTER_PATH``.
TEMPLATE = "workbench"
TEMPLATE_ROOT = Path(__file__).resolve().parent / "served"

LOCAL_HOSTS = ("127.0.0.1", "localhost", "::1")
#: Hosts that mean "every interface of this machine".
WILDCARD_HOSTS = ("0.0.0.0", "::", "")
#: Characters of an access token (URL-safe: it travels in ``?token=...``) and its length.
TOKEN_PATTERN = re.compile(r"^[A-Za-z0-9_.~-]{8,256}$")
#: Python path of the identity provider Voila is told to use.
PROVIDER = "workbench.cli.HostCheckingIdentityProvider"

EXPOSED_WARNING = (
    "WARNING: host {host} makes the dashboards reachable from other machines on the "
    "network. Anyone who can reach this port and holds the access token can run "
    "calculations on this computer. Use the default host 127.0.0.1 unless you mean to "
    "share them, and share the token only with the people meant to use them."
)
_HOST_NAME = re.compile(r"^([A-Za-z0-9]([A-Za-z0-9.-]{0,251}[A-Za-z0-9])?|\[?[0-9A-Fa-f:.]+\]?)$")


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


def dashboard_urls(host: str, port: int, names=DASHBOARDS, token: str | None = None
                   ) -> list[str]:
    """Addresses of the dashboards ``names`` served by :func:`voila_argv`.

    A server bound to every interface (``0.0.0.0``/``::``) is shown at ``127.0.0.1`` for
    the local browser.  With ``token`` the addresses carry ``?token=...`` (it logs the
    browser in, as in Jupyter).
    """
    shown = DEFAULT_HOST if host in WILDCARD_HOSTS else format_host(host)
    query = f"?token={token}" if token else ""
    return [f"http://{shown}:{port}/voila/render/{name}{query}" for name in names]


def host_names(host: str, allowed=()) -> list[str]:
    """Names (not IP literals) a request's ``Host`` header may carry for a server on ``host``.

    ``localhost`` always; ``host`` itself when it is a name; this machine's name and fully
    qualified name when bound to every interface; then ``allowed`` (``--allow-host``).

    Examples
    --------
    >>> host_names("127.0.0.1", ["dashboards.plant.example"])
    ['localhost', 'dashboards.plant.example']
    """
    names = ["localhost"]
    if host and not _is_ip(host):
        names.append(host)
    if host in WILDCARD_HOSTS:
        names += [socket.gethostname(), socket.getfqdn()]
    names += list(allowed)
    out = []
    for name in names:
        name = name.strip().lower().rstrip(".")
        if name and name not in out:
            out.append(name)
    return out


def _is_ip(text: str) -> bool:
    try:
        ipaddress.ip_address(text.strip("[]"))
    except ValueError:
        return False
    return True


def split_host_header(value: str) -> str:
    """Host of a ``Host`` header without its port and IPv6 brackets, lower case.

    Examples
    --------
    >>> split_host_header("[::1]:8866"), split_host_header("LocalHost:8866")
    ('::1', 'localhost')
    """
    value = (value or "").strip().lower()
    if value.startswith("["):
        return value[1:value.find("]")] if "]" in value else value[1:]
    if value.count(":") == 1:
        value = value.split(":", 1)[0]
    return value.rstrip(".")


def host_allowed(header: str, bound: str, names) -> bool:
    """Whether a request whose ``Host`` header is ``header`` may reach a server on ``bound``.

    Parameters
    ----------
    header : str
        The request's ``Host`` header (``name:port``, ``1.2.3.4:port``, ``[::1]:port``).
    bound : str
        Interface the server is bound to (``127.0.0.1``, ``0.0.0.0``, an address or a name).
    names : iterable of str
        Host names allowed (see :func:`host_names`).

    Returns
    -------
    bool
        True for a loopback address, a name (or address) of ``names``, the bound address
        itself, or any IP literal when bound to every interface.  A DNS-rebinding page always sends its own
        *name*; an IP literal means the browser addressed this machine directly.

    Examples
    --------
    >>> host_allowed("localhost:8866", "127.0.0.1", ["localhost"])
    True
    >>> host_allowed("evil.example:8866", "127.0.0.1", ["localhost"])
    False
    """
    host = split_host_header(header)
    if not host:
        return False
    if host in {n.lower() for n in names}:
        return True
    try:
        address = ipaddress.ip_address(host)
    except ValueError:
        return False
    if address.is_loopback or bound in WILDCARD_HOSTS:
        return True
    try:
        return address == ipaddress.ip_address(bound.strip("[]"))
    except ValueError:
        return False


class HostCheckingIdentityProvider(PasswordIdentityProvider):
    """Voila's identity provider (token login) that first checks the ``Host`` header.

    Every Jupyter request handler asks the identity provider for the user before it serves
    anything, so a request with a ``Host`` that :func:`host_allowed` refuses gets 403 on
    every page, API call and kernel websocket.  Configured by ``workbench serve`` through
    ``--HostCheckingIdentityProvider.bound_host`` and ``.allowed_hosts`` (comma-separated).
    """

    bound_host = Unicode(DEFAULT_HOST, config=True, help="Interface the server is bound to.")
    allowed_hosts = Unicode("localhost", config=True,
                            help="Comma-separated host names allowed in the Host header.")

    def get_user(self, handler):
        """The user of ``handler``'s request, after the ``Host`` check (403 if refused)."""
        names = [n for n in self.allowed_hosts.split(",") if n.strip()]
        if not host_allowed(handler.request.host, self.bound_host, names):
            self.log.warning("Refused a request with Host %r: not a name or address this "
                             "server is served at", handler.request.host[:100])
            raise web.HTTPError(403, "Host not allowed")
        return super().get_user(handler)


def check_token(token: str) -> str:
    """An access token given with ``--token``: 8 to 256 URL-safe characters.

    Examples
    --------
    >>> check_token("team-token-42")
    'team-token-42'
    """
    if not isinstance(token, str) or not TOKEN_PATTERN.match(token):
        raise ValueError("the access token must be 8 to 256 characters of letters, digits "
                         "and - _ . ~ (it travels in the address as ?token=...)")
    return token


def voila_argv(folder: Path, host: str = DEFAULT_HOST, port: int = DEFAULT_PORT,
               pool_size: int = POOL_SIZE, *, token: bool = False,
               allowed=()) -> list[str]:
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
    token : bool
        Require the access token that the environment variable ``JUPYTER_TOKEN`` of the
        Voila process holds (jupyter_server's ``IdentityProvider.token`` default).
    allowed : iterable of str
        Extra host names allowed in the ``Host`` header (see :func:`host_names`).

    Returns
    -------
    list of str
        ``[python, -m, voila, ...]``; the browser is never opened by Voila itself.
    """
    names = ",".join(host_names(host, allowed))
    access = [
        f"--Voila.identity_provider_class={PROVIDER}",
        f"--HostCheckingIdentityProvider.bound_host={host}",
        f"--HostCheckingIdentityProvider.allowed_hosts={names}",
    ]
    if token:
        access.append("--Voila.auto_token=True")  # the token comes from JUPYTER_TOKEN
    return [
        sys.executable, "-m", "voila", str(folder),
        "--no-browser",
        f"--port={int(port)}",
        f"--Voila.ip={host}",
        f"--template={TEMPLATE}",
        "--strip_sources=True",
        "--show_tracebacks=False",
        "--preheat_kernel=True",
        f"--pool_size={int(pool_size)}",
        # a panel's widgets reach the page as output messages that may trail the kernel's
        # reply by seconds while several kernels start at once on a small machine; the
        # notebook runner's default wait of 4 s then drops them and the page shows no panel
        f"--VoilaExecutor.iopub_timeout={IOPUB_TIMEOUT}",
        "--Voila.port_retries=0",
        # uploads of readings files up to the panel's 20 MiB limit travel as one websocket
        # message (base64): raise tornado's 10 MiB default so the panel can say "too large"
        '--Voila.tornado_settings={"websocket_max_message_size": 67108864}',
        *access,
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
    serve.add_argument("--token", default=None,
                       help="access token to require (8 to 256 letters, digits, - _ . ~); "
                            "required on a host other than loopback: generated and printed "
                            "when not given")
    serve.add_argument("--allow-host", action="append", default=[], metavar="NAME",
                       help="a host name (e.g. a DNS name of this machine) browsers may use "
                            "to reach the dashboards; repeat for more")
    serve.add_argument("--pool-size", type=int, default=POOL_SIZE, metavar="N",
                       help=f"kernels kept started per dashboard (default {POOL_SIZE}; 0 "
                            "starts one at each visit, slower to open, lighter on memory)")
    serve.add_argument("--no-browser", action="store_true",
                       help="do not open the compressor dashboard in a browser")
    commands.add_parser("demo", help="print a demo compressor and turbine calculation")
    return parser


def serve(host: str, port: int, open_browser: bool, token: str | None = None,
          allowed=(), pool_size: int = POOL_SIZE) -> int:
    """Run Voila in the foreground until it stops or Ctrl-C; returns its exit code.

    Parameters
    ----------
    host : str
        Interface to bind; any host but a loopback one requires an access token.
    port : int
        TCP port.
    open_browser : bool
        Open the first dashboard in the local browser once the server answers.
    token : str, optional
        Access token to require; generated (:func:`secrets.token_urlsafe`) when ``host`` is
        not a loopback one and none is given.  No token on a loopback host unless given.
    allowed : iterable of str
        Extra host names browsers may use (``--allow-host``).
    pool_size : int
        Kernels kept started per dashboard (0 to 20).
    """
    if not 0 < port < 65536:
        print(f"port {port} is outside 1 to 65535", file=sys.stderr)
        return 2
    if not 0 <= pool_size <= 20:
        print(f"--pool-size {pool_size} is outside 0 to 20", file=sys.stderr)
        return 2
    try:
        token = None if token is None else check_token(token)
    except ValueError as exc:
        print(f"--token: {exc}", file=sys.stderr)
        return 2
    bad = [name for name in allowed if not _HOST_NAME.match(name)]
    if bad:
        print(f"--allow-host {bad[0][:80]!r} is not a host name (letters, digits, - and .)",
              file=sys.stderr)
        return 2
    generated = token is None and is_exposed(host)
    if generated:
        token = secrets.token_urlsafe(32)
    if is_exposed(host):
        print(EXPOSED_WARNING.format(host=host), file=sys.stderr, flush=True)
    folder = notebooks_dir()
    argv = voila_argv(folder, host=host, port=port, pool_size=pool_size,
                      token=token is not None, allowed=allowed)
    env = dict(os.environ)
    env.pop("JUPYTER_TOKEN", None)
    env.pop("JUPYTER_TOKEN_FILE", None)
    if token is not None:
        env["JUPYTER_TOKEN"] = token  # jupyter_server's IdentityProvider.token default
    # traitlets warns that a dict option given as JSON is deprecated; it is still the only
    # form that keeps the websocket limit an integer: keep the server's console quiet
    env.setdefault("PYTHONWARNINGS", "ignore::DeprecationWarning")
    env["JUPYTER_PATH"] = os.pathsep.join(
        [str(TEMPLATE_ROOT)] + [p for p in env.get("JUPYTER_PATH", "").split(os.pathsep) if p])
    names = dashboard_names(folder)
    urls = dashboard_urls(host, port, names, token)
    print("Serving the workbench dashboards (Ctrl-C stops):")
    for url in (urls if generated or token is None else dashboard_urls(host, port, names)):
        print("  " + url)
    if token is not None and not generated:
        print("  (open them with ?token=<the token you gave> at the end of the address)")
    elif generated:
        print("  (the access token is the text after ?token= : share it only with the people "
              "meant to use the dashboards)")
    print(SAFETY_CAUTION, flush=True)
    process = subprocess.Popen(argv, env=env)
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
        return serve(args.host, args.port, open_browser=not args.no_browser,
                     token=args.token, allowed=args.allow_host, pool_size=args.pool_size)
    return demo()


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
