#!/usr/bin/env bash
# Times the whole `foilwright prep` process on invented scans of NACA 2412
# (internal/prepbench: 152.4 mm chord, shuffled, 0.02 mm noise) at each
# size: the wall and user processor time to the millisecond (bash's time)
# and the peak resident memory (/usr/bin/time). It prints the medians, the
# growth per decade next to the n log n ratio and, with BASELINE set, the
# same figures for that revision and the ratios baseline / this tree, all
# from one run (the builds interleaved, so that the load of the machine
# falls on both alike).
#
#   scripts/prep-bench.sh                       # 1e4 1e5 1e6 points, this tree
#   BASELINE=main scripts/prep-bench.sh         # also main, and the ratios
#   SIZES="10000 100000" REPEAT=5 scripts/prep-bench.sh
#
# REPEAT (3) runs each size that many times (the 1e6 scan once unless
# REPEAT_LARGE is set). Every build must write the same section document
# for the same scan; a difference is reported.
#
# RT=1 runs each timed process under the real-time policy (chrt -f 1, which
# needs root or CAP_SYS_NICE), ahead of every ordinary process: on a
# machine that others load, it measures what a quiet machine would show
# (each run holds both cores for its few seconds at most).
set -euo pipefail
cd "$(dirname "$0")/.."

sizes=${SIZES:-10000 100000 1000000}
repeat=${REPEAT:-3}
repeat_large=${REPEAT_LARGE:-1}
work=$(mktemp -d "${TMPDIR:-/tmp}/foilwright-prepbench.XXXXXX")
trap 'rm -rf "$work"' EXIT

builds=(this)
mkdir -p "$work/this"
go build -o "$work/this/foilwright" ./cmd/foilwright
if [ -n "${BASELINE:-}" ]; then
  mkdir -p "$work/src-base" "$work/base"
  git archive "$BASELINE" | tar -x -C "$work/src-base"
  (cd "$work/src-base" && go build -o "$work/base/foilwright" ./cmd/foilwright)
  builds+=(base)
fi

rt=
[ -n "${RT:-}" ] && rt="chrt -f 1"
declare -A wall user peak
TIMEFORMAT='%3R %3U'
for n in $sizes; do
  go run ./internal/prepbench -n "$n" -o "$work/scan-$n.csv"
  r=$repeat
  [ "$n" -ge 1000000 ] && r=$repeat_large
  for b in "${builds[@]}"; do : > "$work/$b-$n.times"; done
  for ((k = 0; k < r; k++)); do
    for b in "${builds[@]}"; do
      # wall and user seconds (bash), then peak KiB (/usr/bin/time).
      { time $rt /usr/bin/time -f '%M' -o "$work/peak" "$work/$b/foilwright" prep "$work/scan-$n.csv" \
        --limit input-lines=$((n + 100)) -q -o "$work/$b-$n.json"; } 2> "$work/time"
      echo "$(tail -n 1 "$work/time") $(cat "$work/peak")" >> "$work/$b-$n.times"
    done
  done
  for b in "${builds[@]}"; do
    wall[$b,$n]=$(sort -n -k1,1 "$work/$b-$n.times" | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}')
    user[$b,$n]=$(sort -n -k2,2 "$work/$b-$n.times" | awk '{a[NR]=$2} END {print a[int((NR+1)/2)]}')
    peak[$b,$n]=$(sort -n -k3,3 "$work/$b-$n.times" | awk '{a[NR]=$3} END {printf "%.1f", a[int((NR+1)/2)]/1024}')
  done
  if [ -n "${BASELINE:-}" ] && ! cmp -s "$work/this-$n.json" "$work/base-$n.json"; then
    echo "note: at $n points the section documents of this tree and $BASELINE differ"
  fi
done

echo "load average: $(cut -d' ' -f1-3 /proc/loadavg)${rt:+ (runs under $rt)}"
printf '%-6s %9s %9s %9s %10s %9s %9s\n' build points wall_s user_s peak_MiB growth nlogn
for b in "${builds[@]}"; do
  prev=
  for n in $sizes; do
    g=- l=-
    if [ -n "$prev" ]; then
      g=$(awk -v a="${wall[$b,$n]}" -v c="${wall[$b,$prev]}" 'BEGIN {printf "%.1f", a/c}')
      l=$(awk -v n="$n" -v p="$prev" 'BEGIN {printf "%.1f", n*log(n)/(p*log(p))}')
    fi
    printf '%-6s %9s %9s %9s %10s %9s %9s\n' "$b" "$n" "${wall[$b,$n]}" "${user[$b,$n]}" "${peak[$b,$n]}" "$g" "$l"
    prev=$n
  done
done
if [ -n "${BASELINE:-}" ]; then
  printf '\n%9s %14s %14s %14s\n' points time_base/this user_base/this peak_base/this
  for n in $sizes; do
    printf '%9s %14s %14s %14s\n' "$n" \
      "$(awk -v a="${wall[base,$n]}" -v c="${wall[this,$n]}" 'BEGIN {printf "%.2f", a/c}')" \
      "$(awk -v a="${user[base,$n]}" -v c="${user[this,$n]}" 'BEGIN {printf "%.2f", a/c}')" \
      "$(awk -v a="${peak[base,$n]}" -v c="${peak[this,$n]}" 'BEGIN {printf "%.2f", a/c}')"
  done
fi
