"""The site in a real browser: Debian's Chromium driven by Playwright (no browser download).

Opened both from file:// and from a localhost http.server: search as you type, sort and
filter the table, follow a cross-link, crawl every page for broken internal links, and
fail on any console error or any request that leaves the site's own files.

The ``browser`` fixture (tests/conftest.py) skips when Chromium or Playwright is missing,
unless COHESION_REQUIRE_BROWSER is set (as .ci/run does): then their absence fails the run.
"""
from __future__ import annotations

import threading
from functools import partial
from http.server import SimpleHTTPRequestHandler, ThreadingHTTPServer
from urllib.parse import urldefrag, urljoin

import pytest
from conftest import DEMO

from builder.pipeline import build

pytestmark = pytest.mark.browser


class _Quiet(SimpleHTTPRequestHandler):
    def log_message(self, *args):
        pass


@pytest.fixture(scope="module")
def site(tmp_path_factory):
    out = tmp_path_factory.mktemp("browser") / "site"
    build(DEMO, out)
    return out


@pytest.fixture(scope="module")
def server(site):
    httpd = ThreadingHTTPServer(("127.0.0.1", 0), partial(_Quiet, directory=str(site)))
    thread = threading.Thread(target=httpd.serve_forever, daemon=True)
    thread.start()
    yield f"http://127.0.0.1:{httpd.server_address[1]}/"
    httpd.shutdown()


@pytest.fixture(params=["file", "http"])
def root(request, site, server):
    return site.as_uri() + "/" if request.param == "file" else server


class Watch:
    """Collects console errors, page errors and requests outside the site."""

    def __init__(self, page, root: str):
        self.problems: list[str] = []
        page.on("pageerror", lambda exc: self.problems.append(f"page error: {exc}"))
        page.on("console", lambda msg: msg.type == "error" and self.problems.append(f"console: {msg.text}"))
        page.on("request", lambda req: None if req.url.startswith(root) else self.problems.append(
            f"request outside the site: {req.url}"))


@pytest.fixture
def page(browser, root):
    context = browser.new_context()
    pg = context.new_page()
    watch = Watch(pg, root)
    yield pg, watch
    context.close()
    assert watch.problems == []


def test_search_finds_a_material_by_synonym(page, root):
    pg, _ = page
    pg.goto(root + "materials/acetone.html")
    box = pg.locator("#search-input")
    box.fill("toluol")  # a synonym of toluene
    results = pg.locator("#search-results a")
    results.first.wait_for()
    assert results.count() == 1 and results.first.inner_text() == "Toluene"
    assert "synonym" in pg.locator("#search-results li").first.inner_text()
    results.first.click()
    pg.wait_for_load_state()
    assert pg.url.endswith("materials/toluene.html")
    assert pg.locator("h1").inner_text() == "Toluene"


@pytest.mark.parametrize("query, expected", [("HM-S-007", "Toluene"), ("108-88-3", "Toluene"),
                                             ("C7H8", "Toluene"), ("LFQSCWFLJHTTHZ", "Ethanol")])
def test_search_by_code_cas_formula_and_inchikey(page, root, query, expected):
    pg, _ = page
    pg.goto(root + "index.html")
    pg.locator("#search-input").fill(query)
    pg.locator("#search-results a").first.wait_for()
    assert expected in pg.locator("#search-results a").all_inner_texts()


def test_table_sorts_and_filters(page, root):
    pg, _ = page
    pg.goto(root + "index.html")
    rows = pg.locator("#materials tbody tr")
    total = rows.count()
    # sort by boiling point, ascending: the first row boils lowest (the column found by its header)
    headers = [h.strip() for h in pg.locator("#materials thead th").all_inner_texts()]
    n = headers.index("Boiling point")
    pg.locator(f"#materials thead th:nth-child({n + 1}) button").click()
    sorts = [rows.nth(i).locator("td").nth(n).get_attribute("data-sort") for i in range(total)]
    numbers = [float(v) for v in sorts if v]
    assert numbers == sorted(numbers) and numbers[0] < numbers[-1]
    assert pg.locator(f"#materials thead th:nth-child({n + 1})").get_attribute("aria-sort") == "ascending"
    # filter by dominant force: only hydrogen-bonding rows stay visible
    pg.select_option("select[data-filter='force']", "hydrogen-bonding")
    visible = pg.locator("#materials tbody tr:not([hidden])")
    assert 0 < visible.count() < total
    for i in range(visible.count()):
        assert visible.nth(i).get_attribute("data-force") == "hydrogen-bonding"
    assert pg.locator("#table-count").inner_text().startswith(f"{visible.count()} of {total}")


def test_text_filter_searches_the_stores_and_every_shown_word(page, root):
    pg, _ = page
    pg.goto(root + "index.html")
    rows = pg.locator("#materials tbody tr")
    total = rows.count()
    box = pg.locator("input[data-filter-text]")
    headers = [h.strip() for h in pg.locator("#materials thead th").all_inner_texts()]
    for query, header in (("solvent bunker", "Stores"), ("cold room", "Stores"), ("hydrogen bonding", "Dominant force")):
        column = headers.index(header)
        box.fill(query)
        visible = pg.locator("#materials tbody tr:not([hidden])")
        assert 0 < visible.count() < total, query
        for i in range(visible.count()):
            assert query in visible.nth(i).locator("td").nth(column).inner_text().lower(), query
    box.fill("")
    assert pg.locator("#materials tbody tr:not([hidden])").count() == total


def test_cross_link_leads_to_the_isomer(page, root):
    pg, _ = page
    pg.goto(root + "materials/cis-1-2-dichloroethene.html")
    link = pg.locator("a[data-relation='isomer']").first
    assert link.inner_text() == "trans-1,2-Dichloroethene"
    link.click()
    pg.wait_for_load_state()
    assert pg.locator("h1").inner_text() == "trans-1,2-Dichloroethene"
    back = pg.locator("a[data-relation='isomer']").first
    assert back.inner_text() == "cis-1,2-Dichloroethene"


def test_pages_work_without_javascript(browser, root):
    context = browser.new_context(java_script_enabled=False)
    pg = context.new_page()
    pg.goto(root + "index.html")
    assert pg.locator("#materials tbody tr").count() >= 12
    assert pg.locator("#site-search").is_hidden()
    context.close()


def test_crawl_every_page_no_broken_links(page, root, site):
    pg, _ = page
    pages: dict[str, set[str]] = {}  # loaded page url -> ids on it
    wanted: list[tuple[str, str, str]] = []  # (from page, target url, anchor)
    queue = [root + "index.html"]
    while queue:
        url = queue.pop()
        if url in pages:
            continue
        response = pg.goto(url)
        assert response is None or response.ok, url
        pages[url] = set(pg.eval_on_selector_all("[id]", "els => els.map(e => e.id)"))
        refs = pg.eval_on_selector_all("a[href], img[src], link[href], script[src]",
                                       "els => els.map(e => e.getAttribute('href') || e.getAttribute('src'))")
        for ref in refs:
            target, anchor = urldefrag(urljoin(url, ref))
            assert target.startswith(root), f"{url} links outside the site: {ref}"
            wanted.append((url, target, anchor))
            if target.endswith(".html"):
                queue.append(target)
    for source, target, anchor in wanted:
        if target.endswith(".html"):
            assert not anchor or anchor in pages[target], f"{source}: no #{anchor} in {target}"
        else:
            assert (site / target[len(root):]).is_file(), f"{source}: missing {target}"
    assert len(pages) >= 25
