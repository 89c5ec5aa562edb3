"""A minimal DevTools-protocol client over Chromium's ``--remote-debugging-pipe``, to print many pages in one browser.

Chromium started with ``--remote-debugging-pipe`` reads protocol commands on file
descriptor 3 and writes replies and events on descriptor 4, each message a JSON object
ended by a NUL byte. This client opens one tab, and for each page navigates to it,
waits for its load event and asks for ``Page.printToPDF``: the same printing as
``--print-to-pdf``, without starting a browser per page. Standard library only.
"""
from __future__ import annotations

import base64
import fcntl
import json
import os
import select
import subprocess
import time
from pathlib import Path


class ProtocolError(RuntimeError):
    """The browser answered with an error, closed the pipe or did not answer in time."""


class Browser:
    """One headless Chromium process driven through the pipe; use as a context manager."""

    def __init__(self, chromium: str, flags: tuple[str, ...], profile: Path, timeout: float = 120.0,
                 start_url: str = "about:blank"):
        #: the tab opens here; navigating within one scheme (file:// to file://) keeps the tab in one
        #: renderer process, while a change of site (about:blank to file://) swaps it and detaches us
        self.start_url = start_url
        self.timeout = timeout
        to_browser_r, self._to_browser = os.pipe()
        self._from_browser, from_browser_w = os.pipe()
        # the child sees the pipes as fds 3 (commands in) and 4 (replies out), placed there by
        # ``_dup_to`` after the fork. Not ``pass_fds=(3, 4)``: that makes this process's own fds 3
        # and 4 inheritable in the child before ``_dup_to`` runs, and where they are not open (a
        # plain ``cohesion print``) the child fails with EBADF. ``close_fds=False`` is safe: Python
        # opens every file and pipe not inheritable (PEP 446), so the browser inherits only 0-4.
        # The browser's own log goes to a file: an unread pipe would fill and stall it
        self._log = open(Path(profile) / "chromium.log", "wb")
        self.process = subprocess.Popen(
            [chromium, *flags, f"--user-data-dir={profile}", "--remote-debugging-pipe", "--no-startup-window"],
            stdin=subprocess.DEVNULL, stdout=self._log, stderr=self._log,
            close_fds=False, preexec_fn=_dup_to(to_browser_r, from_browser_w))
        os.close(to_browser_r)
        os.close(from_browser_w)
        self._buffer = b""
        self._next_id = 0
        self._events: list[dict] = []
        self.session: str | None = None

    def __enter__(self) -> Browser:
        try:
            target = self.call("Target.createTarget", {"url": self.start_url})["targetId"]
            self.session = self.call("Target.attachToTarget", {"targetId": target, "flatten": True})["sessionId"]
            self.call("Page.enable", session=self.session)
        except BaseException:
            self.__exit__(None, None, None)
            raise
        return self

    def __exit__(self, *exc) -> None:
        try:
            if self.process.poll() is None:
                self.timeout = min(self.timeout, 10.0)
                self.call("Browser.close")
        except (ProtocolError, OSError, ValueError):
            pass
        try:
            self.process.wait(timeout=10)
        except subprocess.TimeoutExpired:
            self.process.kill()
            self.process.wait()
        for fd in (self._to_browser, self._from_browser):
            try:
                os.close(fd)
            except OSError:
                pass
        self._log.close()

    # -- messages

    def _send(self, message: dict) -> None:
        data = json.dumps(message).encode("utf-8") + b"\0"
        while data:
            written = os.write(self._to_browser, data)
            data = data[written:]

    def _receive(self, deadline: float) -> dict:
        while b"\0" not in self._buffer:
            left = deadline - time.monotonic()
            if left <= 0:
                raise ProtocolError("the browser did not answer in time")
            ready, _, _ = select.select([self._from_browser], [], [], left)
            if not ready:
                continue
            chunk = os.read(self._from_browser, 1 << 20)
            if not chunk:
                raise ProtocolError("the browser closed the connection")
            self._buffer += chunk
        message, self._buffer = self._buffer.split(b"\0", 1)
        return json.loads(message)

    def call(self, method: str, params: dict | None = None, session: str | None = None) -> dict:
        self._next_id += 1
        message = {"id": self._next_id, "method": method, "params": params or {}}
        if session:
            message["sessionId"] = session
        self._send(message)
        deadline = time.monotonic() + self.timeout
        while True:
            reply = self._receive(deadline)
            if reply.get("id") == self._next_id:
                if "error" in reply:
                    raise ProtocolError(f"{method}: {reply['error'].get('message', reply['error'])}")
                return reply.get("result", {})
            if "method" in reply:
                self._events.append(reply)

    def _wait_event(self, name: str) -> dict:
        deadline = time.monotonic() + self.timeout
        while True:
            for i, event in enumerate(self._events):
                if event.get("method") == name and event.get("sessionId") == self.session:
                    return self._events.pop(i)
            self._events.append(self._receive(deadline))

    # -- printing

    def print_pdf(self, url: str, target: Path) -> None:
        """Load ``url`` and write it as a PDF to ``target`` (page size from the page's own ``@page``)."""
        self._events.clear()
        self.call("Page.navigate", {"url": url}, session=self.session)
        self._wait_event("Page.loadEventFired")
        result = self.call("Page.printToPDF", {"printBackground": True, "preferCSSPageSize": True,
                                               "displayHeaderFooter": False}, session=self.session)
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(base64.b64decode(result["data"]))


def _dup_to(commands_in: int, replies_out: int):
    """A function that, in the forked child, puts the two pipe ends on fds 3 and 4, inheritable."""
    def place() -> None:
        # copy both ends above 4 first, in case one already sits on 3 or 4; not with os.dup, whose
        # copy can land on 3 or 4 itself: dup2 onto the same fd does nothing (the fd stays
        # close-on-exec) and closing the copy would then close the fd just placed
        a = fcntl.fcntl(commands_in, fcntl.F_DUPFD, 5)
        b = fcntl.fcntl(replies_out, fcntl.F_DUPFD, 5)
        os.dup2(a, 3)
        os.dup2(b, 4)
        os.close(a)
        os.close(b)
    return place
