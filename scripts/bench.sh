#!/usr/bin/env bash
# Runs the scaling benchmarks of every package in one go and prints the
# measured time ratios between sizes next to the ratios linear, n log n and
# cubic growth would give. Usage: scripts/bench.sh [go test -bench regexp]
set -euo pipefail
cd "$(dirname "$0")/.."
pattern=${1:-.}
go test -run '^$' -bench "$pattern" -benchmem -benchtime=${BENCHTIME:-1s} -count=1 ./... 2>&1 | tee /tmp/foilwright-bench.txt | go run ./internal/benchratio
