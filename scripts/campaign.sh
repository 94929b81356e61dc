#!/usr/bin/env bash
# Runs the robustness campaign of the geometry chain (issue 10): N generated
# scans with known truth (invented data, internal/scangen) from seed SEED on,
# through the chain in process on every core, and prints the table
# "figure | target | measured", the failure messages and the breakdowns.
# Extra arguments go to the command, e.g. -dump DIR to keep the files of the
# failed and wrong cases with a repro line each (DIR/repro.txt).
#
#   scripts/campaign.sh [N] [SEED] [-dump DIR] [-workers K]
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-2000}
seed=${2:-1}
shift $(( $# > 2 ? 2 : $# ))
go run ./internal/campaign/cmd/campaign -n "$n" -seed "$seed" "$@"
