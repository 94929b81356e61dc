#!/usr/bin/env bash
# Runs the whole reliability campaign of issue 11 (internal/reliability):
# every bad input of every reader and of the pipeline file at full size
# (ten million lines, 2 GB on stdin, /dev/zero and /dev/urandom, JSON nested
# 400 000 deep, 100 MB pipeline files, 20 000-node sections), every stage
# fault, Ctrl-C at three moments, concurrent runs, verify of a tampered run,
# and symbolic links and special files, each as its own process against a
# foilwright binary, and prints the tables (outcome | count) and every case
# that is not clean. Each case runs with its data segment capped at 3 GiB
# and is ended after 90 s. It takes a few minutes on two cores.
#
#   scripts/reliability.sh                 # the binary of this tree
#   scripts/reliability.sh --rev REV       # the binary of git revision REV (e.g. main), for a before/after table
#   scripts/reliability.sh -run 'fault/'   # more flags go to the campaign command (-jobs, -run, -timeout, -dir)
#
# The case of -o onto a character device (made in the case folder) runs
# only against this tree's binary, which refuses it.
set -euo pipefail
cd "$(dirname "$0")/.."
rev=""
if [ "${1:-}" = "--rev" ]; then
  rev=$2
  shift 2
fi
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
mkdir -p "$work/bin"
go build -o "$work/reliability" ./internal/reliability/cmd/reliability
device=-device
if [ -n "$rev" ]; then
  mkdir "$work/src"
  git archive "$rev" | tar -x -C "$work/src"
  (cd "$work/src" && go build -o "$work/bin/foilwright" ./cmd/foilwright)
  device=""
  echo "foilwright of $rev ($(git rev-parse --short "$rev"))"
else
  go build -o "$work/bin/foilwright" ./cmd/foilwright
  echo "foilwright of this tree ($(git rev-parse --short HEAD)$(git diff --quiet || echo ', with changes'))"
fi
"$work/reliability" -foilwright "$work/bin/foilwright" $device "$@"
