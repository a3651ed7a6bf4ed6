"""Ctrl-C stops a call that simulates: KeyboardInterrupt at once, not at the simulation's end,
and the next call works."""
import os
import signal
import threading
import time
import unittest

import deckscale
from support import TempDir, write_bytes

# A transient of 50 million steps: it would run for minutes.
ENDLESS = "endless\nV1 in 0 SIN(0 1 1k)\nR1 in out 1k\nC1 out 0 1u\n.tran 1n 50m\n.end\n"
QUICK = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1u\n.ac dec 10 1 1meg\n.end\n"


class InterruptTest(unittest.TestCase):
    def test_ctrl_c_stops_a_verification_and_the_next_one_runs(self):
        with TempDir() as d:
            endless, quick = os.path.join(d, "endless.cir"), os.path.join(d, "quick.cir")
            write_bytes(endless, ENDLESS)
            write_bytes(quick, QUICK)
            slow = deckscale.scale(endless, km=2, kf=3, output=os.path.join(d, "endless_s.cir"))
            fast = deckscale.scale(quick, km=2, kf=3, output=os.path.join(d, "quick_s.cir"))
            # SIGINT to this process is what the terminal sends on Ctrl-C.
            timer = threading.Timer(1.0, os.kill, (os.getpid(), signal.SIGINT))
            start = time.monotonic()
            timer.start()
            try:
                with self.assertRaises(KeyboardInterrupt):
                    deckscale.verify(endless, slow, km=2, kf=3, timeout=600)
            finally:
                timer.cancel()
            # Stopped within a few polls of the signal, far from the 600 s deadline.
            self.assertLess(time.monotonic() - start, 60)
            report = deckscale.verify(quick, fast, km=2, kf=3)
            self.assertTrue(report["passed"])


if __name__ == "__main__":
    unittest.main()
