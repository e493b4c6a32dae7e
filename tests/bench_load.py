"""Load benchmark of the dashboard through its own websocket protocol (a script, not a test).

    python tests/bench_load.py [--sessions 1 10 20] [--edits 5] [--timeout 60] [--warm]
                               [--think SECONDS] [--workers K] [--edit temperature|recipe]

Starts ``streamlit run streamlit_app.py`` on a free loopback port (127.0.0.1 only), or
with ``--workers K`` the team server ``python -m solutions serve --workers K`` (K page
servers behind one front, :mod:`solutions.ui.serve`), then
for each N opens N browser-like sessions on ``/_stcore/stream``: each sends the first
run request a browser sends, waits for the page, then makes ``--edits`` edits of the
solution temperature (a different value per session and edit, so every edit is a cache
miss that re-evaluates the recipe and redraws the charts' marks; with ``--warm`` all sessions
alternate between two shared values, so the updates are cache hits and measure the rerun
itself; with ``--think`` each session pauses, as a person reading the page would, before
each edit; with ``--edit recipe`` each edit changes the first amount of the recipe table
instead, as a typed cell does, so the evaluation and the chart data are all new). The
edit-to-update latency
is the time from sending the new widget value to the server's "script finished"
message. Prints the median and 90th percentile per N and the resident memory of the
server (with ``--workers``, of the front and its page servers together).
Every wait is bounded by ``--timeout`` seconds; the server is stopped by its pid.

The messages are Streamlit's own protobufs (``BackMsg`` with a ``ClientState``,
``ForwardMsg``), as the browser sends and receives them; nothing is rendered, so the
figures are server time plus loopback transfer.
"""
from __future__ import annotations

import argparse
import asyncio
import json
import os
import random
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
TEMPERATURE_LABEL = "Solution temperature (°C)"


def free_port() -> int:
    from solutions.ui.serve import free_port as free
    return free()


def rss_mb(pid: int) -> float:
    """Resident memory of process ``pid`` [MB] (Linux /proc)."""
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def tree_rss_mb(pid: int) -> float:
    """Resident memory of ``pid`` and its children [MB]."""
    total = rss_mb(pid)
    for child in Path(f"/proc/{pid}/task").glob("*/children"):
        for c in child.read_text().split():
            total += tree_rss_mb(int(c))
    return total


def start_server(port: int, workers: int = 0) -> subprocess.Popen:
    """``streamlit run`` (``workers`` 0) or the team server, answering on ``port``."""
    from solutions.ui.serve import start_worker, wait_healthy
    if workers:
        proc = subprocess.Popen([sys.executable, "-m", "solutions", "serve", "--workers",
                                 str(workers), "--port", str(port)], cwd=ROOT,
                                stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    else:
        proc = start_worker(port, ROOT / "streamlit_app.py")
    if not wait_healthy(port, timeout=120):
        proc.terminate()
        raise SystemExit("the server did not answer its health check within 120 s")
    return proc


class Session:
    """One browser-like session on the app's websocket."""

    def __init__(self, port: int, timeout: float):
        self.url = f"ws://127.0.0.1:{port}/_stcore/stream"
        self.origin = f"http://127.0.0.1:{port}"
        self.timeout = timeout
        self.ws = None
        self.widget_id: str | None = None
        self.editor_id: str | None = None
        self.shown: list[str] = []
        self.metrics: list[str] = []

    async def open(self):
        import websockets
        self.ws = await websockets.connect(self.url, subprotocols=["streamlit"],
                                           origin=self.origin, max_size=2 ** 26,
                                           open_timeout=self.timeout)

    async def close(self):
        if self.ws is not None:
            await self.ws.close()

    async def run(self, widget_value: float | None = None, amount: str | None = None) -> float:
        """Send a run request (with the temperature widget's new value, or the recipe
        table's first amount edited, if given) and wait for the script to finish;
        returns the seconds it took."""
        from streamlit.proto.BackMsg_pb2 import BackMsg
        from streamlit.proto.ForwardMsg_pb2 import ForwardMsg
        msg = BackMsg()
        cs = msg.rerun_script
        cs.query_string = ""
        cs.page_script_hash = ""
        if widget_value is not None:
            w = cs.widget_states.widgets.add()
            w.id = self.widget_id
            w.double_value = widget_value
        if amount is not None:   # the table editor's state, as the browser sends it
            w = cs.widget_states.widgets.add()
            w.id = self.editor_id
            w.string_value = json.dumps({"edited_rows": {"0": {"amount": amount}},
                                         "added_rows": [], "deleted_rows": []})
        t0 = time.perf_counter()
        await self.ws.send(msg.SerializeToString())
        deadline = t0 + self.timeout
        while True:
            left = deadline - time.perf_counter()
            if left <= 0:
                raise TimeoutError("no 'script finished' within the timeout")
            raw = await asyncio.wait_for(self.ws.recv(), timeout=left)
            fm = ForwardMsg()
            fm.ParseFromString(raw)
            kind = fm.WhichOneof("type")
            if kind == "delta":
                self._look(fm)
            if kind == "script_finished":
                return time.perf_counter() - t0

    def _look(self, fm):
        """Note the temperature box's widget id and the captions that name the
        temperature the page was computed at."""
        d = fm.delta
        if d.WhichOneof("type") != "new_element":
            return
        el = d.new_element
        if el.WhichOneof("type") == "number_input" and \
                el.number_input.label == TEMPERATURE_LABEL:
            self.widget_id = el.number_input.id
        if el.WhichOneof("type") == "markdown" and " °C and " in el.markdown.body:
            self.shown.append(el.markdown.body)
        if el.WhichOneof("type") == "dataframe" and el.dataframe.editing_mode and \
                self.editor_id is None:
            self.editor_id = el.dataframe.id
        if el.WhichOneof("type") == "metric":
            self.metrics.append(el.metric.body)


async def drive(port: int, n: int, edits: int, timeout: float,
                warm: bool = False, think: float = 0.0,
                what: str = "temperature") -> tuple[list, list]:
    sessions = [Session(port, timeout) for _ in range(n)]
    await asyncio.gather(*(s.open() for s in sessions))
    first = await asyncio.gather(*(s.run() for s in sessions))
    if any(s.widget_id is None for s in sessions):
        raise SystemExit("the temperature box was not found on the page")
    if what == "recipe" and any(s.editor_id is None for s in sessions):
        raise SystemExit("the recipe table was not found on the page")
    lat: list[float] = []

    async def editor(k: int, s: Session):
        rng = random.Random(k)
        for e in range(edits):
            if think:   # a person reads the page before the next edit
                await asyncio.sleep(rng.uniform(0.5, 1.5) * think)
            x = (25.0 + e % 2 if warm else                    # shared values: cache hits
                 round(20.0 + 0.37 * k + 1.13 * e + 0.01 * n, 2))  # new value: a miss
            if what == "recipe":     # the first row's amount: 0.03 × x, in its own unit
                before = list(s.metrics)
                s.metrics.clear()
                lat.append(await s.run(amount=f"{0.03 * x:.4g}"))
                if not s.metrics or (e and not warm and s.metrics == before):
                    raise SystemExit("the page did not update to the new amount")
                continue
            s.shown.clear()
            lat.append(await s.run(x))
            if not any(f" at {x:g} °C and " in b for b in s.shown):
                raise SystemExit(f"the page did not update to {x:g} °C")

    await asyncio.gather(*(editor(k, s) for k, s in enumerate(sessions)))
    await asyncio.gather(*(s.close() for s in sessions))
    return first, lat


def pct(xs: list[float], q: float) -> float:
    xs = sorted(xs)
    return xs[min(len(xs) - 1, max(0, int(round(q * (len(xs) - 1)))))]


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sessions", type=int, nargs="+", default=[1, 10, 20])
    ap.add_argument("--edits", type=int, default=5)
    ap.add_argument("--timeout", type=float, default=60.0)
    ap.add_argument("--think", type=float, default=0.0,
                    help="mean seconds a session waits before each edit (0: edits back "
                         "to back, the worst case)")
    ap.add_argument("--edit", choices=["temperature", "recipe"], default="temperature",
                    help="what each edit changes: the solution temperature (default; the "
                         "chart data are reused) or the first amount of the recipe table "
                         "(everything is recomputed)")
    ap.add_argument("--workers", type=int, default=0,
                    help="run the team server with this many page servers (0: one plain "
                         "Streamlit server)")
    ap.add_argument("--warm", action="store_true",
                    help="every session alternates between the same two temperatures, so "
                         "after the first edits every update is a cache hit (the cost of "
                         "a rerun itself)")
    args = ap.parse_args(argv)
    if max(args.sessions) > 50 or args.edits > 50:
        raise SystemExit("at most 50 sessions and 50 edits per session")
    port = free_port()
    if not 0 <= args.workers <= 8:
        raise SystemExit("--workers: 0 to 8")
    proc = start_server(port, args.workers)
    try:
        print(f"server pid {proc.pid} on 127.0.0.1:{port}; {os.cpu_count()} CPU(s); "
              + (f"{args.workers} page servers behind the front; " if args.workers else
                 "one Streamlit server; ") +
              f"think {args.think:g} s; "
              f"{args.edits} edits per session of "
              + ("the solution temperature, " if args.edit == "temperature" else
                 "the recipe table's first amount, ")
              + ("alternating between two values shared by all sessions (cache hits)"
                 if args.warm else "each a new value (a cache miss)"))
        print(f"{'N':>3} {'first page med (s)':>19} {'edit med (s)':>13} "
              f"{'edit p90 (s)':>13} {'edits':>6} {'server RSS (MB)':>16} "
              f"{'this client CPU (s)':>20} {'wall (s)':>9}")
        for n in args.sessions:
            c0, w0 = time.process_time(), time.perf_counter()
            first, lat = asyncio.run(drive(port, n, args.edits, args.timeout, args.warm,
                                           args.think, args.edit))
            print(f"{n:>3} {statistics.median(first):>19.2f} {statistics.median(lat):>13.2f} "
                  f"{pct(lat, 0.9):>13.2f} {len(lat):>6} {tree_rss_mb(proc.pid):>16.0f} "
                  f"{time.process_time() - c0:>20.1f} {time.perf_counter() - w0:>9.1f}")
        print("(the sessions are driven from this machine: the client's CPU time is taken "
              "from the same cores as the server's)")
    finally:
        proc.terminate()
        try:
            proc.wait(timeout=20)
        except subprocess.TimeoutExpired:
            proc.kill()
    return 0


if __name__ == "__main__":
    sys.exit(main())
