# consumer.py DECK OUT: the Python module installed by cmake --install, doing what main.cpp
# does (tests/deckscale/package_test.sh).
import sys

import deckscale

result = deckscale.scale(sys.argv[1], km=50, kf="2*pi*10meg", output=sys.argv[2])
report = deckscale.verify(sys.argv[1], sys.argv[2], km=50, kf="2*pi*10meg")
sys.stdout.write(report["text"])
sys.exit(0 if report["passed"] else 1)
