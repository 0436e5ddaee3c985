"""Tests of the command line (workbench.cli): parsing, the Voila command built, warnings,
access tokens and the Host check.

Most tests run :func:`workbench.cli.serve` with ``subprocess.Popen`` replaced.  The tests
marked "live" start ``python -m workbench serve`` for real (no kernels pre-started) and send
requests to 127.0.0.1 only.
"""

from __future__ import annotations

import os
import subprocess
import sys

import pytest

from workbench import SAFETY_CAUTION, cli


def test_serve_defaults_bind_loopback():
    args = cli.build_parser().parse_args(["serve"])
    # common practice: a dashboard server binds to the loopback interface unless told otherwise
    assert args.host == "127.0.0.1"
    assert args.port == cli.DEFAULT_PORT
    assert args.no_browser is False


def test_serve_options_parsed():
    args = cli.build_parser().parse_args(
        ["serve", "--port", "9123", "--host", "0.0.0.0", "--no-browser"])
    assert (args.command, args.port, args.host, args.no_browser) == (
        "serve", 9123, "0.0.0.0", True)


def test_port_must_be_a_number():
    with pytest.raises(SystemExit):
        cli.build_parser().parse_args(["serve", "--port", "eighty"])


def test_a_command_is_required():
    with pytest.raises(SystemExit):
        cli.build_parser().parse_args([])


def test_voila_argv_hides_code_and_preheats_kernels(tmp_path):
    argv = cli.voila_argv(tmp_path, host="127.0.0.1", port=9001, pool_size=2)
    assert argv[:4] == [sys.executable, "-m", "voila", str(tmp_path)]
    # option names as listed by `voila --help-all` (voila 0.5)
    for option in ("--no-browser", "--port=9001", "--Voila.ip=127.0.0.1",
                   "--strip_sources=True", "--show_tracebacks=False",
                   "--preheat_kernel=True", "--pool_size=2",
                   f"--VoilaExecutor.iopub_timeout={cli.IOPUB_TIMEOUT}",
                   "--Voila.identity_provider_class=workbench.cli.HostCheckingIdentityProvider",
                   "--HostCheckingIdentityProvider.bound_host=127.0.0.1",
                   "--HostCheckingIdentityProvider.allowed_hosts=localhost"):
        assert option in argv
    # no token unless asked: the token itself never appears on the command line
    assert "--Voila.auto_token=True" not in argv
    assert "--Voila.auto_token=True" in cli.voila_argv(tmp_path, token=True)
    # default host of the function itself is the loopback one
    assert "--Voila.ip=127.0.0.1" in cli.voila_argv(tmp_path)


def test_the_page_template_is_found_and_strips_every_outside_link(monkeypatch, capsys,
                                                                  tmp_path):
    """The served pages use the package's template (Voila's "lab" page without its CDN
    stylesheets): serve points JUPYTER_PATH at it, Voila's template lookup finds it above
    "lab", and every link our template removes is spelled in the installed "lab" page as we
    spell it (a Voila update that changes them fails here; the browser tests then also see
    the page ask another machine)."""
    import re

    import jinja2
    from jupyter_core.paths import jupyter_path
    from voila.paths import collect_template_paths

    rc, _out = _serve(monkeypatch, capsys, ["serve", "--no-browser"], tmp_path)
    assert rc == 0
    assert f"--template={cli.TEMPLATE}" in _FakeProcess.argv
    first = _FakeProcess.env["JUPYTER_PATH"].split(os.pathsep)[0]
    assert first == str(cli.TEMPLATE_ROOT)

    paths = collect_template_paths(["voila", "nbconvert"], cli.TEMPLATE, prune=True,
                                   root_dirs=[first, *jupyter_path()])
    assert paths[0] == str(cli.TEMPLATE_ROOT / "voila" / "templates" / cli.TEMPLATE)
    assert any(p.endswith(os.path.join("voila", "templates", "lab")) for p in paths)
    loader = jinja2.FileSystemLoader(paths)
    ours = loader.get_source(jinja2.Environment(), "index.html.j2")[0]
    parent_name = re.search(r"extends '([^']+)'", ours).group(1)
    parent = loader.get_source(jinja2.Environment(), parent_name)[0]
    removed = re.findall(r"replace\('(<link[^']+)'", ours)
    outside = re.findall(r'<link[^>]+href="https?://[^>]+>', parent)
    assert removed and sorted(removed) == sorted(outside)


def test_voila_accepts_the_options_it_is_given(tmp_path):
    """Every ``--name=value`` option built is one that the installed Voila lists."""
    listed = subprocess.run([sys.executable, "-m", "voila", "--help-all"],
                            capture_output=True, text=True, timeout=120).stdout
    for option in cli.voila_argv(tmp_path, token=True)[4:]:
        name = option.split("=", 1)[0]
        if name.startswith("--HostCheckingIdentityProvider."):
            # options of our own identity provider class (a traitlets configurable)
            assert cli.HostCheckingIdentityProvider.class_traits(config=True).get(
                name.split(".", 1)[1]) is not None, name
        else:
            assert name in listed, name


@pytest.mark.parametrize("host, exposed", [
    ("127.0.0.1", False), ("localhost", False), ("::1", False), ("127.0.0.2", False),
    ("0.0.0.0", True), ("::", True), ("192.0.2.7", True),
])
def test_exposed_hosts(host, exposed):
    assert cli.is_exposed(host) is exposed


def test_dashboard_urls():
    assert cli.dashboard_urls("127.0.0.1", 8866) == [
        "http://127.0.0.1:8866/voila/render/compressor.ipynb",
        "http://127.0.0.1:8866/voila/render/turbine.ipynb",
    ]
    # a server bound to every interface is shown at the loopback address
    assert cli.dashboard_urls("0.0.0.0", 8000)[0].startswith("http://127.0.0.1:8000/")
    assert cli.dashboard_urls("::1", 8000)[0].startswith("http://[::1]:8000/")


class _FakeProcess:
    argv: list[str] = []
    env: dict = {}

    def __init__(self, argv, env=None):
        _FakeProcess.argv = argv
        _FakeProcess.env = env

    def wait(self, timeout=None):
        return 0


def _serve(monkeypatch, capsys, argv, folder):
    folder.mkdir(exist_ok=True)
    for name in cli.DASHBOARDS:
        (folder / name).write_text("{}")
    monkeypatch.setattr(cli.subprocess, "Popen", _FakeProcess)
    monkeypatch.setattr(cli, "notebooks_dir", lambda: folder)
    rc = cli.main(argv)
    return rc, capsys.readouterr()


def test_serve_on_all_interfaces_warns(monkeypatch, capsys, tmp_path):
    rc, out = _serve(monkeypatch, capsys, ["serve", "--host", "0.0.0.0", "--no-browser"],
                     tmp_path)
    assert rc == 0
    assert "WARNING" in out.err and "other machines" in out.err
    assert "--Voila.ip=0.0.0.0" in _FakeProcess.argv


def test_serve_locally_prints_urls_without_warning(monkeypatch, capsys, tmp_path):
    rc, out = _serve(monkeypatch, capsys, ["serve", "--port", "8999", "--no-browser"],
                     tmp_path)
    assert rc == 0
    assert "WARNING" not in out.err
    assert "http://127.0.0.1:8999/voila/render/compressor.ipynb" in out.out
    assert "http://127.0.0.1:8999/voila/render/turbine.ipynb" in out.out
    assert SAFETY_CAUTION in out.out
    assert _FakeProcess.argv[3] == str(tmp_path)


def test_serve_refuses_bad_port(monkeypatch, capsys, tmp_path):
    rc, out = _serve(monkeypatch, capsys, ["serve", "--port", "70000", "--no-browser"],
                     tmp_path)
    assert rc == 2 and "70000" in out.err


def test_demo_prints_results(capsys):
    assert cli.main(["demo"]) == 0
    out = capsys.readouterr().out
    assert "kW" in out and "exhaust quality" in out
    assert SAFETY_CAUTION in out


def test_python_dash_m_runs_the_same_command():
    done = subprocess.run([sys.executable, "-m", "workbench", "serve", "--help"],
                          capture_output=True, text=True, timeout=60)
    assert done.returncode == 0
    assert "--no-browser" in done.stdout and "--host" in done.stdout


def test_notebooks_dir_holds_the_dashboards():
    folder = cli.notebooks_dir()
    assert folder.name == "notebooks"
    assert all((folder / name).is_file() for name in cli.DASHBOARDS)


def test_dashboard_names_put_the_machines_first(tmp_path):
    for name in ("a-extra.ipynb", "turbine.ipynb", "compressor.ipynb", "notes.txt"):
        (tmp_path / name).write_text("{}")
    assert cli.dashboard_names(tmp_path) == ["compressor.ipynb", "turbine.ipynb",
                                             "a-extra.ipynb"]


def test_stop_process_ends_the_child():
    """What ``workbench serve`` does with its Voila child on SIGTERM or Ctrl-C."""
    child = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(120)"])
    try:
        assert cli.stop_process(child, timeout=10) != 0  # ended by a signal
        assert child.poll() is not None
    finally:
        if child.poll() is None:
            child.kill()


def test_a_wheel_carries_the_dashboards_and_the_data(tmp_path):
    # Packaging: a non-editable install must still find the dashboard notebooks
    # (<prefix>/share/turbo-workbench/notebooks) and the case and demo files.
    import pathlib
    import shutil
    import subprocess
    import sys
    import zipfile

    root = pathlib.Path(cli.__file__).resolve().parents[1]
    if not (root / "pyproject.toml").is_file():
        pytest.skip("not a source checkout")
    source = tmp_path / "src"
    shutil.copytree(root, source, ignore=shutil.ignore_patterns(
        ".git", "*.egg-info", "build", "__pycache__", ".ipynb_checkpoints", "docs"))
    done = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps",
                           "--no-build-isolation", "-w", str(tmp_path / "dist"), str(source)],
                          capture_output=True, text=True, timeout=600)
    assert done.returncode == 0, done.stderr[-2000:]
    wheel = next((tmp_path / "dist").glob("*.whl"))
    names = zipfile.ZipFile(wheel).namelist()
    for dashboard in cli.DASHBOARDS:
        assert any(n.endswith(f"data/share/turbo-workbench/notebooks/{dashboard}")
                   for n in names), dashboard
    assert any(n.startswith("workbench/cases/") and n.endswith(".json") for n in names)
    assert "workbench/data/booster_compressor_readings.csv" in names
    for name in ("conf.json", "index.html.j2"):
        assert f"workbench/served/voila/templates/{cli.TEMPLATE}/{name}" in names


# ---------------------------------------------------------------------- tokens and hosts
def test_serve_on_all_interfaces_generates_and_prints_a_token(monkeypatch, capsys, tmp_path):
    monkeypatch.setenv("JUPYTER_TOKEN", "from-the-parent-shell")
    tokens = []
    for _ in range(2):
        rc, out = _serve(monkeypatch, capsys, ["serve", "--host", "0.0.0.0", "--no-browser"],
                         tmp_path)
        assert rc == 0
        token = _FakeProcess.env["JUPYTER_TOKEN"]
        tokens.append(token)
        # printed with each address, as Jupyter does (?token=...)
        assert f"/voila/render/compressor.ipynb?token={token}" in out.out
        assert "--Voila.auto_token=True" in _FakeProcess.argv
        assert token not in " ".join(_FakeProcess.argv)  # never on a command line
    # secrets.token_urlsafe(32): 32 random bytes, 43 URL-safe characters, new each time
    assert tokens[0] != tokens[1] and all(len(t) >= 43 for t in tokens)
    assert "from-the-parent-shell" not in tokens


def test_serve_on_all_interfaces_with_a_given_token(monkeypatch, capsys, tmp_path):
    rc, out = _serve(monkeypatch, capsys, ["serve", "--host", "0.0.0.0", "--token",
                                           "my-team-token-42", "--no-browser"], tmp_path)
    assert rc == 0
    assert _FakeProcess.env["JUPYTER_TOKEN"] == "my-team-token-42"
    assert "my-team-token-42" not in out.out  # the user knows it; it is not echoed
    assert "?token=<the token you gave>" in out.out


def test_loopback_stays_token_free_unless_asked(monkeypatch, capsys, tmp_path):
    monkeypatch.setenv("JUPYTER_TOKEN", "from-the-parent-shell")
    rc, out = _serve(monkeypatch, capsys, ["serve", "--no-browser"], tmp_path)
    assert rc == 0
    assert "JUPYTER_TOKEN" not in _FakeProcess.env
    assert "--Voila.auto_token=True" not in _FakeProcess.argv
    assert "?token=" not in out.out
    # --token on loopback: required then
    rc, out = _serve(monkeypatch, capsys, ["serve", "--token", "local-secret-1", "--no-browser"],
                     tmp_path)
    assert rc == 0 and _FakeProcess.env["JUPYTER_TOKEN"] == "local-secret-1"
    assert "--Voila.auto_token=True" in _FakeProcess.argv


@pytest.mark.parametrize("argv, message", [
    (["--token", "short"], "--token"),
    (["--token", "has space in it"], "--token"),
    (["--token", "a/b?c=d&e1234"], "--token"),
    (["--allow-host", "evil.example/x"], "--allow-host"),
    (["--allow-host", "under_score.example"], "--allow-host"),
    (["--pool-size", "-1"], "--pool-size"),
    (["--pool-size", "500"], "--pool-size"),
])
def test_bad_access_options_are_refused(monkeypatch, capsys, tmp_path, argv, message):
    rc, out = _serve(monkeypatch, capsys, ["serve", *argv, "--no-browser"], tmp_path)
    assert rc == 2 and message in out.err


@pytest.mark.parametrize("header, bound, allowed", [
    # loopback addresses and the name localhost are this machine (RFC 6761 section 6.3)
    ("127.0.0.1:8866", "127.0.0.1", True),
    ("localhost:8866", "127.0.0.1", True),
    ("LOCALHOST.:8866", "127.0.0.1", True),
    ("[::1]:8866", "127.0.0.1", True),
    ("127.0.0.2", "127.0.0.1", True),
    # a DNS-rebinding page sends its own name: refused
    ("evil.example:8866", "127.0.0.1", False),
    ("evil.example:8866", "0.0.0.0", False),
    ("localhost.evil.example", "127.0.0.1", False),
    ("", "127.0.0.1", False),
    # an IP literal other than loopback: only the bound address, or any when bound to all
    ("192.0.2.7:8866", "127.0.0.1", False),
    ("192.0.2.7:8866", "192.0.2.7", True),
    ("192.0.2.8:8866", "192.0.2.7", False),
    ("192.0.2.7:8866", "0.0.0.0", True),
    ("[2001:db8::5]:8866", "::", True),
    ("dashboards.plant.example:8866", "0.0.0.0", True),  # given with --allow-host
    ("198.51.100.9:8866", "192.0.2.7", True),  # an address given with --allow-host (NAT)
])
def test_host_header_rule(header, bound, allowed):
    extra = {"0.0.0.0": ["dashboards.plant.example"], "192.0.2.7": ["198.51.100.9"]}
    names = cli.host_names(bound, extra.get(bound, []))
    assert cli.host_allowed(header, bound, names) is allowed


def test_host_names():
    assert cli.host_names("127.0.0.1") == ["localhost"]
    assert cli.host_names("myhost.example", ["Other.Example."]) == [
        "localhost", "myhost.example", "other.example"]
    every = cli.host_names("0.0.0.0")
    import socket
    assert socket.gethostname().lower() in every


# ---------------------------------------------------------------------- live servers
def _free_port() -> int:
    import socket
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture
def live(tmp_path):
    """Start ``python -m workbench serve ...`` (no kernels pre-started); stop it after."""
    import os
    import pathlib
    started = []
    root = pathlib.Path(cli.__file__).resolve().parents[1]

    def start(*argv):
        port = _free_port()
        log = tmp_path / f"serve-{port}.txt"
        env = {**os.environ, "PYTHONPATH": str(root)}
        env.pop("JUPYTER_TOKEN", None)
        with open(log, "w") as out:
            process = subprocess.Popen(
                [sys.executable, "-m", "workbench", "serve", "--port", str(port),
                 "--pool-size", "0", "--no-browser", *argv],
                stdout=out, stderr=subprocess.STDOUT, env=env, cwd=str(root))
        started.append(process)
        assert cli.wait_for_port(port, "127.0.0.1", timeout=180, process=process), \
            log.read_text()[-3000:]
        return port, log

    yield start
    for process in started:
        cli.stop_process(process, timeout=60)


class _Response:
    def __init__(self, status, headers):
        self.status_code, self.headers = status, headers


def _get(port, path, host=None, headers=None):
    """GET from 127.0.0.1 (http.client: the Host header is sent exactly as given)."""
    import http.client
    connection = http.client.HTTPConnection("127.0.0.1", port, timeout=120)
    try:
        connection.request("GET", path, headers={"Host": host or f"127.0.0.1:{port}",
                                                 **(headers or {})})
        response = connection.getresponse()
        response.read()
        return _Response(response.status, dict(response.getheaders()))
    finally:
        connection.close()


def _refused(response) -> bool:
    # jupyter_server: 403, or a redirect to its login page for a page that needs login
    return response.status_code == 403 or (
        response.status_code in (302, 303) and "/login" in response.headers.get("Location", ""))


@pytest.mark.slow
def test_live_loopback_with_a_token(live):
    port, _ = live("--token", "test-token-1234")
    assert _refused(_get(port, "/"))
    assert _refused(_get(port, "/voila/render/compressor.ipynb"))
    assert _refused(_get(port, "/?token=wrong-token-5678"))
    assert _get(port, "/?token=test-token-1234").status_code == 200
    assert _get(port, "/", headers={"Authorization": "token test-token-1234"}).status_code == 200
    # the same token but a Host that is not this server (DNS rebinding): refused
    assert _get(port, "/?token=test-token-1234", host=f"evil.example:{port}").status_code == 403
    assert _get(port, "/?token=test-token-1234", host=f"192.0.2.7:{port}").status_code == 403
    assert _get(port, "/?token=test-token-1234", host=f"localhost:{port}").status_code == 200


@pytest.mark.slow
def test_live_loopback_default_is_token_free_but_checks_the_host(live):
    port, log = live()
    assert _get(port, "/").status_code == 200
    assert _get(port, "/", host=f"localhost:{port}").status_code == 200
    assert _get(port, "/", host=f"evil.example:{port}").status_code == 403
    assert "?token=" not in log.read_text()
    # the kernel websocket (what drives the widgets) checks the Host too
    upgrade = {"Upgrade": "websocket", "Connection": "Upgrade", "Sec-WebSocket-Version": "13",
               "Sec-WebSocket-Key": "dGhlIHNhbXBsZSBub25jZQ=="}
    channels = "/api/kernels/00000000-0000-0000-0000-000000000000/channels"
    assert _get(port, channels, host=f"evil.example:{port}", headers=upgrade).status_code == 403
    assert _get(port, channels, headers=upgrade).status_code != 403


@pytest.mark.slow
def test_live_all_interfaces_requires_the_printed_token(live):
    # bound to every interface; requests are sent to 127.0.0.1 only
    port, log = live("--host", "0.0.0.0", "--allow-host", "dashboards.plant.example")
    import re
    token = re.search(r"\?token=([A-Za-z0-9_-]+)", log.read_text()).group(1)
    assert _refused(_get(port, "/"))
    assert _get(port, f"/?token={token}").status_code == 200
    # any address of this machine written as an IP literal, and the names allowed
    assert _get(port, f"/?token={token}", host=f"192.0.2.7:{port}").status_code == 200
    assert _get(port, f"/?token={token}",
                host=f"dashboards.plant.example:{port}").status_code == 200
    assert _get(port, f"/?token={token}", host=f"evil.example:{port}").status_code == 403


def test_importing_the_main_module_runs_nothing(monkeypatch):
    # Python's own rule (runpy): a module's "if __name__ == '__main__'" block runs only when
    # the module is executed.  Tools that import every module (pkgutil walks, doc builders)
    # must not start the command line, which would read their own sys.argv and exit.
    import importlib

    monkeypatch.setattr(sys, "argv", ["pytest", "--not-a-workbench-option"])
    sys.modules.pop("workbench.__main__", None)
    module = importlib.import_module("workbench.__main__")
    assert module.main is cli.main
