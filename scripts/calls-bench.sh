#!/usr/bin/env bash
# Measures the cost of stage calls, in one run, and prints the table of
# issue 14's "cheap stage calls" figures: a stage call beyond the solver's
# own time, 200 calls through child processes against the same calls in
# process, and the run folder of a section with three analysis stages and
# full detail kept.
#
# With BASELINE=<commit>, the same driver (internal/callbench) is built on
# that tree too, and the two take turns: round k runs one, then the other
# (the order swapped every round), so both see the same machine load. The
# run folders are those `foilwright run` of each tree writes for the rotor
# example's five stations with the three analysis stages.
#
# Usage: scripts/calls-bench.sh                       (ROUNDS=7 REPS=3)
#        BASELINE=main ROUNDS=9 scripts/calls-bench.sh
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/callbench-tree.sh
root=$PWD
rounds=${ROUNDS:-7}
reps=${REPS:-3}

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

go build -o "$tmp/fw-after" ./cmd/foilwright
go build -o "$tmp/callbench-after" ./internal/callbench
trees=(after)
if [ -n "${BASELINE:-}" ]; then
  # The earlier tree, driven by this driver (callbench-tree.sh).
  callbench_tree "$BASELINE" "$tmp/baseline"
  (cd "$tmp/baseline" && go build -o "$tmp/fw-before" ./cmd/foilwright && go build -o "$tmp/callbench-before" ./internal/callbench)
  trees=(before after)
fi

# The rotor's five stations through the three analysis stages, every
# document kept: the run folder whose size is measured, and the sections
# whose calls are timed.
cat >"$tmp/pipeline.json" <<EOF
{
  "foilwright": 1,
  "name": "calls-bench",
  "inputs": [
    {"name": "r300",  "files": ["$root/examples/rotor/blade-scan.stl"], "cut": "z=300"},
    {"name": "r500",  "files": ["$root/examples/rotor/blade-scan.stl"], "cut": "z=500"},
    {"name": "r700",  "files": ["$root/examples/rotor/blade-scan.stl"], "cut": "z=700"},
    {"name": "r900",  "files": ["$root/examples/rotor/blade-scan.stl"], "cut": "z=900"},
    {"name": "r1100", "files": ["$root/examples/rotor/blade-scan.stl"], "cut": "z=1100"}
  ],
  "prepare": {"units": "mm", "noise": 0.04, "te": "auto"},
  "stages": [
    {"id": "vortex", "stage": "vortex-panel", "params": {"alpha_deg": [-4, -2, 0, 2, 4, 6, 8, 10]}},
    {"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [-4, -2, 0, 2, 4, 6, 8, 10]}},
    {"id": "source", "stage": "source-panel", "params": {"alpha_deg": [0]}}
  ],
  "outputs": {"documents": ["section", "nodes", "results"]}
}
EOF
for t in "${trees[@]}"; do
  "$tmp/fw-$t" run "$tmp/pipeline.json" -o "$tmp/run-$t" -q
done
sections=$(ls "$tmp"/run-after/r*/section.json | paste -sd, -)

for ((k = 0; k < rounds; k++)); do
  order=("${trees[@]}")
  if ((k % 2 == 1)) && ((${#trees[@]} == 2)); then order=(after before); fi
  for t in "${order[@]}"; do
    "$tmp/callbench-$t" -sections "$sections" -reps "$reps" -round "$k" >>"$tmp/$t.jsonl"
  done
  echo "round $((k + 1)) of $rounds done" >&2
done

args=(-table -after "$tmp/after.jsonl" -folders-after "$tmp/run-after")
if [ -f "$tmp/before.jsonl" ]; then
  args+=(-before "$tmp/before.jsonl" -folders-before "$tmp/run-before")
fi
"$tmp/callbench-after" "${args[@]}"
