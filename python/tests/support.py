"""Shared by the module's tests: where the tree and the command line are (ctest sets
DECKSCALE_SOURCE_DIR, DECKSCALE_BINARY and PYTHONPATH; see CMakeLists.txt)."""
import os
import subprocess
import tempfile

SOURCE = os.environ["DECKSCALE_SOURCE_DIR"]
BINARY = os.environ["DECKSCALE_BINARY"]
DEMO = os.path.join(SOURCE, "netlists", "demo", "ladder5_proto.cir")

# The 3rd-order Butterworth low-pass prototype, 1 Ohm terminations, corner 1 rad/s:
# g1 = 1 F, g2 = 2 H, g3 = 1 F (Matthaei, Young & Jones 1964, sec. 4.05, Table 4.05-1), the
# deck of tests/retarget/retarget_test.cpp.
BUTTERWORTH3 = ("butterworth n=3 prototype, 1 ohm, 1 rad/s\n"
                "V1 in 0 dc 0 ac 1\n"
                "R1 in n1 1\n"
                "C1 n1 0 1\n"
                "L2 n1 out 2\n"
                "C3 out 0 1\n"
                "R2 out 0 1\n"
                ".ac dec 20 1m 10\n"
                ".end\n")


def cli(*args, cwd=None):
    """Runs the command line; returns the CompletedProcess (stdout and stderr as bytes)."""
    return subprocess.run([BINARY, *args], capture_output=True, cwd=cwd, check=False)


def read_bytes(path):
    with open(path, "rb") as f:
        return f.read()


def write_bytes(path, data):
    os.makedirs(os.path.dirname(path) or ".", exist_ok=True)
    with open(path, "wb") as f:
        f.write(data if isinstance(data, bytes) else data.encode())


class TempDir:
    """A fresh folder, removed with everything in it at the end of the `with` block."""

    def __enter__(self):
        self._dir = tempfile.TemporaryDirectory(prefix="deckscale-pytest-")
        return self._dir.name

    def __exit__(self, *exc):
        self._dir.cleanup()
