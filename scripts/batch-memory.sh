#!/usr/bin/env bash
# The memory of the process that runs a batch, against the number of
# sections (issue 13): blade batches of the weather-mast rotor (invented
# data, internal/demogen -batch: slices of printed blades at five stations)
# run through the vortex-panel and thin-aerofoil stages by
# internal/batchmem, which runs the pipeline as `foilwright run` does and
# reports its own peak resident memory (the stage processes apart). Prints
# the peak at each size, the memory added per section, and the ratio of
# the largest batch's peak to the smallest's: 1 when the memory is flat in
# the number of sections, the ratio of the sizes when it grows in
# proportion.
#
#   scripts/batch-memory.sh                   # 1000 and 10000 sections (about 10 minutes on two cores)
#   SIZES="200 2000" scripts/batch-memory.sh  # other sizes
#   BASELINE=main scripts/batch-memory.sh     # also the same measurement at another revision
#
# POINTS (200) sets the points of each slice, JOBS (2) the sections made
# at once.
set -euo pipefail
cd "$(dirname "$0")/.."

sizes=${SIZES:-1000 10000}
points=${POINTS:-200}
jobs=${JOBS:-2}
work=$(mktemp -d "${TMPDIR:-/tmp}/foilwright-batchmem.XXXXXX")
trap 'rm -rf "$work"' EXIT

build() { # build NAME SRC: foilwright and batchmem of the tree SRC
  mkdir -p "$work/$1"
  (cd "$2" && go build -o "$work/$1/foilwright" ./cmd/foilwright && go build -o "$work/$1/batchmem" ./internal/batchmem)
}
builds=(this)
build this .
if [ -n "${BASELINE:-}" ]; then
  # The baseline's source, read from git (no worktree), with this tree's
  # driver, which uses only what the pipeline package had before.
  mkdir -p "$work/src-base"
  git archive "$BASELINE" | tar -x -C "$work/src-base"
  mkdir -p "$work/src-base/internal/batchmem"
  cp internal/batchmem/main.go "$work/src-base/internal/batchmem/"
  build base "$work/src-base"
  builds+=(base)
fi

printf '%-6s %9s %12s %10s %9s\n' build sections peak_MiB wall_s ok
declare -A peak
for n in $sizes; do
  blades=$(( (n + 4) / 5 ))
  go run ./internal/demogen -batch "$work/batch-$n" -blades "$blades" -points "$points" >/dev/null
  cat > "$work/batch-$n/pipeline.json" <<'JSON'
{
  "foilwright": 1,
  "name": "blade-batch-memory",
  "inputs": [{"files": ["scans/*.csv"], "per_file": true}],
  "prepare": {"units": "mm", "noise": 0.03},
  "stages": [
    {"id": "vortex", "stage": "vortex-panel", "params": {"alpha_deg": [0, 4]}},
    {"id": "thin", "stage": "thin-aerofoil", "params": {"alpha_deg": [0, 4]}}
  ],
  "outputs": {"folder": "run"}
}
JSON
  for b in "${builds[@]}"; do
    out=$("$work/$b/batchmem" -pipeline "$work/batch-$n/pipeline.json" -o "$work/run-$b-$n" \
      -stages "$work/$b/foilwright" -jobs "$jobs")
    rm -rf "$work/run-$b-$n"
    read -r secs ok wall kib < <(python3 -c 'import json,sys; d=json.loads(sys.argv[1]); print(d["sections"], d["ok"], d["wall_s"], d["peak_rss_kib"])' "$out")
    peak[$b,$n]=$kib
    printf '%-6s %9d %12.1f %10.1f %9d\n' "$b" "$secs" "$(echo "$kib / 1024" | bc -l)" "$wall" "$ok"
  done
done

set -- $sizes
lo=$1; hi=${!#}
if [ "$lo" != "$hi" ]; then
  echo
  printf '%-6s %28s %26s\n' build "KB per section, $lo->$hi" "peak ratio $hi/$lo"
  for b in "${builds[@]}"; do
    a=${peak[$b,$lo]}; z=${peak[$b,$hi]}
    printf '%-6s %28.2f %26.2f\n' "$b" "$(echo "($z - $a) * 1.024 / ($hi - $lo)" | bc -l)" "$(echo "$z / $a" | bc -l)"
  done
fi
