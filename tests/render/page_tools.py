"""Tools the HTML report tests share: a small HTML parser and a headless
Chromium runner (Debian's ``chromium`` package; tests using it skip, saying
why, when it is missing)."""

from __future__ import annotations

import re
import shutil
import subprocess
from html.parser import HTMLParser
from pathlib import Path

import pytest


class Elements(HTMLParser):
    """Every start tag with its attributes, and the text outside tags."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.tags: list[tuple[str, dict]] = []
        self.text: list[str] = []
        self._in_title = False
        self.title = ""

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))
        self._in_title = tag == "title" and not any(t == "svg" for t, _ in self.tags[:-1])

    def handle_endtag(self, tag):
        if tag == "title":
            self._in_title = False

    def handle_data(self, data):
        self.text.append(data)
        if self._in_title and not self.title:
            self.title = data


def parse_page(page: str) -> Elements:
    p = Elements()
    p.feed(page)
    return p


def yaml_quote(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
needs_chromium = pytest.mark.skipif(
    CHROMIUM is None,
    reason="Chromium not found (Debian package 'chromium'; .ci/run installs it when run as root): "
           "browser tests skipped")
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--hide-scrollbars"]
# Chromium logs each console message (errors, CSP refusals, uncaught exceptions)
# as "...:INFO:CONSOLE:12] ..." or, in older builds, "...:INFO:CONSOLE(12)] ...".
CONSOLE = re.compile(r":CONSOLE[:(]")


def run_chromium(page: Path, tmp_path: Path, *args: str) -> subprocess.CompletedProcess:
    profile = tmp_path / f"profile-{len(list(tmp_path.glob('profile-*')))}"
    return subprocess.run([CHROMIUM, *FLAGS, f"--user-data-dir={profile}", *args, page.as_uri()],
                          capture_output=True, text=True, timeout=90)


def console_lines(result: subprocess.CompletedProcess) -> list[str]:
    return [line for line in result.stderr.splitlines() if CONSOLE.search(line)]


def assert_loads_cleanly_and_draws(page: Path, tmp_path: Path, size: str) -> None:
    """Open ``page`` at window ``size`` ("1366,768"): no console message (errors,
    CSP refusals, uncaught exceptions), and a screenshot that is not blank."""
    from matplotlib.image import imread

    shot = tmp_path / "shot.png"
    result = run_chromium(page, tmp_path, "--enable-logging=stderr", "--v=0",
                          f"--window-size={size}", f"--screenshot={shot}")
    assert console_lines(result) == []
    pixels = imread(shot)
    width, height = (int(v) for v in size.split(","))
    assert pixels.shape[:2] == (height, width)
    grey = pixels[..., :3].mean(axis=2)
    # Not blank: the paper colour covers most of the page, but text, rules,
    # panels and tables leave a clear spread of darker pixels.
    assert grey.std() > 0.05
    assert (grey < 0.5).mean() > 0.005
