#!/usr/bin/env bash
# The installed package, used from outside the tree: `cmake --install` into a temporary
# prefix, a consumer project configured and built against it with find_package(deckscale),
# and (with the module) a Python script importing the installed module. Each scales the demo
# deck and verifies the pair; the written deck and the report must equal the command line's
# byte for byte. Usage: package_test.sh BUILD_DIR SOURCE_DIR [PYTHON PYTHON_DIR]
# (PYTHON: the interpreter the module was built for; PYTHON_DIR: where it is installed,
# relative to the prefix unless absolute.)
set -euo pipefail
build=$1 source=$2 python=${3:-} python_dir=${4:-}
work=$(mktemp -d "${TMPDIR:-/tmp}/deckscale-package-XXXXXX")
trap 'rm -rf "$work"' EXIT
prefix=$work/prefix
cmake --install "$build" --prefix "$prefix" >/dev/null
for f in bin/deckscale include/deckscale/scale.hpp include/deckscale/verify.hpp \
         include/deckscale/deck.hpp include/deckscale/diagnostic.hpp \
         lib/cmake/deckscale/deckscaleConfig.cmake lib/cmake/deckscale/deckscaleConfigVersion.cmake; do
    [ -e "$prefix/$f" ] || { echo "not installed: $f" >&2; exit 1; }
done
# No internal header is installed.
extra=$(ls "$prefix/include/deckscale" | grep -v -x -e deck.hpp -e scale.hpp -e verify.hpp \
        -e diagnostic.hpp || true)
[ -z "$extra" ] || { echo "installed beyond the public headers: $extra" >&2; exit 1; }

deck=$source/netlists/demo/ladder5_proto.cir
run() {  # in $work/run, so that every report names the same two paths
    (cd "$work/run" && "$@")
}
mkdir -p "$work/run"
run "$prefix/bin/deckscale" scale "$deck" --km 50 --kf '2*pi*10meg' -o out.cir 2>/dev/null
run "$prefix/bin/deckscale" verify "$deck" out.cir --km 50 --kf '2*pi*10meg' >"$work/cli.txt"
mv "$work/run/out.cir" "$work/cli.cir"

cmake -S "$source/tests/deckscale/consumer" -B "$work/consumer" -DCMAKE_PREFIX_PATH="$prefix" \
    -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$work/consumer" >/dev/null
run "$work/consumer/consumer" "$deck" out.cir >"$work/cpp.txt"
cmp "$work/cli.cir" "$work/run/out.cir"
cmp "$work/cli.txt" "$work/cpp.txt"
rm "$work/run/out.cir"
echo "C++ consumer: the written deck and the report equal the command line's"

if [ -n "$python" ]; then
    case $python_dir in /*) ;; *) python_dir=$prefix/$python_dir ;; esac
    run env PYTHONPATH="$python_dir" "$python" "$source/tests/deckscale/consumer/consumer.py" \
        "$deck" out.cir >"$work/py.txt"
    cmp "$work/cli.cir" "$work/run/out.cir"
    cmp "$work/cli.txt" "$work/py.txt"
    echo "Python consumer: the written deck and the report equal the command line's"
fi
