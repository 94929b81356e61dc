#!/usr/bin/env bash
# Writes cmd/foilwright/default.pgo, the processor profile the Go tool
# uses to optimise the foilwright binary (profile-guided optimisation:
# `go build ./cmd/foilwright` reads a default.pgo beside the main package
# by itself). The profile is that of the geometry chain, prep's work:
# BenchmarkPrepare on scans of 1e3, 1e4 and 1e5 points. Run it again
# after large changes to the chain; a stale profile still builds, it only
# optimises less.
#
#   scripts/pgo-profile.sh            # BENCHTIME=20x
set -euo pipefail
cd "$(dirname "$0")/.."

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
# Without PGO itself, so that the profile does not depend on the one before.
go test -pgo=off -c -o "$tmp/prep.test" ./prep
"$tmp/prep.test" -test.run '^$' -test.bench '^BenchmarkPrepare$' \
  -test.benchtime "${BENCHTIME:-20x}" -test.cpuprofile "$tmp/cpu.pprof" > "$tmp/bench.txt"
cat "$tmp/bench.txt"
cp "$tmp/cpu.pprof" cmd/foilwright/default.pgo
echo "wrote cmd/foilwright/default.pgo ($(wc -c < cmd/foilwright/default.pgo) bytes)"
