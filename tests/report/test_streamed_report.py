"""Reports written in pieces equal the rendered text, byte for byte.

``check`` writes its report through the streaming writers (``write_json``,
``write_sarif``, ``write_plain``) so that a heavy report is never held as one
string; what a file or standard output receives must be exactly the text
``render_*`` returns. The chunk size is made tiny here so that every report is
cut into many pieces, at every kind of boundary.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from netcheck.catalogue import load_catalogue
from netcheck.cli.formats import FORMATS
from netcheck.cli.output import Terminal
from netcheck.pipeline import check_path
from netcheck.report import Report
from netcheck.report import json as json_report
from netcheck.report.json import render_json, write_json
from netcheck.report.sarif import render_sarif, write_sarif
from netcheck.report.text import render_plain, write_plain

ROOT = Path(__file__).resolve().parents[2]
SAMPLES = sorted(p.parent for p in (ROOT / "sample_nets").glob("*/expect.yaml"))
PLAIN = Terminal(False, False, 100)


def _pieces(write, *args, **style) -> list[str]:
    pieces: list[str] = []
    write(*args, pieces.append, **style)
    return pieces


@pytest.fixture
def tiny_chunks(monkeypatch):
    monkeypatch.setattr(json_report.Spill, "LIMIT", 3)


def _sample_report() -> Report:
    findings, files = [], []
    for folder in SAMPLES:
        result = check_path(folder / f"{folder.name}.cnet")
        findings += result.findings
        files += result.files
    return Report.build(findings, files)


def test_json_in_pieces_is_the_rendered_text(report, catalogue, tiny_chunks):
    pieces = _pieces(write_json, report, catalogue)
    assert len(pieces) > 3  # really written in chunks
    assert "".join(pieces) == render_json(report, catalogue)


def test_sarif_in_pieces_is_the_rendered_text(report, catalogue, tiny_chunks):
    pieces = _pieces(write_sarif, report, catalogue)
    assert len(pieces) > 3
    assert "".join(pieces) == render_sarif(report, catalogue)


@pytest.mark.parametrize("style", [{}, {"details": True}, {"quiet": True}])
def test_plain_text_in_pieces_is_the_rendered_text(report, style):
    assert "".join(_pieces(write_plain, report, **style)) == render_plain(
        report, **style
    )


def test_plain_text_of_many_findings_comes_in_several_chunks(report, findings):
    copies = [
        f.__class__(**{**f.__dict__, "element": f"K{i}"})
        for i in range(3000)
        for f in findings[:2]
    ]
    many = Report.build(copies)
    pieces = _pieces(write_plain, many, details=True)
    assert len(pieces) > 1
    assert "".join(pieces) == render_plain(many, details=True)


def test_empty_report_in_pieces(catalogue, tiny_chunks):
    empty = Report.build([])
    assert "".join(_pieces(write_json, empty, catalogue)) == render_json(
        empty, catalogue
    )
    assert "".join(_pieces(write_sarif, empty, catalogue)) == render_sarif(
        empty, catalogue
    )


@pytest.mark.parametrize("name", sorted(FORMATS))
def test_every_format_writes_what_it_renders_on_the_samples(name, tiny_chunks):
    report, catalogue = _sample_report(), load_catalogue()
    assert any(f.edits for f in report.findings)  # fixes and edits in the text
    form = FORMATS[name]
    pieces: list[str] = []
    form.write(report, catalogue, PLAIN, pieces.append, details=True, quiet=False)
    assert "".join(pieces) == form.render(
        report, catalogue, PLAIN, details=True, quiet=False
    )
