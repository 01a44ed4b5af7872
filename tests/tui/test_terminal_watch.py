"""The hang-up check that lets the app exit when its terminal is gone (pseudo-terminals from the OS, no mock)."""

import os

import pytest

from tui.terminal_watch import terminal_lost

pytest.importorskip("termios", reason="POSIX terminals only")


def test_a_live_terminal_is_not_lost_and_a_hung_up_one_is():
    master, slave = os.openpty()
    try:
        assert terminal_lost(slave) is False
        os.close(master)  # what closing the window or killing the multiplexer session does to the app's side
        master = -1
        assert terminal_lost(slave) is True
    finally:
        os.close(slave)
        if master >= 0:
            os.close(master)


def test_a_pipe_or_a_closed_descriptor_counts_as_lost():
    read_end, write_end = os.pipe()
    os.close(write_end)
    assert terminal_lost(read_end) is True
    os.close(read_end)
    assert terminal_lost(read_end) is True
