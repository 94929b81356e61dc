#!/usr/bin/env bash
# Throughput of the blade batch (issue 13) on one machine and as a 4-task
# Slurm job array, and the cost model of `foilwright jobscript` checked
# against them. In one run:
#
#  1. writes two batches of the weather-mast rotor's printed blades
#     (invented data, internal/demogen -batch): 40 slices of 1 000 points
#     (8 blades × 5 stations, the pipeline of the demo batch: vortex-panel
#     at 4 angles, thin-aerofoil, source-panel) and 10 dense slices of
#     10 000 points;
#  2. runs each on one core (--jobs 1) and fits the cost model to the two
#     manifests (jobscript --calibrate, twice);
#  3. runs the 40 sections with --jobs 2 (every core of a two-core machine)
#     and, on a single-node Slurm cluster, as the 4-task array of the
#     generated job script (one CPU a task), then merges: measured wall
#     time against the model's;
#  4. times the merge of 40 and of 200 sections (the larger batch's shards
#     made here) and projects the wall time of 100 000 such sections on N
#     cores: the run from the model, and the merge.
#
# The cluster: SLURM_CONF names a running one; else, as root with
# slurm-wlm and munge installed, the script starts one of its own
# (scripts/slurm-cluster.sh, port 26917) and stops it at the end; else
# step 3 runs on one machine only.
#
#   scripts/batch-throughput.sh          # about 2 minutes on two cores
set -euo pipefail
cd "$(dirname "$0")/.."

work=$(mktemp -d "${TMPDIR:-/tmp}/foilwright-throughput.XXXXXX")
cluster=""
cleanup() {
  [ -n "$cluster" ] && scripts/slurm-cluster.sh stop "$cluster"
  rm -rf "$work"
}
trap cleanup EXIT

load0=$(cut -d' ' -f1 /proc/loadavg)
fw=$work/foilwright
go build -o "$fw" ./cmd/foilwright
go run ./internal/demogen -batch "$work/sparse" -blades 8 >/dev/null
go run ./internal/demogen -batch "$work/dense" -blades 2 -points 10000 >/dev/null
cores=$(nproc)

now() { date +%s.%N; }
# timed NAME CMD...: runs CMD, sets $took to its wall seconds
# A run whose sections did not all succeed (exit 1, or 2 when a stage
# refused a section) is timed all the same and said so; any other failure
# stops the script.
timed() {
  local t0 rc=0; t0=$(now)
  "$@" || rc=$?
  took=$(echo "$(now) - $t0" | bc -l)
  case $rc in
  0) ;;
  1 | 2) echo "(not every section succeeded: $*)" ;;
  *) echo "failed ($rc): $*" >&2; exit "$rc" ;;
  esac
}
js() { python3 -c 'import json,sys; print(json.load(open(sys.argv[1]))[sys.argv[2]])' "$@"; }

timed "$fw" run "$work/sparse/pipeline.json" -o "$work/sparse-1" --jobs 1 -q; sparse1=$took
timed "$fw" run "$work/dense/pipeline.json" -o "$work/dense-1" --jobs 1 -q; dense1=$took
"$fw" jobscript "$work/sparse/pipeline.json" --tasks 4 --run-folder "$work/array" -o "$work/array.sbatch" --json \
  --calibrate "$work/sparse-1/manifest.json" --calibrate "$work/dense-1/manifest.json" > "$work/est.json"
fixed=$(js "$work/est.json" model_fixed_s); permb=$(js "$work/est.json" model_per_mb_s)
core_s=$(js "$work/est.json" core_s); dearest=$(js "$work/est.json" dearest_task_core_s)
"$fw" jobscript "$work/dense/pipeline.json" -o "$work/dense.sbatch" --json \
  --calibrate "$work/sparse-1/manifest.json" --calibrate "$work/dense-1/manifest.json" > "$work/est-dense.json"

timed "$fw" run "$work/sparse/pipeline.json" -o "$work/sparse-$cores" --jobs "$cores" -q; sparseN=$took

echo "cost model, fitted to the two one-core runs: $(printf '%.3f' "$fixed") s + $(printf '%.3f' "$permb") s per MB of input a section (core-seconds)"
printf '%-44s %9s %9s %10s %14s\n' run sections wall_s predicted "sections/s/core"
row() { printf '%-44s %9d %9.1f %10.1f %14.2f\n' "$1" "$2" "$3" "$4" "$(echo "$2 / $3 / $5" | bc -l)"; }
row "dense, 10 000 points, --jobs 1" 10 "$dense1" "$(js "$work/est-dense.json" core_s)" 1
row "sparse, 1 000 points, --jobs 1" 40 "$sparse1" "$core_s" 1
row "sparse, --jobs $cores" 40 "$sparseN" "$(echo "$core_s / $cores" | bc -l)" "$cores"

if [ -z "${SLURM_CONF:-}" ] && [ "$(id -u)" = 0 ] && command -v slurmctld >/dev/null && command -v munged >/dev/null; then
  cluster=$work/cluster
  scripts/slurm-cluster.sh start "$cluster" 26917 >/dev/null
  export SLURM_CONF=$cluster/slurm.conf
fi
if [ -n "${SLURM_CONF:-}" ]; then
  # The array alone (sbatch --wait), then the merge, each timed; 4 tasks
  # of one CPU take turns on the node's cores, so the model's time is the
  # dearest tasks' work shared by the cores (at least the dearest task).
  # From submission until the last task has left the queue, polled every
  # 0.1 s (sbatch --wait polls more slowly).
  t0=$(now)
  job=$(cd "$work" && sbatch --parsable array.sbatch); job=${job%%;*}
  while [ -n "$(squeue -h -j "$job" 2>/dev/null)" ]; do sleep 0.1; done
  array=$(echo "$(now) - $t0" | bc -l)
  for k in 0 1 2 3; do
    [ -f "$work/array/shards/$k-of-4/manifest.json" ] || { echo "task $k of the array wrote no manifest" >&2; exit 1; }
  done
  timed "$fw" merge "$work/array" -q; merge=$took
  pred=$(echo "a = $core_s / $cores; if (a < $dearest) a = $dearest; a" | bc -l)
  row "sparse, Slurm array of 4 tasks × 1 CPU" 40 "$array" "$pred" "$cores"
else
  echo "(no Slurm cluster: the array was not run; its shards are run here, one after the other)"
  for k in 0 1 2 3; do "$fw" run "$work/sparse/pipeline.json" -o "$work/array" --shard $k/4 --jobs "$cores" -q; done
  timed "$fw" merge "$work/array" -q; merge=$took
fi
row "merge of the 4 shards" 40 "$merge" 0 1
# The merge's time per section, from a batch five times larger (its shards
# made here): what the merge costs beside starting and writing the run's
# own files.
go run ./internal/demogen -batch "$work/big" -blades 40 >/dev/null
for k in 0 1 2 3; do "$fw" run "$work/big/pipeline.json" -o "$work/big-run" --shard $k/4 --jobs "$cores" -q || true; done
timed "$fw" merge "$work/big-run" -q; merge200=$took
row "merge of 4 shards of 200 sections" 200 "$merge200" 0 1
merge_per=$(echo "($merge200 - $merge) / 160" | bc -l)
merge_fixed=$(echo "m = $merge - 40 * $merge_per; if (m < 0) m = 0; m" | bc -l)

echo
echo "100 000 sections of 1 000 points, from the model ($(printf '%.3f' "$(echo "$core_s / 40" | bc -l)") core-seconds a section)"
echo "and the merge measured above ($(printf '%.2f' "$merge_fixed") s + $(printf '%.4f' "$merge_per") s a section, on one core, after the array):"
printf '%8s %12s %12s %12s\n' cores run_min merge_min total_min
for n in 2 16 64 256 1024; do
  r=$(echo "100000 * $core_s / 40 / $n / 60" | bc -l); m=$(echo "($merge_fixed + 100000 * $merge_per) / 60" | bc -l)
  printf '%8d %12.1f %12.1f %12.1f\n' "$n" "$r" "$m" "$(echo "$r + $m" | bc -l)"
done
echo "load average (1 min) at the start and the end: $load0, $(cut -d' ' -f1 /proc/loadavg) on $cores cores"
