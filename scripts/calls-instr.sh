#!/usr/bin/env bash
# Counts the instructions of the 200-call batch of scripts/calls-bench.sh
# (a NACA 2412 of 160 panels at 17 angles, spread over the three analysis
# stages in turn): once in process, once through stage processes, the
# driver and each stage process counted apart (valgrind's cachegrind,
# following the stage processes the driver starts). Instruction counts do
# not move with the machine's load, where wall and processor times on a
# shared machine do; but they count user-space instructions only: the
# kernel's share (system calls, context switches, page faults) and the
# time threads wait are not in them, so the ratio they give is a floor
# under the ratio of times, and a change of the scheduler's behaviour
# shows less than in times (valgrind runs one thread at a time).
#
# Each figure is the difference of two runs, N2 and N1 calls, over N2−N1
# calls, so that starting the processes cancels out. With
# BASELINE=<commit> the same driver is built on that tree too and counted
# the same way.
#
# Usage: scripts/calls-instr.sh                     (N1=15 N2=45)
#        BASELINE=main scripts/calls-instr.sh
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/callbench-tree.sh
n1=${N1:-15}
n2=${N2:-45}
command -v valgrind >/dev/null || { echo "calls-instr: needs valgrind (apt-get install valgrind)" >&2; exit 2; }

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

go build -o "$tmp/callbench-after" ./internal/callbench
trees=(after)
if [ -n "${BASELINE:-}" ]; then
  # The earlier tree, driven by this driver (callbench-tree.sh).
  callbench_tree "$BASELINE" "$tmp/baseline"
  (cd "$tmp/baseline" && go build -o "$tmp/callbench-before" ./internal/callbench)
  trees=(before after)
fi

# count TREE MODE N prints the instructions of the driver and of the stage
# processes of one run of N calls.
count() {
  local dir="$tmp/cg-$1-$2-$3" host=0 stages=0 f n
  mkdir "$dir"
  valgrind --tool=cachegrind --cache-sim=no --trace-children=yes \
    --cachegrind-out-file="$dir/out.%p" \
    "$tmp/callbench-$1" -only "$2" -batch "$3" >/dev/null 2>"$dir/stderr" ||
    { echo "calls-instr: $1 $2 $3 failed:" >&2; tail -5 "$dir/stderr" >&2; exit 1; }
  for f in "$dir"/out.*; do
    n=$(awk '/^summary:/ {print $2; exit}' "$f")
    if grep -q '^cmd:.* __stage ' "$f"; then stages=$((stages + n)); else host=$((host + n)); fi
  done
  echo "$host $stages"
}

echo "instructions per call, millions (valgrind cachegrind; the difference of runs of $n2 and $n1 calls)"
echo
echo "| tree | in process | through child processes: driver | stage processes | all | child / in process |"
echo "| --- | --- | --- | --- | --- | --- |"
for t in "${trees[@]}"; do
  read -r ih1 _ < <(count "$t" in "$n1")
  read -r ih2 _ < <(count "$t" in "$n2")
  read -r sh1 ss1 < <(count "$t" sub "$n1")
  read -r sh2 ss2 < <(count "$t" sub "$n2")
  awk -v t="$t" -v d=$((n2 - n1)) -v i=$((ih2 - ih1)) -v h=$((sh2 - sh1)) -v s=$((ss2 - ss1)) 'BEGIN {
    printf "| %s | %.3f | %.3f | %.3f | %.3f | %.3f |\n", t, i/d/1e6, h/d/1e6, s/d/1e6, (h+s)/d/1e6, (h+s)/i
  }'
done
