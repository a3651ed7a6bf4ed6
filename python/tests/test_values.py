"""Preferred values (IEC 60063) and snapping a deck to them."""
import math
import os
import re
import unittest

import deckscale
from support import TempDir, cli, read_bytes, write_bytes


class ValuesTest(unittest.TestCase):
    def test_the_series_are_those_of_iec_60063(self):
        # IEC 60063:2015: E12, and the E24 members fixed otherwise than by the rule.
        self.assertEqual(deckscale.preferred_values("E12"),
                         [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2])
        e24 = deckscale.preferred_values("e24")
        self.assertEqual(len(e24), 24)
        for fixed in (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2):
            self.assertIn(fixed, e24)
        self.assertIn(9.2, deckscale.preferred_values("E192"))
        with self.assertRaises(deckscale.DeckError):
            deckscale.preferred_values("E7")

    def test_nearest_on_a_logarithmic_scale_midway_goes_up(self):
        self.assertAlmostEqual(deckscale.nearest_preferred(4.6e3, "E12"), 4.7e3)
        midway = math.sqrt(1.0 * 1.2)  # the geometric mean of two E12 neighbours
        self.assertAlmostEqual(deckscale.nearest_preferred(midway * 0.999, "E12"), 1.0)
        self.assertAlmostEqual(deckscale.nearest_preferred(midway * 1.001, "E12"), 1.2)
        with self.assertRaises(deckscale.DeckError):
            deckscale.nearest_preferred(-1, "E12")

    def test_snap_rounds_each_part_and_equals_the_command_line(self):
        deck = "t\nV1 in 0 dc 0 ac 1\nR1 in out 1.234k\nC1 out 0 3.1n\nL1 out 0 {lval}\n.param lval=1u\n.end\n"
        with TempDir() as d:
            path = os.path.join(d, "d.cir")
            write_bytes(path, deck)
            ran = cli("snap", path, "--series", "R=E96,C=E12,L=E6", "-o", os.path.join(d, "cli.cir"))
            self.assertEqual(ran.returncode, 0, ran.stderr)
            target = os.path.join(d, "py.cir")
            r = deckscale.snap(path, "R=E96,C=E12,L=E6", output=target)
            self.assertEqual(read_bytes(target), read_bytes(os.path.join(d, "cli.cir")))
            self.assertEqual(read_bytes(path), deck.encode())
        parts = {p["name"]: p for p in r["parts"]}
        self.assertEqual((parts["R1"]["new"], parts["C1"]["new"]), ("1.24k", "3.3n"))
        self.assertAlmostEqual(parts["R1"]["error"], 1.24 / 1.234 - 1)
        self.assertEqual(parts["R1"]["parameter_of"], [])
        # L1's value is the parameter lval alone: it is rounded at its definition.
        self.assertEqual((parts["lval"]["new"], parts["lval"]["parameter_of"]), ("1u", ["L1"]))
        self.assertIn("R1 in out 1.24k\nC1 out 0 3.3n\n", r["text"])
        self.assertIn("local codes and", r["cautions"])
        with self.assertRaises(deckscale.DeckError):
            deckscale.snap(deckscale.read_text(deck), "R=E97")


    def test_snap_reports_the_response_change_as_the_command_line(self):
        # A second-order RC low-pass whose parts round off their ideal values.
        deck = ("rc ladder\nV1 in 0 dc 0 ac 1\nR1 in m 1.234k\nC1 m 0 3.1n\nR2 m out 2.345k\n"
                "C2 out 0 1.3n\n.ac dec 20 100 10meg\n.end\n")
        with TempDir() as d:
            path = os.path.join(d, "rc.cir")
            write_bytes(path, deck)
            ran = cli("snap", path, "--series", "R=E12,C=E6", "-o", os.path.join(d, "cli.cir"))
            self.assertEqual(ran.returncode, 0, ran.stderr)
            r = deckscale.snap(path, "R=E12,C=E6", output=os.path.join(d, "py.cir"))
            unwritten = deckscale.snap(path, "R=E12,C=E6", output=os.path.join(d, "no.cir"),
                                       write=False)
        change = r["response_change"]
        self.assertIsNone(unwritten["response_change"])
        self.assertEqual(change["node"], "out")
        stdout = ran.stdout.decode()
        printed = re.search(r"magnitude  max (\S+) dB", stdout)
        self.assertIsNotNone(printed, stdout)
        self.assertEqual(float(printed.group(1)), float(f"{change['max_db']:.4g}"))
        printed = re.search(r"phase      max (\S+) deg", stdout)
        self.assertEqual(float(printed.group(1)), float(f"{change['max_deg']:.4g}"))
        self.assertGreater(change["max_db"], 0)
        self.assertIsNotNone(change["corner_ideal_hz"])
        self.assertNotEqual(change["corner_ideal_hz"], change["corner_rounded_hz"])


if __name__ == "__main__":
    unittest.main()
