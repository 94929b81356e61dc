#!/usr/bin/env bash
# Regenerates the pictures of the README (docs/pictures/*.svg) from the
# bundled examples: prep of the tunnel-model probe, the tunnel-model pipeline
# (Cp, polar, streamlines, the model against its design) and the rotor
# pipeline (stations, the blade at r700 against its design).
set -euo pipefail
cd "$(dirname "$0")/.."
out=docs/pictures
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
mkdir -p "$out"
go build -o "$tmp/foilwright" ./cmd/foilwright
go build -o examples/blade-stiffness/blade-stiffness ./examples/blade-stiffness
fw="$tmp/foilwright"

"$fw" prep examples/tunnel-model/probe.csv -q -o "$tmp/probe.json" --plot "$tmp/probe.svg"
for p in prep deviation section; do
  src="$tmp/probe-$p.svg"; [ "$p" = prep ] && src="$tmp/probe.svg"
  cp "$src" "$out/probe-$p.svg"
done

"$fw" run examples/tunnel-model/pipeline.json -q -o "$tmp/tunnel"
cp "$tmp/tunnel/midspan/plots/cp-vortex.svg" "$out/tunnel-cp.svg"
cp "$tmp/tunnel/midspan/plots/polar.svg" "$out/tunnel-polar.svg"
cp "$tmp/tunnel/midspan/plots/streamlines-vortex.svg" "$out/tunnel-streamlines.svg"
cp "$tmp/tunnel/midspan/plots/compare.svg" "$out/tunnel-compare.svg"
cp "$tmp/tunnel/midspan/plots/compare-deviation.svg" "$out/tunnel-compare-deviation.svg"

# The printed blade is out of tolerance at its trailing edge: run exits 3.
"$fw" run examples/rotor/pipeline.json -q --jobs 2 -o "$tmp/rotor" || [ $? -eq 3 ]
cp "$tmp/rotor/stations.svg" "$out/rotor-stations.svg"
cp "$tmp/rotor/r700/plots/compare.svg" "$out/rotor-r700-compare.svg"
cp "$tmp/rotor/r700/plots/compare-deviation.svg" "$out/rotor-r700-compare-deviation.svg"
cp "$tmp/rotor/r700/plots/compare-dcp.svg" "$out/rotor-r700-compare-dcp.svg"
cp "$tmp/rotor/r700/plots/prep.svg" "$out/rotor-r700-prep.svg"
cp "$tmp/rotor/r700/plots/cp-vortex.svg" "$out/rotor-r700-cp.svg"
ls -l "$out"
