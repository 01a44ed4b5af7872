"""Shared fixtures: a hostile data room on disk, and a guard that fails a test which reaches for the network."""

from __future__ import annotations

import ipaddress
import socket
from pathlib import Path

import pytest

from tests.hostile_corpus import write_hostile_folder


class NetworkBlocked(AssertionError):
    """Raised (and recorded) when code under test tries to reach a non-local address."""


def _is_local_host(host: object) -> bool:
    if host is None:  # getaddrinfo(None, port): the local host (POSIX getaddrinfo)
        return True
    if isinstance(host, bytes):
        host = host.decode("ascii", "replace")
    host = str(host).strip("[]").split("%", 1)[0]
    if host.lower() in ("localhost", "localhost.localdomain", ""):
        return True
    try:
        return ipaddress.ip_address(host).is_loopback  # 127.0.0.0/8 and ::1 (RFC 1122, RFC 4291)
    except ValueError:
        return False


def _is_local_address(address: object) -> bool:
    if isinstance(address, (str, bytes)):  # AF_UNIX path
        return True
    if isinstance(address, tuple) and address:
        return _is_local_host(address[0])
    return False


@pytest.fixture
def no_network(monkeypatch):
    """Make connect / connect_ex / create_connection / getaddrinfo raise for any non-local address.

    Every attempt is also recorded, and the test fails at teardown if there was one, even when the code under
    test caught the exception. Yields the list of attempts.
    """
    attempts: list[str] = []

    def block(what: str, target: object) -> None:
        attempts.append(f"{what}({target!r})")
        raise NetworkBlocked(f"network access attempted: {what}({target!r})")

    real_connect, real_connect_ex = socket.socket.connect, socket.socket.connect_ex
    real_create_connection, real_getaddrinfo = socket.create_connection, socket.getaddrinfo

    def connect(self, address):
        if not _is_local_address(address):
            block("connect", address)
        return real_connect(self, address)

    def connect_ex(self, address):
        if not _is_local_address(address):
            block("connect_ex", address)
        return real_connect_ex(self, address)

    def create_connection(address, *args, **kwargs):
        if not _is_local_address(address):
            block("create_connection", address)
        return real_create_connection(address, *args, **kwargs)

    def getaddrinfo(host, *args, **kwargs):
        if not _is_local_host(host):
            block("getaddrinfo", host)
        return real_getaddrinfo(host, *args, **kwargs)

    monkeypatch.setattr(socket.socket, "connect", connect)
    monkeypatch.setattr(socket.socket, "connect_ex", connect_ex)
    monkeypatch.setattr(socket, "create_connection", create_connection)
    monkeypatch.setattr(socket, "getaddrinfo", getaddrinfo)
    yield attempts
    assert not attempts, f"network access attempted: {attempts}"


@pytest.fixture
def hostile_folder(tmp_path) -> tuple[Path, dict[str, str]]:
    """``(folder, {relative path: expected reason keyword})`` from tests/hostile_corpus.py."""
    root = tmp_path / "data_room"
    return root, write_hostile_folder(root)
