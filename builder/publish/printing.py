"""Printouts as PDF files, through headless Chromium when it is installed.

``print_pages`` (called by ``builder.pipeline.print_catalog``, which builds the site into a
temporary folder first) prints every datasheet, every shelf-card page and every store sheet once per paper size
(A4, US Letter) in headless Chromium, a few browsers started once (``cdp.py``).  The paper size is chosen by
a small stylesheet (``assets/paper-<size>.css``) linked into a copy of each page, since
the command line honours the page's own ``@page`` size.  Like the site, the PDFs are
written to a temporary folder and swapped into place only when all succeeded.
"""
from __future__ import annotations

import os
import shutil
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


def find_chromium_or_fail() -> str:
    chromium = find_chromium()
    if chromium is None:
        raise PrintError("headless Chromium was not found: install it (e.g. 'apt-get install chromium') "
                         "or set COHESION_CHROMIUM to its path; the HTML printouts in the built site "
                         "print from any browser")
    return chromium


def print_pages(chromium: str, work: Path, site: Path, pdf_root: Path, papers=PAPERS, jobs: int = 2) -> None:
    """Print every printable page of the built ``site`` once per paper into ``pdf_root/<paper>/``.

    ``jobs`` browsers, each started once and kept for its share of the pages (DevTools
    protocol over a pipe, ``cdp.py``); the order of the pages decides nothing.
    """
    from builder.publish.cdp import Browser, ProtocolError

    tasks = []
    for paper in papers:
        for page in printable_pages(site):
            tasks.append((_variant(site, page, paper), pdf_root / paper / page.replace(".html", ".pdf")))
    if not tasks:
        return
    jobs = max(1, min(jobs, len(tasks)))

    def run(share: list[tuple[Path, Path]], n: int) -> None:
        profile = Path(tempfile.mkdtemp(dir=work, prefix=f"profile-{n}-"))
        try:
            with Browser(chromium, CHROMIUM_FLAGS, profile, start_url=(site / "index.html").as_uri()) as browser:
                for page, pdf in share:
                    browser.print_pdf(page.as_uri(), pdf)
        except (ProtocolError, OSError) as exc:
            raise PrintError(f"chromium could not print: {exc}") from exc
        finally:
            shutil.rmtree(profile, ignore_errors=True)

    with ThreadPoolExecutor(max_workers=jobs) as pool:
        futures = [pool.submit(run, tasks[n::jobs], n) for n in range(jobs)]
        for future in futures:
            future.result()
