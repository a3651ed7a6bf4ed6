"""deckscale.scale and friends: the command line's bytes, the change list and refusals as
objects, errors as deckscale.DeckError, and the input never changed."""
import math
import os
import subprocess
import sys
import unittest

import deckscale
from support import BUTTERWORTH3, DEMO, TempDir, cli, read_bytes, write_bytes


class ScaleTest(unittest.TestCase):
    def test_the_demo_deck_equals_the_command_lines_output_byte_for_byte(self):
        out = cli("scale", DEMO, "--km", "50", "--kf", "2*pi*10meg")
        self.assertEqual(out.returncode, 0, out.stderr)
        for deck in (DEMO, deckscale.read_deck(DEMO)):
            result = deckscale.scale(deck, km=50, kf="2*pi*10meg")
            self.assertEqual(len(result.files), 1)
            self.assertEqual(result.files[0].data, out.stdout)
            self.assertEqual(result.text, out.stdout.decode())
            self.assertFalse(result.refused)

    def test_the_cautions_are_the_command_lines(self):
        out = cli("scale", DEMO, "--km", "0.5", "--kf", "10")
        self.assertEqual(out.returncode, 0, out.stderr)
        result = deckscale.scale(DEMO, km=0.5, kf=10)
        self.assertIn("every current grows by 1/Km = 2", result.cautions)
        self.assertIn(result.cautions, out.stderr.decode())
        self.assertEqual(deckscale.scale(DEMO, km=1, kf=1).cautions, "")

    def test_a_written_output_equals_the_command_lines_and_the_input_is_untouched(self):
        before = read_bytes(DEMO)
        with TempDir() as d:
            os.mkdir(os.path.join(d, "cli"))
            ran = cli("scale", DEMO, "--km", "75", "--kf", "1k", "-o", os.path.join(d, "cli", "o.cir"))
            self.assertEqual(ran.returncode, 0, ran.stderr)
            target = os.path.join(d, "o.cir")
            preview = deckscale.scale(DEMO, km=75, kf="1k", output=target, write=False)
            self.assertFalse(os.path.exists(target))
            result = deckscale.scale(DEMO, km=75, kf="1k", output=target)
            self.assertEqual(read_bytes(target), read_bytes(os.path.join(d, "cli", "o.cir")))
            self.assertEqual(result.files[-1].data, read_bytes(target))
            self.assertEqual(preview.text, result.text)
            self.assertEqual(result.files[-1].path, target)
        self.assertEqual(read_bytes(DEMO), before)

    def test_the_butterworth_prototype_denormalizes_to_the_handbook_values(self):
        # 600 Ohm, 3.4 kHz: C = g/(R0 wc), L = g R0/wc (common practice), g = 1, 2, 1.
        r0, wc = 600.0, 2 * math.pi * 3400
        result = deckscale.scale(deckscale.read_text(BUTTERWORTH3), km=r0, kf=wc)
        new = {c.element: float(c.new) for c in result.changes if c.field == "value"}
        self.assertAlmostEqual(new["R1"], 600)
        for name, g in (("C1", 1), ("L2", 2), ("C3", 1)):
            want = g / (r0 * wc) if name[0] == "C" else g * r0 / wc
            self.assertLess(abs(new[name] / want - 1), 1e-8, name)
        c1 = next(c for c in result.changes if c.element == "C1")
        self.assertEqual((c1.file, c1.line, c1.column, c1.old, c1.unit), ("deck.cir", 4, 9, "1", "F"))
        self.assertAlmostEqual(c1.factor, 1 / (r0 * wc))
        self.assertIn("C1  value  1 -> ", result.changes_text)
        self.assertIn('"element": "C1"', result.changes_json)

    def test_refusals_are_diagnostics_and_nothing_is_written(self):
        deck = "t\nR1 a 0 1k\nY1 a 0 c 0 tm\n.end\n"
        with TempDir() as d:
            target = os.path.join(d, "out.cir")
            result = deckscale.scale(deckscale.read_text(deck), km=10, output=target)
            self.assertTrue(result.refused)
            self.assertEqual(result.files, [])
            self.assertIsNone(result.text)
            self.assertEqual([(r.line, r.column, r.severity) for r in result.refusals], [(3, 1, "error")])
            self.assertFalse(os.path.exists(target))
            with self.assertRaises(deckscale.DeckError):
                result.write()
            marked = deckscale.scale(deckscale.read_text(deck), km=10, leave_unscalable=True)
            self.assertIn("R1 a 0 10k\n* deckscale: left unscaled:", marked.text)

    def test_bad_input_raises_deck_error_rendered_as_the_command_line_prints_it(self):
        text = "title\nR1 a 0 1.2.3k\n.end\n"
        with TempDir() as d:
            write_bytes(os.path.join(d, "bad.cir"), text)
            ran = cli("scale", "bad.cir", "--km", "2", cwd=d)
            self.assertEqual(ran.returncode, 2)
            with self.assertRaises(deckscale.DeckError) as caught:
                deckscale.scale(deckscale.read_text(text, "bad.cir"), km=2)
        e = caught.exception
        self.assertEqual((e.file, e.line, e.column, e.severity), ("bad.cir", 2, 8, "error"))
        self.assertEqual(e.rendered + "\n", ran.stderr.decode())
        self.assertEqual(str(e), e.rendered)
        self.assertEqual(e.diagnostic.source_line, "R1 a 0 1.2.3k")
        with self.assertRaises(deckscale.DeckError):
            deckscale.scale("/nonexistent/deck.cir", km=2)

    def test_the_library_prints_nothing(self):
        # Refusals, notes, a bad deck and a verification: all of it comes back as data.
        script = ("import deckscale\n"
                  "r = deckscale.scale(deckscale.read_text('t\\nR1 a 0 1k\\nY1 a 0 c 0 tm\\n.end\\n'), km=2)\n"
                  "assert r.refused\n"
                  "try:\n"
                  "    deckscale.scale(deckscale.read_text('t\\nR1 a 0 1.2.3k\\n.end\\n'), km=2)\n"
                  "except deckscale.DeckError:\n"
                  "    pass\n"
                  f"assert deckscale.verify({DEMO!r}, deckscale.scale({DEMO!r}, km=3), km=3, kf=1)['passed']\n")
        out = subprocess.run([sys.executable, "-c", script], capture_output=True, env=os.environ)
        self.assertEqual((out.returncode, out.stdout, out.stderr), (0, b"", b""))

    def test_factors_are_numbers_or_the_command_lines_factor_texts(self):
        self.assertAlmostEqual(deckscale.parse_factor("2*pi*10meg"), 2 * math.pi * 1e7)
        for bad in (-1, 0, "fifty", "-2"):
            with self.assertRaises(deckscale.DeckError, msg=repr(bad)):
                deckscale.scale(DEMO, km=bad)

    def test_the_input_is_never_the_output(self):
        with TempDir() as d:
            deck = os.path.join(d, "d.cir")
            write_bytes(deck, "t\nR1 a 0 1k\n.end\n")
            for target in (deck, os.path.join(d, ".", "d.cir")):
                with self.assertRaises(deckscale.DeckError):
                    deckscale.scale(deck, km=3, output=target)
            self.assertEqual(read_bytes(deck), b"t\nR1 a 0 1k\n.end\n")

    def test_bytes_that_are_not_utf8_survive(self):
        # A Latin-1 micro sign in a comment: kept as it is, as the command line keeps it.
        data = b"t\n* 1 \xb5H coil\nL1 a 0 1u\nR1 a 0 1\n.end\n"
        with TempDir() as d:
            path = os.path.join(d, "latin1.cir")
            write_bytes(path, data)
            ran = cli("scale", path, "--km", "2")
            result = deckscale.scale(path, km=2)
            self.assertEqual(result.files[0].data, ran.stdout)
            self.assertIn(b"\xb5H", result.files[0].data)
            again = deckscale.read_text(result.text, os.path.join(d, "again.cir"))
            self.assertEqual(again.data(), ran.stdout)

    def test_a_text_deck_finds_its_includes_beside_its_name(self):
        with TempDir() as d:
            write_bytes(os.path.join(d, "sub.inc"), "C2 a 0 1n\n")
            deck = deckscale.read_text("t\n.include sub.inc\nR1 a 0 1k\n.end\n", os.path.join(d, "v.cir"))
            self.assertEqual(len(deck.files), 2)
            result = deckscale.scale(deck, km=2, output=os.path.join(d, "out", "v.cir"), write=False)
            self.assertEqual([f.text for f in result.files],
                             ["C2 a 0 500p\n", "t\n.include sub-scaled.inc\nR1 a 0 2k\n.end\n"])
            self.assertEqual(result.deck().text(1), "C2 a 0 500p\n")
            self.assertFalse(os.path.exists(os.path.join(d, "out")))


if __name__ == "__main__":
    unittest.main()
