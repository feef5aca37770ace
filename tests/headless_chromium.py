"""A headless Chromium driven over the DevTools protocol, for tests of the HTML report.

Standard library only: a minimal WebSocket client (RFC 6455) talks to the browser.
Chromium comes from the system packages (.ci/run installs it); tests skip without it.
"""

from __future__ import annotations

import base64
import json
import os
import shutil
import socket
import struct
import subprocess
import tempfile
import time
import urllib.request
from pathlib import Path
from typing import Any

FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--remote-debugging-port=0",
]


def find_chromium() -> str | None:
    for name in ("chromium", "chromium-browser", "google-chrome"):
        path = shutil.which(name)
        if path:
            return path
    return None


class _WebSocket:
    def __init__(self, url: str) -> None:
        rest = url.split("://", 1)[1]
        hostport, _, path = rest.partition("/")
        host, _, port = hostport.partition(":")
        self.sock = socket.create_connection((host, int(port)), timeout=30)
        key = base64.b64encode(os.urandom(16)).decode()
        self.sock.sendall(
            (
                f"GET /{path} HTTP/1.1\r\nHost: {hostport}\r\nUpgrade: websocket\r\n"
                f"Connection: Upgrade\r\nSec-WebSocket-Key: {key}\r\n"
                "Sec-WebSocket-Version: 13\r\n\r\n"
            ).encode()
        )
        head = b""
        while b"\r\n\r\n" not in head:
            chunk = self.sock.recv(4096)
            if not chunk:
                raise ConnectionError("DevTools closed the connection during the handshake")
            head += chunk
        if b" 101 " not in head.split(b"\r\n", 1)[0]:
            raise ConnectionError(head.decode(errors="replace"))
        self.buf = head.split(b"\r\n\r\n", 1)[1]

    def send(self, text: str) -> None:
        data = text.encode()
        mask = os.urandom(4)
        n = len(data)
        if n < 126:
            header = struct.pack("!BB", 0x81, 0x80 | n)
        elif n < 1 << 16:
            header = struct.pack("!BBH", 0x81, 0x80 | 126, n)
        else:
            header = struct.pack("!BBQ", 0x81, 0x80 | 127, n)
        masked = bytes(b ^ mask[i % 4] for i, b in enumerate(data))
        self.sock.sendall(header + mask + masked)

    def _read(self, n: int) -> bytes:
        while len(self.buf) < n:
            chunk = self.sock.recv(1 << 16)
            if not chunk:
                raise ConnectionError("DevTools closed the connection")
            self.buf += chunk
        out, self.buf = self.buf[:n], self.buf[n:]
        return out

    def recv(self) -> str:
        message = b""
        while True:
            b0, b1 = self._read(2)
            n = b1 & 0x7F
            if n == 126:
                (n,) = struct.unpack("!H", self._read(2))
            elif n == 127:
                (n,) = struct.unpack("!Q", self._read(8))
            payload = self._read(n)
            opcode = b0 & 0x0F
            if opcode in (0x0, 0x1, 0x2):
                message += payload
                if b0 & 0x80:
                    return message.decode()
            elif opcode == 0x8:
                raise ConnectionError("DevTools closed the connection")

    def close(self) -> None:
        self.sock.close()


class Browser:
    """One headless Chromium with one page; ``load()`` returns console problems."""

    def __init__(self, executable: str) -> None:
        self.profile = tempfile.mkdtemp(prefix="sc-chromium-")
        self.proc = subprocess.Popen(
            [executable, *FLAGS, f"--user-data-dir={self.profile}", "about:blank"],
            stdout=subprocess.DEVNULL,
            stderr=subprocess.DEVNULL,
        )
        try:
            self._connect()
        except BaseException:
            self.close()
            raise

    def _connect(self) -> None:
        port_file = Path(self.profile, "DevToolsActivePort")
        deadline = time.monotonic() + 30
        while not port_file.exists() or not port_file.read_text().strip():
            if time.monotonic() > deadline or self.proc.poll() is not None:
                raise RuntimeError("chromium did not open its DevTools port")
            time.sleep(0.05)
        port = port_file.read_text().split()[0]
        with urllib.request.urlopen(f"http://127.0.0.1:{port}/json/list", timeout=10) as r:
            pages = [t for t in json.load(r) if t.get("type") == "page"]
        self.ws = _WebSocket(pages[0]["webSocketDebuggerUrl"])
        self.next_id = 0
        self.events: list[dict[str, Any]] = []
        for method in ("Page.enable", "Runtime.enable", "Log.enable"):
            self.call(method)

    def call(self, method: str, **params: Any) -> dict[str, Any]:
        self.next_id += 1
        self.ws.send(json.dumps({"id": self.next_id, "method": method, "params": params}))
        while True:
            msg = json.loads(self.ws.recv())
            if msg.get("id") == self.next_id:
                if "error" in msg:
                    raise RuntimeError(f"{method}: {msg['error']}")
                return msg.get("result", {})
            self.events.append(msg)

    def _wait_for(self, method: str, timeout: float = 30) -> None:
        if any(e.get("method") == method for e in self.events):
            return
        deadline = time.monotonic() + timeout
        while time.monotonic() < deadline:
            msg = json.loads(self.ws.recv())
            self.events.append(msg)
            if msg.get("method") == method:
                return
        raise TimeoutError(method)

    def load(self, path: Path, width: int = 1200, height: int = 900) -> list[str]:
        """Open a local file; return the console errors, exceptions and log errors."""
        self.events.clear()
        self.call(
            "Emulation.setDeviceMetricsOverride",
            width=width,
            height=height,
            deviceScaleFactor=1,
            mobile=False,
        )
        self.call("Page.navigate", url=path.resolve().as_uri())
        self._wait_for("Page.loadEventFired")
        self.evaluate("1")  # drain events that arrived with the load
        problems = []
        for e in self.events:
            method, p = e.get("method"), e.get("params", {})
            if method == "Runtime.consoleAPICalled" and p.get("type") in ("error", "assert"):
                problems.append(json.dumps(p.get("args")))
            elif method == "Runtime.exceptionThrown":
                problems.append(json.dumps(p.get("exceptionDetails")))
            elif method == "Log.entryAdded" and p["entry"].get("level") == "error":
                problems.append(p["entry"].get("text", ""))
        return problems

    def evaluate(self, expression: str) -> Any:
        result = self.call("Runtime.evaluate", expression=expression, returnByValue=True)
        if "exceptionDetails" in result:
            raise RuntimeError(result["exceptionDetails"])
        return result["result"].get("value")

    def screenshot(self, path: Path) -> None:
        data = self.call("Page.captureScreenshot", format="png")["data"]
        path.write_bytes(base64.b64decode(data))

    def close(self) -> None:
        ws = getattr(self, "ws", None)
        if ws is not None:
            ws.close()
        self.proc.terminate()
        try:
            self.proc.wait(timeout=10)
        except subprocess.TimeoutExpired:
            self.proc.kill()
            self.proc.wait()
        shutil.rmtree(self.profile, ignore_errors=True)
