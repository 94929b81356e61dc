#!/usr/bin/env bash
# Measures the vortex-panel solver against its numpy peer and against the
# machine's limit, in one run, interleaved, and checks first that both give
# the same results. Prints: panels | Go ms | numpy ms | numpy/Go | limit ms
# | Go/limit (medians over rounds, with the range over rounds), and, if the
# Go build with -tags openblas succeeds, its columns too; then the
# processor time per solution of each program (user and system, all
# threads), which a load from other jobs changes far less than the wall
# time, with each program's ratio to the Go column's.
#
# Needs Debian's numpy on OpenBLAS and a C compiler:
#   apt-get install python3-numpy libopenblas0 libopenblas-dev gcc
#
# Usage: scripts/solver-bench.sh            (ROUNDS=7 REPS=3 by default)
#        ROUNDS=11 PANELS=200,400 scripts/solver-bench.sh
#        BASELINE=6b0b095 scripts/solver-bench.sh   (adds the solver at that
#                                                    commit as a column)
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
peers=()
if go build -tags openblas -o "$tmp/solverbench-openblas" ./internal/solverbench 2>"$tmp/go.log"; then
  peers+=(-go-peer "Go+OpenBLAS=$tmp/solverbench-openblas")
else
  echo "solver-bench: the -tags openblas build failed; timing the pure-Go build only:" >&2
  cat "$tmp/go.log" >&2
fi
if [ -n "${BASELINE:-}" ]; then
  # The solver at an earlier commit, driven by this driver: a plain copy of
  # that tree (git archive), this driver's main.go, and a describe.go for a
  # tree that may predate package dense.
  mkdir "$tmp/baseline"
  git archive "$BASELINE" | tar -x -C "$tmp/baseline"
  mkdir -p "$tmp/baseline/internal/solverbench"
  cp internal/solverbench/main.go internal/solverbench/cputime_*.go "$tmp/baseline/internal/solverbench/"
  if [ -d "$tmp/baseline/internal/dense" ]; then
    cp internal/solverbench/describe.go "$tmp/baseline/internal/solverbench/"
  else
    printf 'package main\n\nfunc factorisation() string { return "gonum mat.LU" }\n' >"$tmp/baseline/internal/solverbench/describe.go"
  fi
  (cd "$tmp/baseline" && go build -o "$tmp/solverbench-baseline" ./internal/solverbench)
  peers+=(-go-peer "Go at $BASELINE=$tmp/solverbench-baseline")
fi

"$tmp/solverbench" -check -python "$python"
echo
"$tmp/solverbench" -python "$python" -dgetrf "$tmp/dgetrf_rate" "${peers[@]}" \
  -rounds "${ROUNDS:-7}" -reps "${REPS:-3}" -panels "${PANELS:-100,200,400,800,1600}"
