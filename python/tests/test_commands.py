"""retarget, yield_, stress, batch and survey: each the command's --json report as Python
objects, with the same figures as the command line."""
import json
import math
import os
import unittest

import deckscale
from support import BUTTERWORTH3, DEMO, SOURCE, TempDir, cli, write_bytes


def load(path):
    with open(path) as f:
        return json.load(f)


class RetargetTest(unittest.TestCase):
    def test_the_butterworth_prototype_to_600_ohm_and_a_3k4_corner(self):
        # The prototype's -3 dB corner is 1 rad/s (Matthaei, Young & Jones 1964, sec. 4.05);
        # R1 = 1 Ohm becomes 600 Ohm, the corner at node out becomes 3.4 kHz.
        with TempDir() as d:
            deck, out = os.path.join(d, "proto.cir"), os.path.join(d, "out.cir")
            write_bytes(deck, BUTTERWORTH3)
            r = deckscale.retarget(deck, out, impedance=("R1", 600), corner=("out", "3.4k"))
            self.assertTrue(os.path.exists(out))
            self.assertEqual(r["written"], [out])
            with self.assertRaises(deckscale.DeckError):
                deckscale.retarget(deck, deck, impedance=("R1", 600))
        self.assertEqual(r["outcome"], "done")
        self.assertAlmostEqual(r["km"], 600)
        self.assertAlmostEqual(r["kf"] / (2 * math.pi * 3400), 1, places=6)
        self.assertAlmostEqual(r["before"]["frequency"] * 2 * math.pi, 1, places=6)
        self.assertLess(abs(r["target_error"]), 1e-6)
        self.assertTrue(r["verification"]["passed"])
        self.assertIn("local codes and", r["cautions"])


class YieldTest(unittest.TestCase):
    def test_the_figures_equal_the_command_lines(self):
        with TempDir() as d:
            js = os.path.join(d, "y.json")
            ran = cli("yield", DEMO, "--trials", "40", "--seed", "7", "--tolerance", "C=5%,L=5%",
                      "--mask", "1dB", "--workers", "2", "--json", js)
            self.assertEqual(ran.returncode, 0, ran.stderr)
            r = deckscale.yield_(DEMO, trials=40, seed=7, tolerance="C=5%,L=5%", mask_db=1,
                                 workers=1)
            want = load(js)
        self.assertEqual(r["outcome"], "done")
        self.assertEqual(r["per_trial"], want["per_trial"])
        self.assertEqual(r["passed"], want["passed"])
        self.assertEqual(r["text"], ran.stdout.decode())
        self.assertEqual(len(r["frequency"]), 101)
        self.assertEqual(len(r["low_db"]), len(r["frequency"]))
        self.assertTrue(all(lo <= hi for lo, hi in zip(r["low_db"], r["high_db"])))
        with self.assertRaises(deckscale.DeckError):
            deckscale.yield_(DEMO, tolerance="C=five")
        # The judged node: `node`, or `output`, the name it had first; not both.
        for kw in ("node", "output"):
            r = deckscale.yield_(DEMO, trials=3, workers=1, **{kw: "n1"})
            self.assertIn("output n1;", r["text"])
        with self.assertRaises(deckscale.DeckError):
            deckscale.yield_(DEMO, trials=3, node="n1", output="n2")


class StressTest(unittest.TestCase):
    def test_currents_double_at_half_the_impedance(self):
        # Km = 1/2 at the same voltages: every current doubles, every resistor's power too.
        with TempDir() as d:
            scaled = os.path.join(d, "half.cir")
            deckscale.scale(DEMO, km=0.5, output=scaled)
            js = os.path.join(d, "s.json")
            cli("stress", DEMO, scaled, "--json", js)
            r = deckscale.stress(DEMO, scaled)
            want = load(js)
        self.assertEqual({k: v for k, v in r.items() if k not in ("text", "outcome")}, want)
        rsrc = next(p for p in r["parts"] if p["part"] == "rsrc")
        self.assertAlmostEqual(rsrc["current_ratio"], 2, places=6)
        self.assertAlmostEqual(rsrc["power_ratio"], 2, places=6)


class BatchTest(unittest.TestCase):
    def test_the_demo_suite_meets_every_expectation(self):
        suite = os.path.join(SOURCE, "netlists", "batch", "suite.toml")
        with TempDir() as d:
            js = os.path.join(d, "b.json")
            ran = cli("batch", suite, "-j", "2", "--json", js)
            self.assertEqual(ran.returncode, 0, ran.stderr)
            r = deckscale.batch(suite, jobs=2)
            want = load(js)
        self.assertEqual(r["unmet"], 0)
        self.assertEqual([(c["name"], c["outcome"]) for c in r["cases"]],
                         [(c["name"], c["outcome"]) for c in want["cases"]])
        with self.assertRaises(deckscale.DeckError):
            deckscale.batch(os.path.join(SOURCE, "netlists", "demo", "ladder5_proto.cir"))

    def test_a_survey_of_a_folder(self):
        r = deckscale.survey(os.path.join(SOURCE, "netlists", "demo"), km=50, kf=1000)
        self.assertEqual([c["outcome"] for c in r["cases"]], ["pass"])


if __name__ == "__main__":
    unittest.main()
