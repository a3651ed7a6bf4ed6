"""deckscale.verify: the report as a dict (the --json report plus the text and the vectors'
errors as columns: numpy arrays when numpy can be imported, lists otherwise)."""
import json
import os
import subprocess
import sys
import unittest

import deckscale
from support import DEMO, SOURCE, TempDir, cli

KF = "2*pi*10meg"


def without_additions(report):
    """The report as the command line's --json writes it."""
    plain = {k: v for k, v in report.items() if k not in ("text", "outcome", "problems", "failures")}
    plain["analyses"] = [{k: v for k, v in a.items() if k != "errors"} for a in report["analyses"]]
    return plain


class VerifyTest(unittest.TestCase):
    def test_the_demo_pair_in_memory_passes(self):
        scaled = deckscale.scale(DEMO, km=50, kf=KF)
        report = deckscale.verify(DEMO, scaled, km=50, kf=KF)
        self.assertEqual(report["outcome"], "compared")
        self.assertTrue(report["passed"], report["text"])
        (ac,) = report["analyses"]
        self.assertEqual(ac["analysis"], "ac")
        errors = ac["errors"]
        self.assertEqual(list(errors["name"]), [v["name"] for v in ac["vectors"]])
        self.assertEqual(len(errors["worst"]), len(ac["vectors"]))
        self.assertIn("n3", list(errors["name"]))
        self.assertTrue(all(e < 1e-6 for e in errors["worst"]))
        self.assertTrue(all(errors["passed"]))
        self.assertIn("PASS", report["text"])

    def test_the_report_equals_the_command_lines_text_and_json(self):
        with TempDir() as d:
            scaled = os.path.join(d, "scaled.cir")
            deckscale.scale(DEMO, km=50, kf=KF, output=scaled)
            js = os.path.join(d, "report.json")
            ran = cli("verify", DEMO, scaled, "--km", "50", "--kf", KF, "--json", js)
            self.assertEqual(ran.returncode, 0, ran.stderr)
            report = deckscale.verify(DEMO, scaled, km=50, kf=KF)
            self.assertEqual(report["text"], ran.stdout.decode())
            with open(js) as f:
                self.assertEqual(without_additions(report), json.load(f))

    def test_the_decks_own_measurements_come_with_both_results(self):
        deck = os.path.join(SOURCE, "netlists", "corpus", "if_strip_measured.cir")
        report = deckscale.verify(deck, deckscale.scale(deck, km=2, kf=0.1), km=2, kf=0.1)
        self.assertTrue(report["passed"], report["text"])
        (meas,) = [a for a in report["analyses"] if a["analysis"] == "meas"]
        self.assertEqual(meas["part"], "ac")
        errors = meas["errors"]
        names = list(errors["name"])
        bw = names.index("bw")  # a bandwidth: Kf times the original's
        self.assertEqual(errors["quantity"][bw], "frequency (x Kf)")
        self.assertAlmostEqual(errors["scaled_value"][bw] / errors["original_value"][bw], 0.1,
                               places=6)
        self.assertIn("Measurements (ac)", report["text"])

    def test_factors_are_inferred_when_not_given(self):
        report = deckscale.verify(DEMO, deckscale.scale(DEMO, km=600, kf=3))
        self.assertEqual(report["factors"], "inferred")
        self.assertAlmostEqual(report["km"] / 600, 1, places=8)
        self.assertAlmostEqual(report["kf"] / 3, 1, places=8)
        self.assertTrue(report["passed"])
        with self.assertRaises(deckscale.DeckError):
            deckscale.verify(DEMO, DEMO, km=2)

    def test_a_wrong_factor_fails_and_bad_input_raises(self):
        scaled = deckscale.scale(DEMO, km=2)
        report = deckscale.verify(DEMO, scaled, km=3, kf=1)
        self.assertFalse(report["passed"])
        self.assertFalse(all(report["analyses"][0]["errors"]["passed"]))
        with self.assertRaises(deckscale.DeckError) as caught:
            deckscale.verify(DEMO, scaled, km=2, kf=1, drive="vnothere")
        self.assertIn("no independent source", caught.exception.message)

    def test_max_step_sets_both_transient_runs_step(self):
        # An RC charged by a pulse (invented demo), scaled at Km 10, Kf 4 by the command line.
        deck = ("rc step\nV1 in 0 pulse(0 1 10u 1n 1n 1 2)\nR1 in out 1k\nC1 out 0 10n\n"
                ".tran 1u 100u\n.end\n")
        with TempDir() as d:
            original = os.path.join(d, "o.cir")
            with open(original, "w") as f:
                f.write(deck)
            scaled = deckscale.scale(original, km=10, kf=4)
            report = deckscale.verify(original, scaled, km=10, kf=4, max_step=0.25e-6)
            self.assertTrue(report["passed"], report["text"])
            self.assertIn("transient: both runs with a largest time step of 2.5e-07 s of the "
                          "original's time (the scaled run's 6.25e-08 s)", report["notes"][0])
            self.assertEqual(deckscale.verify(original, scaled, km=10, kf=4)["notes"], [])
            with self.assertRaises(deckscale.DeckError) as caught:
                deckscale.verify(original, scaled, km=10, kf=4, max_step=-1.0)
            self.assertIn("max_step must be 0", caught.exception.message)

    def test_arrays_are_numpy_arrays_with_numpy_and_lists_without(self):
        try:
            import numpy
        except ImportError:  # the interpreter has no numpy: the lists are checked below anyway
            numpy = None
        report = deckscale.verify(DEMO, deckscale.scale(DEMO, km=5), km=5, kf=1)
        worst = report["analyses"][0]["errors"]["worst"]
        if numpy is not None:
            self.assertIsInstance(worst, numpy.ndarray)
            self.assertEqual(worst.dtype, numpy.float64)
        # numpy made unimportable before the module is loaded: plain lists.
        script = ("import sys; sys.modules['numpy'] = None\n"
                  "import deckscale\n"
                  f"r = deckscale.verify({DEMO!r}, deckscale.scale({DEMO!r}, km=5), km=5, kf=1)\n"
                  "e = r['analyses'][0]['errors']\n"
                  "print(type(e['worst']).__name__, type(e['passed']).__name__, r['passed'])\n")
        out = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                             check=True, env=os.environ)
        self.assertEqual(out.stdout, "list list True\n")


if __name__ == "__main__":
    unittest.main()
