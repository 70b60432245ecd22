"""A Dask distributed cluster for the worker pool (sizer.workers): `--cluster ADDRESS` names an
existing scheduler (`pip install 'sizer[cluster]'`); the address is checked and tried at once, so
that a wrong one is one line of bad input within CLUSTER_TIMEOUT, never a long wait."""

from __future__ import annotations

from typing import Any

from sizer.errors import InputError

CLUSTER_TIMEOUT = 5.0  # s: the longest a cluster address is tried before it is refused
DASK_PORT = 8786


def cluster_client(address: str) -> Any:
    """A Dask client connected to `address` (tcp:// or host:port); InputError when dask is missing, the
    address is of another kind, or no Dask scheduler answers there within CLUSTER_TIMEOUT."""
    import time

    try:
        from distributed import Client
    except ImportError:
        raise InputError("", "--cluster", "Dask distributed is not installed", "pip install 'sizer[cluster]'") from None
    started = time.monotonic()
    host, port = cluster_host_port(address)
    probe_scheduler(address, host, port)
    left = max(1.0, CLUSTER_TIMEOUT - (time.monotonic() - started))
    try:
        return Client(f"tcp://{host}:{port}" if ":" not in host else f"tcp://[{host}]:{port}", timeout=f"{left:.1f}s", set_as_default=False)
    except Exception as exc:  # any failure to connect is the address's: one line
        raise InputError("", "--cluster", f"no Dask scheduler answers at {address!r} ({type(exc).__name__}: {str(exc)[:120]})",
                         "give the scheduler's address, e.g. tcp://10.0.0.5:8786, and check that it is running") from None


def cluster_host_port(address: str) -> tuple[str, int]:
    """(host, port) of a --cluster address: tcp://HOST:PORT, HOST:PORT or HOST (port 8786); IPv6 hosts
    in brackets. InputError for any other scheme (ucx://, tls://, ...) or a malformed address."""
    fix = "give the scheduler's address as tcp://HOST:PORT, e.g. tcp://10.0.0.5:8786"
    text = address.strip()
    scheme, separator, rest = text.partition("://")
    if not separator:
        scheme, rest = "tcp", text
    if scheme.lower() != "tcp":
        raise InputError("", "--cluster", f"the {scheme[:20]!r} protocol is not supported (only tcp://)", fix)
    if rest.startswith("["):
        host, _, tail = rest[1:].partition("]")
        port_text = tail.removeprefix(":") if tail.startswith(":") else ("" if not tail else None)
    else:
        host, _, port_text = rest.partition(":")
    if not host or port_text is None or "/" in rest or any(ch.isspace() for ch in rest):
        raise InputError("", "--cluster", f"{address[:80]!r} is not a scheduler address", fix)
    if not port_text:
        return host, DASK_PORT
    if not port_text.isdigit() or not 0 < int(port_text) < 65536:
        raise InputError("", "--cluster", f"{port_text[:20]!r} is not a port number", fix)
    return host, int(port_text)


def probe_scheduler(address: str, host: str, port: int) -> None:
    """InputError unless a Dask scheduler answers at host:port within CLUSTER_TIMEOUT: it is reached,
    and it sends its greeting first (a short framed message naming its compression and pickle
    protocol), which no web or other server does. Checked before Dask is given the address, which
    would otherwise wait for its own timeout or read another server's reply as a frame length."""
    import socket
    import time

    fix = "give the scheduler's address, e.g. tcp://10.0.0.5:8786, and check that it is running"
    deadline = time.monotonic() + CLUSTER_TIMEOUT
    try:
        connection = socket.create_connection((host, port), timeout=CLUSTER_TIMEOUT)
    except (OSError, UnicodeError, ValueError) as exc:
        raise InputError("", "--cluster", f"cannot reach {address[:80]!r} ({getattr(exc, 'strerror', None) or exc or 'timed out'})", fix) from None
    greeting = b""
    with connection:
        try:
            while len(greeting) < 64 and time.monotonic() < deadline:
                connection.settimeout(max(0.05, deadline - time.monotonic()))
                chunk = connection.recv(64 - len(greeting))
                if not chunk:
                    break
                greeting += chunk
        except OSError:  # timed out or reset: judged on what came
            pass
    if not _looks_like_dask(greeting):
        raise InputError("", "--cluster", f"the server at {address[:80]!r} is not a Dask scheduler (no Dask greeting within "
                         f"{CLUSTER_TIMEOUT:g} s)", fix)


def _looks_like_dask(greeting: bytes) -> bool:
    """True when `greeting` starts as a Dask comm handshake: a little-endian 8-byte total length under
    1 MiB, then a small frame count, and its msgpack names the compression or pickle protocol."""
    if len(greeting) < 16:
        return False
    length, frames = int.from_bytes(greeting[:8], "little"), int.from_bytes(greeting[8:16], "little")
    return 0 < length < 2**20 and 0 < frames < 64 and (b"compression" in greeting or b"pickle" in greeting)
