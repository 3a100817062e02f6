"""The built wheel works installed, from any directory, without the checkout."""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PROJECT = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
# Wheel file names carry the distribution name normalised (PEP 427, PEP 503).
WHEEL_NAME = PROJECT["project"]["name"].replace("-", "_").replace(".", "_").lower()


@pytest.fixture(scope="module")
def installed(tmp_path_factory: pytest.TempPathFactory) -> Path:
    build = tmp_path_factory.mktemp("wheel")
    subprocess.run(
        [
            sys.executable,
            "-m",
            "pip",
            "wheel",
            "--no-deps",
            "--no-build-isolation",
            "-q",
            "-w",
            str(build),
            str(ROOT),
        ],
        check=True,
        capture_output=True,
        timeout=300,
    )
    wheel = next(build.glob(f"{WHEEL_NAME}-*.whl"))
    site = build / "site"
    subprocess.run(
        [
            sys.executable,
            "-m",
            "pip",
            "install",
            "--no-deps",
            "-q",
            "--target",
            str(site),
            str(wheel),
        ],
        check=True,
        capture_output=True,
        timeout=300,
    )
    return site


def _run(site: Path, cwd: Path, *args: str) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "PYTHONPATH": str(site), "NO_COLOR": "1"}
    return subprocess.run(
        [sys.executable, "-m", "netcheck", *args],
        cwd=cwd,
        env=env,
        capture_output=True,
        text=True,
        timeout=120,
    )


def test_wheel_carries_grammar_rules_and_schema(installed: Path) -> None:
    data = installed / "netcheck" / "_data"
    assert (data / "grammar" / "cnet.lark").is_file()
    assert sorted(p.name for p in (data / "rules").glob("*.yaml"))
    assert (installed / "netcheck" / "schema" / "parts.schema.json").is_file()


def test_wheel_carries_typing_marker_schemas_and_licence(installed: Path) -> None:
    assert (installed / "netcheck" / "py.typed").is_file()
    shipped = {p.name for p in (installed / "netcheck" / "schema").glob("*.json")}
    assert shipped >= {
        f"{name}.schema.json"
        for name in ("findings", "inspect", "size", "baseline", "config", "parts")
    }
    [info] = installed.glob(f"{WHEEL_NAME}-*.dist-info")
    licences = [p for p in info.rglob("LICENSE*") if p.is_file()]
    assert licences and "MIT License" in licences[0].read_text(encoding="utf-8")
    metadata = (info / "METADATA").read_text(encoding="utf-8")
    assert f"Name: {PROJECT['project']['name']}" in metadata
    assert "Classifier: License :: OSI Approved :: MIT License" in metadata


def test_installed_wheel_checks_a_sample_from_elsewhere(
    installed: Path, tmp_path: Path
) -> None:
    shutil.copytree(ROOT / "sample_nets" / "machine-24v", tmp_path / "design")
    where = _run(installed, tmp_path, "--version")
    assert where.returncode == 0
    probe = subprocess.run(
        [sys.executable, "-c", "import netcheck; print(netcheck.__file__)"],
        cwd=tmp_path,
        env={**os.environ, "PYTHONPATH": str(installed)},
        capture_output=True,
        text=True,
        check=True,
    )
    assert probe.stdout.startswith(str(installed))  # not the checkout
    result = _run(installed, tmp_path, "check", "design", "--format", "json")
    assert result.returncode == 1, result.stderr
    report = json.loads(result.stdout)
    assert {f["rule"] for f in report["findings"]} >= {"inductive-load-unsuppressed"}
    assert _run(installed, tmp_path, "rules").returncode == 0
