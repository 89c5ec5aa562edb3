"""Printouts as PDF files, through headless Chromium when it is installed.

``print_pages`` (called by ``builder.pipeline.print_catalog``, which builds the site into a
temporary folder first) prints every datasheet, every shelf-card page and every store sheet once per paper size
(A4, US Letter) with ``chromium --headless --print-to-pdf``.  The paper size is chosen by
a small stylesheet (``assets/paper-<size>.css``) linked into a copy of each page, since
the command line honours the page's own ``@page`` size.  Like the site, the PDFs are
written to a temporary folder and swapped into place only when all succeeded.
"""
from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

PAPERS = ("a4", "letter")
CHROMIUM_NAMES = ("chromium", "chromium-browser")
CHROMIUM_FLAGS = ("--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
                  "--disable-component-update", "--disable-sync", "--no-first-run", "--no-pdf-header-footer",
                  "--run-all-compositor-stages-before-draw")


class PrintError(RuntimeError):
    """Printing could not be done; the message says why and what to do."""


def find_chromium() -> str | None:
    """The Chromium to print with: $COHESION_CHROMIUM, else chromium on the PATH."""
    override = os.environ.get("COHESION_CHROMIUM")
    if override:
        return override if Path(override).exists() else None
    for name in CHROMIUM_NAMES:
        found = shutil.which(name)
        if found:
            return found
    return None


def printable_pages(site: Path) -> list[str]:
    """Site paths of every page that has a printout, in a stable order."""
    pages = []
    for folder in ("materials", "cards", "stores"):
        pages += sorted(f"{folder}/{p.name}" for p in (site / folder).glob("*.html") if ".print-" not in p.name)
    return pages


def _variant(site: Path, page: str, paper: str) -> Path:
    """A copy of ``page`` that links the paper-size stylesheet (next to it, so links still work)."""
    source = site / page
    depth = page.count("/")
    link = f'<link rel="stylesheet" href="{"../" * depth}assets/paper-{paper}.css">'
    html = source.read_text(encoding="utf-8").replace("</head>", f"{link}\n</head>", 1)
    target = source.with_name(f"{source.stem}.print-{paper}.html")
    target.write_text(html, encoding="utf-8", newline="\n")
    return target


def _print_one(chromium: str, work: Path, page: Path, pdf: Path) -> None:
    pdf.parent.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory(dir=work, prefix="profile-") as profile:  # one browser profile per run
        cmd = [chromium, *CHROMIUM_FLAGS, f"--user-data-dir={profile}", f"--print-to-pdf={pdf}", page.as_uri()]
        result = subprocess.run(cmd, capture_output=True, text=True, timeout=120)
    if result.returncode != 0 or not pdf.exists():
        raise PrintError(f"chromium could not print {page.name}: {result.stderr.strip()[-300:]}")


def find_chromium_or_fail() -> str:
    chromium = find_chromium()
    if chromium is None:
        raise PrintError("headless Chromium was not found: install it (e.g. 'apt-get install chromium') "
                         "or set COHESION_CHROMIUM to its path; the HTML printouts in the built site "
                         "print from any browser")
    return chromium


def print_pages(chromium: str, work: Path, site: Path, pdf_root: Path, papers=PAPERS, jobs: int = 2) -> None:
    """Print every printable page of the built ``site`` once per paper into ``pdf_root/<paper>/``."""
    tasks = []
    for paper in papers:
        for page in printable_pages(site):
            pdf = pdf_root / paper / page.replace(".html", ".pdf")
            tasks.append((_variant(site, page, paper), pdf))
    with ThreadPoolExecutor(max_workers=jobs) as pool:
        futures = [pool.submit(_print_one, chromium, work, page, pdf) for page, pdf in tasks]
        for future in futures:
            future.result()
