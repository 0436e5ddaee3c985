"""Tests of the command line (workbench.cli): parsing, the Voila command built, warnings.

Voila is never started here; :func:`workbench.cli.voila_argv` builds the command line and
:func:`workbench.cli.serve` is run with ``subprocess.Popen`` replaced.
"""

from __future__ import annotations

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
                   "--preheat_kernel=True", "--pool_size=2"):
        assert option in argv
    # default host of the function itself is the loopback one
    assert "--Voila.ip=127.0.0.1" in cli.voila_argv(tmp_path)


def test_voila_accepts_the_options_it_is_given(tmp_path):
    """Every ``--name=value`` option built is one that the installed Voila lists."""
    listed = subprocess.run([sys.executable, "-m", "voila", "--help-all"],
                            capture_output=True, text=True, timeout=120).stdout
    for option in cli.voila_argv(tmp_path)[4:]:
        name = option.split("=", 1)[0]
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

    def __init__(self, argv):
        _FakeProcess.argv = argv

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
