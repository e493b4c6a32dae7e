"""The dashboard for a team: several page servers behind one address.

``python -m solutions serve --workers 2 [--port 8501] [--address 127.0.0.1]``

One Streamlit server runs every session's page update in one Python process, so on a
machine with several cores a team's edits wait for one another. This starts ``workers``
Streamlit servers of ``streamlit_app.py`` on free loopback ports and a small front on the
given address that passes each browser to one of them:

* a browser keeps its server: the front's first answer sets a cookie naming the server,
  and every later request with that cookie goes there (a page's session, its uploads and
  its downloads live in one server process);
* a browser without the cookie goes to the server with the fewest open pages;
* a request is passed on as it came (``Connection: close`` towards the server, so one
  connection carries one request); a websocket is joined end to end;
* a page server that stops is started again on its port (its pages reconnect); each
  server's output goes to a log file named at start.

Nothing of the page is changed; the front reads request and response heads only. It is
plain asyncio on loopback ports, without new packages. Stop it with Ctrl-C: the servers
stop with it.
"""
from __future__ import annotations

import asyncio
import os
import re
import signal
import socket
import subprocess
import sys
import tempfile
import time
import urllib.request
from dataclasses import dataclass
from pathlib import Path

#: the cookie that keeps a browser on its server
COOKIE = "workbench_server"
#: the largest request or response head read [bytes]
MAX_HEAD = 64 * 1024
#: the page script, beside the package in a clone
APP = Path(__file__).resolve().parents[2] / "streamlit_app.py"
_CHUNK = 64 * 1024


@dataclass
class Worker:
    """One page server: its loopback port and how many pages it has open."""

    port: int
    proc: subprocess.Popen | None = None
    open_pages: int = 0
    log: Path | None = None


@dataclass
class Front:
    """The front: picks a worker for each request and joins the two connections."""

    workers: list[Worker]

    def pick(self, head: bytes) -> tuple[int, bool]:
        """(index of the worker for a request ``head``, whether the cookie was valid)."""
        m = re.search(rb"(?im)^cookie:.*?\b" + COOKIE.encode() + rb"=(\d+)", head)
        if m is not None:
            i = int(m.group(1))
            if 0 <= i < len(self.workers):
                return i, True
        loads = [w.open_pages for w in self.workers]
        return loads.index(min(loads)), False

    async def handle(self, reader: asyncio.StreamReader, writer: asyncio.StreamWriter):
        try:
            head = await _read_head(reader)
            if head is None:
                return
            i, known = self.pick(head)
            worker = self.workers[i]
            if re.search(rb"(?im)^upgrade:\s*websocket", head) is not None:
                worker.open_pages += 1      # counted at once: the next pick sees it
                try:
                    up_r, up_w = await _connect(worker, writer)
                    if up_r is not None:
                        up_w.write(head)
                        await _join(reader, writer, up_r, up_w)
                finally:
                    worker.open_pages -= 1
                return
            up_r, up_w = await _connect(worker, writer)
            if up_r is None:
                return
            up_w.write(_set_header(head, b"Connection", b"close"))
            length = _content_length(head)
            if length:
                await _copy_exactly(reader, up_w, length)
            await up_w.drain()
            reply = await _read_head(up_r)
            if reply is None:
                return
            reply = _set_header(reply, b"Connection", b"close")
            if not known:
                reply = _add_header(reply, b"Set-Cookie",
                                    f"{COOKIE}={i}; Path=/; SameSite=Strict; "
                                    "HttpOnly".encode())
            writer.write(reply)
            await _copy_to_end(up_r, writer)
            up_w.close()
        except ValueError:      # a request the front does not pass on (a chunked body)
            writer.write(b"HTTP/1.1 411 Length Required\r\nContent-Length: 0\r\n"
                         b"Connection: close\r\n\r\n")
        except (ConnectionError, asyncio.IncompleteReadError, asyncio.LimitOverrunError):
            pass                # a browser that went away, or a head over MAX_HEAD
        finally:
            try:
                writer.close()
            except Exception:  # noqa: BLE001 - already closed by the other side
                pass


async def _connect(worker: Worker, writer):
    """A connection to ``worker``, or (None, None) after answering 502 to the client."""
    try:
        return await asyncio.open_connection("127.0.0.1", worker.port)
    except OSError:
        writer.write(b"HTTP/1.1 502 Bad Gateway\r\nContent-Length: 0\r\n"
                     b"Connection: close\r\n\r\n")
        return None, None


async def _read_head(reader: asyncio.StreamReader) -> bytes | None:
    """The request or response line and headers, with the blank line; None at EOF."""
    try:
        return await reader.readuntil(b"\r\n\r\n")
    except asyncio.IncompleteReadError as exc:
        if not exc.partial:
            return None
        raise


def _content_length(head: bytes) -> int:
    if re.search(rb"(?im)^transfer-encoding:\s*chunked", head):
        raise ValueError("a chunked request body is not passed on")
    m = re.search(rb"(?im)^content-length:\s*(\d+)\s*$", head)
    return int(m.group(1)) if m else 0


def _set_header(head: bytes, name: bytes, value: bytes) -> bytes:
    """``head`` with header ``name`` set to ``value`` (replaced, or added)."""
    lines = head[:-4].split(b"\r\n")
    lines = [ln for ln in lines[1:] if not ln.lower().startswith(name.lower() + b":")]
    first = head.split(b"\r\n", 1)[0]
    return b"\r\n".join([first, *lines, name + b": " + value]) + b"\r\n\r\n"


def _add_header(head: bytes, name: bytes, value: bytes) -> bytes:
    return head[:-2] + name + b": " + value + b"\r\n\r\n"


async def _copy_exactly(reader, writer, n: int) -> None:
    while n > 0:
        data = await reader.read(min(n, _CHUNK))
        if not data:
            raise ConnectionError("the request body ended early")
        writer.write(data)
        await writer.drain()
        n -= len(data)


async def _copy_to_end(reader, writer) -> None:
    while data := await reader.read(_CHUNK):
        writer.write(data)
        await writer.drain()


async def _join(r1, w1, r2, w2) -> None:
    """Copy both ways until either side closes (a websocket, end to end)."""
    async def pump(r, w):
        try:
            await _copy_to_end(r, w)
        finally:
            try:
                w.close()
            except Exception:  # noqa: BLE001
                pass
    await asyncio.gather(pump(r1, w2), pump(r2, w1), return_exceptions=True)


# ------------------------------------------------------------------ starting and stopping
def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def start_worker(port: int, app: Path = APP, log: Path | None = None) -> subprocess.Popen:
    """``streamlit run`` of ``app`` on loopback ``port``; its output goes to ``log``
    (appended) or nowhere."""
    cmd = [sys.executable, "-m", "streamlit", "run", str(app), "--server.port", str(port),
           "--server.address", "127.0.0.1", "--server.headless", "true",
           "--browser.gatherUsageStats", "false"]
    out = open(log, "ab") if log is not None else subprocess.DEVNULL
    try:
        return subprocess.Popen(cmd, cwd=app.parent, stdout=out, stderr=subprocess.STDOUT)
    finally:
        if log is not None:
            out.close()


def wait_healthy(port: int, timeout: float = 90.0) -> bool:
    deadline = time.time() + timeout
    while time.time() < deadline:
        try:
            with urllib.request.urlopen(f"http://127.0.0.1:{port}/_stcore/health",
                                        timeout=2) as r:
                if r.status == 200:
                    return True
        except OSError:
            time.sleep(0.2)
    return False


def stop(workers: list[Worker]) -> None:
    for w in workers:
        if w.proc is not None and w.proc.poll() is None:
            w.proc.terminate()
    for w in workers:
        if w.proc is not None:
            try:
                w.proc.wait(timeout=10)
            except subprocess.TimeoutExpired:
                w.proc.kill()


def serve(workers: int = 2, port: int = 8501, address: str = "127.0.0.1",
          ready=None) -> int:
    """Run the front and ``workers`` page servers until interrupted (see the module).
    ``ready(port)`` is called once everything answers. Returns an exit status."""
    if not APP.is_file():
        print(f"error: the page script {APP} is not there (run from a clone of the "
              "project)", file=sys.stderr)
        return 2
    logs = Path(tempfile.mkdtemp(prefix="workbench-logs-"))
    pool = [Worker(free_port()) for _ in range(workers)]
    for i, w in enumerate(pool):
        w.log = logs / f"page-server-{i}.log"
        w.proc = start_worker(w.port, log=w.log)
    try:
        for w in pool:
            if not wait_healthy(w.port):
                print(f"error: the page server on port {w.port} did not start (see {w.log})",
                      file=sys.stderr)
                return 1
        return asyncio.run(_main(Front(pool), port, address, ready, logs))
    except KeyboardInterrupt:
        return 0
    finally:
        stop(pool)


async def _watch(front: Front, every: float = 5.0) -> None:
    """Start again, on its own port, a page server that has stopped (its pages reconnect
    and start afresh; the others are not touched)."""
    while True:
        await asyncio.sleep(every)
        for w in front.workers:
            if w.proc is not None and w.proc.poll() is not None:
                print(f"page server on port {w.port} stopped (exit {w.proc.returncode}); "
                      f"starting it again (log: {w.log})", file=sys.stderr, flush=True)
                w.proc = start_worker(w.port, log=w.log)


async def _main(front: Front, port: int, address: str, ready, logs: Path | None = None) -> int:
    try:
        server = await asyncio.start_server(front.handle, address, port, limit=MAX_HEAD)
    except OSError as exc:
        print(f"error: cannot listen on {address}:{port} ({exc.strerror})", file=sys.stderr)
        return 2
    stopping = asyncio.Event()
    loop = asyncio.get_running_loop()
    for sig in (signal.SIGINT, signal.SIGTERM):
        try:
            loop.add_signal_handler(sig, stopping.set)
        except (NotImplementedError, RuntimeError):  # pragma: no cover - not on Linux
            pass
    print(f"Solution workbench: http://{'localhost' if address == '127.0.0.1' else address}"
          f":{port}  ({len(front.workers)} page servers; Ctrl-C stops; their logs in "
          f"{logs})", flush=True)
    if ready is not None:
        ready(port)
    watch = asyncio.create_task(_watch(front))
    async with server:
        await stopping.wait()
    watch.cancel()
    return 0


__all__ = ["serve", "Front", "Worker", "COOKIE"]

if __name__ == "__main__":  # pragma: no cover
    sys.exit(serve(int(os.environ.get("WORKERS", "2"))))
