#!/usr/bin/env bash
# Measures the vortex-panel solver against its numpy peer and against the
# machine's limit, in one run, interleaved, and checks first that both give
# the same results. Prints: panels | Go ms | numpy ms | numpy/Go | limit ms
# | Go/limit (medians over rounds, with the range over rounds), and, if the
# Go build with -tags openblas succeeds, its columns too.
#
# Needs Debian's numpy on OpenBLAS and a C compiler:
#   apt-get install python3-numpy libopenblas0 libopenblas-dev gcc
#
# Usage: scripts/solver-bench.sh            (ROUNDS=7 REPS=3 by default)
#        ROUNDS=11 PANELS=200,400 scripts/solver-bench.sh
set -euo pipefail
cd "$(dirname "$0")/.."

python=${PYTHON:-/usr/bin/python3}
if ! "$python" -c 'import numpy' 2>/dev/null; then
  echo "solver-bench: $python has no numpy; install it: apt-get install python3-numpy libopenblas0" >&2
  exit 2
fi
if ! command -v cc >/dev/null; then
  echo "solver-bench: no C compiler for the OpenBLAS rate program; apt-get install gcc" >&2
  exit 2
fi

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

if ! cc -O2 -o "$tmp/dgetrf_rate" scripts/peer/dgetrf_rate.c -lopenblas 2>"$tmp/cc.log"; then
  cat "$tmp/cc.log" >&2
  echo "solver-bench: cannot link against OpenBLAS; apt-get install libopenblas-dev" >&2
  exit 2
fi
go build -o "$tmp/solverbench" ./internal/solverbench
peer_go=()
if go build -tags openblas -o "$tmp/solverbench-openblas" ./internal/solverbench 2>"$tmp/go.log"; then
  peer_go=(-peer-go "$tmp/solverbench-openblas" -peer-go-name "Go+OpenBLAS")
else
  echo "solver-bench: the -tags openblas build failed; timing the pure-Go build only:" >&2
  cat "$tmp/go.log" >&2
fi

"$tmp/solverbench" -check -python "$python"
echo
"$tmp/solverbench" -python "$python" -dgetrf "$tmp/dgetrf_rate" "${peer_go[@]}" \
  -rounds "${ROUNDS:-7}" -reps "${REPS:-3}" -panels "${PANELS:-100,200,400,800,1600}"
