"""The team server (``python -m solutions serve``): a front that keeps each browser on one
of several page servers. Checked by what a browser sees: the cookie that keeps it on its
server, pages through the front's websocket, and a pasted recipe whose downloaded CSV
(a file held by one page server) equals the library's own evaluation."""
import asyncio
import os
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

import bench_load
from solutions.cli import main
from solutions.report import summary_csv
from solutions.ui.serve import COOKIE, Front, Worker, _content_length, _set_header
from test_browser import (CHROMIUM, FLAGS, ROWS, _library_dict, _need_browser,  # noqa: F401
                          _paste_recipe, chromium_browser)

ROOT = Path(__file__).resolve().parents[1]


# ------------------------------------------------------------------ the front's rules
def test_cookie_keeps_a_browser_on_its_server():
    front = Front([Worker(1), Worker(2), Worker(3)])
    head = b"GET / HTTP/1.1\r\nHost: x\r\nCookie: a=1; " + COOKIE.encode() + b"=2\r\n\r\n"
    assert front.pick(head) == (2, True)


def test_new_browser_goes_to_the_least_busy_server():
    front = Front([Worker(1, open_pages=3), Worker(2, open_pages=1), Worker(3, open_pages=2)])
    assert front.pick(b"GET / HTTP/1.1\r\nHost: x\r\n\r\n") == (1, False)
    # a cookie naming a server that is not there (an older front) is not trusted
    stale = b"GET / HTTP/1.1\r\nCookie: " + COOKIE.encode() + b"=7\r\n\r\n"
    assert front.pick(stale) == (1, False)


def test_request_heads():
    head = b"GET / HTTP/1.1\r\nHost: x\r\nConnection: keep-alive\r\nContent-Length: 12\r\n\r\n"
    out = _set_header(head, b"Connection", b"close")
    assert out.startswith(b"GET / HTTP/1.1\r\n") and out.endswith(b"\r\n\r\n")
    assert b"keep-alive" not in out and out.count(b"Connection: close") == 1
    assert _content_length(out) == 12
    with pytest.raises(ValueError, match="chunked"):
        _content_length(b"PUT /x HTTP/1.1\r\nTransfer-Encoding: chunked\r\n\r\n")


@pytest.mark.parametrize("args, word", [(["--workers", "0"], "1 to 8"),
                                        (["--workers", "2.5"], "1 to 8"),
                                        (["--workers", "NaN"], "--workers"),
                                        (["--port", "70000"], "1 to 65535")])
def test_bad_options_are_refused(args, word, capsys):
    assert main(["serve", *args]) == 2
    assert word in capsys.readouterr().err


# ------------------------------------------------------------------ a running front
@pytest.fixture(scope="module")
def front(tmp_path_factory):
    port = bench_load.free_port()
    log_path = tmp_path_factory.mktemp("serve") / "serve.log"
    log = open(log_path, "w")
    proc = subprocess.Popen([sys.executable, "-m", "solutions", "serve", "--workers", "2",
                             "--port", str(port)], cwd=ROOT, stdout=log,
                            stderr=subprocess.STDOUT)
    url = f"http://127.0.0.1:{port}"
    try:
        deadline = time.monotonic() + 120
        while True:
            try:
                with urllib.request.urlopen(url + "/_stcore/health", timeout=2) as r:
                    if r.status == 200:
                        break
            except OSError:
                if proc.poll() is not None or time.monotonic() > deadline:
                    log.flush()
                    raise RuntimeError("the team server did not start:\n"
                                       + log_path.read_text()) from None
                time.sleep(0.3)
        yield port, url
    finally:
        proc.terminate()
        try:
            proc.wait(20)
        except subprocess.TimeoutExpired:
            proc.kill()
        log.close()
    assert "Traceback" not in log_path.read_text(), log_path.read_text()
    assert proc.returncode == 0, log_path.read_text()


def test_first_answer_sets_the_cookie_and_later_ones_keep_it(front):
    _, url = front
    with urllib.request.urlopen(url + "/") as r:
        cookie = r.headers["Set-Cookie"]
        page = r.read()
    assert cookie.startswith(f"{COOKIE}=") and "HttpOnly" in cookie
    assert b"<html" in page.lower()
    chosen = cookie.split(";")[0]
    req = urllib.request.Request(url + "/", headers={"Cookie": chosen})
    with urllib.request.urlopen(req) as r:
        assert r.headers["Set-Cookie"] is None and r.read() == page


def test_a_chunked_request_body_is_refused_plainly(front):
    """The front passes bodies on by their length; a chunked body (which browsers do not
    send to this page) gets 411 rather than a dropped connection."""
    import socket
    port, _ = front
    with socket.create_connection(("127.0.0.1", port), timeout=10) as s:
        s.sendall(b"POST /x HTTP/1.1\r\nHost: 127.0.0.1\r\nTransfer-Encoding: chunked\r\n\r\n"
                  b"0\r\n\r\n")
        assert s.recv(200).startswith(b"HTTP/1.1 411 ")


def test_pages_through_the_front_follow_their_edits(front):
    port, _ = front

    async def two_sessions():
        first, lat = await bench_load.drive(port, 2, 2, 120)
        return first, lat

    first, lat = _in_thread(two_sessions())   # drive() checks each page shows its edit
    assert len(first) == 2 and len(lat) == 4


def test_browser_through_the_front_downloads_the_csv(front, chromium_browser, tmp_path):
    """A pasted recipe's CSV, a file held by the page server the browser was kept on."""
    _, url = front
    ctx = chromium_browser.new_context(viewport={"width": 1400, "height": 1800},
                                       accept_downloads=True)
    ctx.grant_permissions(["clipboard-read", "clipboard-write"], origin=url)
    page = ctx.new_page()
    page.set_default_timeout(60_000)
    try:
        page.goto(url + "/")
        page.wait_for_selector("[data-testid=stMetric]")
        assert any(c["name"] == COOKIE for c in ctx.cookies())
        _paste_recipe(page)
        with page.expect_download() as dl:
            page.get_by_role("button", name="Summary table (CSV)").click()
        path = tmp_path / "summary.csv"
        dl.value.save_as(path)
        assert path.read_bytes().decode("utf-8") == summary_csv(_library_dict())
        assert not page.locator("[data-testid=stException]").count()
    finally:
        ctx.close()


def test_a_page_server_that_stops_is_started_again(front):
    """Both page servers killed: the front starts them again on their ports and pages
    through it work once more."""
    import signal
    port, url = front
    serve_pid = next(p for p in _children(os.getpid())
                     if f"--port {port}" in Path(f"/proc/{p}/cmdline").read_text()
                     .replace("\0", " "))
    workers = _children(serve_pid)
    assert len(workers) == 2
    for p in workers:
        os.kill(p, signal.SIGKILL)
    deadline = time.monotonic() + 120
    while True:
        try:
            with urllib.request.urlopen(url + "/_stcore/health", timeout=2) as r:
                if r.status == 200 and len(_children(serve_pid)) == 2:
                    break
        except OSError:
            pass
        assert time.monotonic() < deadline, "the page servers were not started again"
        time.sleep(0.5)
    assert set(_children(serve_pid)).isdisjoint(workers)
    first, lat = _in_thread(bench_load.drive(port, 2, 1, 120))
    assert len(lat) == 2


def _in_thread(coro):
    """Run ``coro`` on its own event loop in another thread (the browser tests' driver
    keeps a loop running in this one)."""
    from concurrent.futures import ThreadPoolExecutor
    with ThreadPoolExecutor(1) as pool:
        return pool.submit(asyncio.run, coro).result()


def _children(pid: int) -> list[int]:
    return [int(c) for t in Path(f"/proc/{pid}/task").glob("*/children")
            for c in t.read_text().split()]
