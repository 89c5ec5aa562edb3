"""Worker processes that end with the build that started them.

Deriving and writing run in pools of forked processes. If the build is killed (``kill -9``, the
machine's out-of-memory killer), its workers must not live on: an orphan still holds the output
folder's lock that it inherited (the next build would wait for it forever) and may still be
writing into the killed build's temporary folder. On Linux each worker asks the kernel to kill it
when its parent dies (``prctl(PR_SET_PDEATHSIG, SIGKILL)``), and exits at once if the parent is
already gone; elsewhere workers end when they next find their task queue closed.
"""
from __future__ import annotations

import gc
import multiprocessing
import os
import signal
import sys
from concurrent.futures import ProcessPoolExecutor

_PR_SET_PDEATHSIG = 1


def _end_with(parent: int) -> None:
    gc.enable()  # the parent may have paused its collector while it read the cache (pipeline.build)
    if sys.platform.startswith("linux"):
        try:
            import ctypes

            ctypes.CDLL(None, use_errno=True).prctl(_PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0)
        except (OSError, AttributeError):  # no libc to ask: the queue check below still applies
            pass
    if os.getppid() != parent:  # the build ended before the request above took effect
        os._exit(1)


def fork_pool(workers: int) -> ProcessPoolExecutor:
    """A pool of ``workers`` forked processes, each ended when this process ends."""
    return ProcessPoolExecutor(max_workers=workers, mp_context=multiprocessing.get_context("fork"),
                               initializer=_end_with, initargs=(os.getpid(),))
