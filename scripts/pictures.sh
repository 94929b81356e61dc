#!/usr/bin/env bash
# Regenerates the pictures of the README (docs/pictures/*.png) from the
# bundled examples: prep of the tunnel-model probe, the tunnel-model pipeline
# (Cp, polar, streamlines) and the rotor pipeline (stations).
set -euo pipefail
cd "$(dirname "$0")/.."
out=docs/pictures
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
mkdir -p "$out"
go build -o "$tmp/foilwright" ./cmd/foilwright
go build -o examples/blade-stiffness/blade-stiffness ./examples/blade-stiffness
fw="$tmp/foilwright"

"$fw" prep examples/tunnel-model/probe.csv -q -o "$tmp/probe.json" --plot "$tmp/probe.png"
for p in prep deviation section; do
  src="$tmp/probe-$p.png"; [ "$p" = prep ] && src="$tmp/probe.png"
  cp "$src" "$out/probe-$p.png"
done

"$fw" run examples/tunnel-model/pipeline.json --quiet --out "$tmp/tunnel" >/dev/null
cp "$tmp/tunnel/midspan/plots/cp-vortex.png" "$out/tunnel-cp.png"
cp "$tmp/tunnel/midspan/plots/polar.png" "$out/tunnel-polar.png"
cp "$tmp/tunnel/midspan/plots/streamlines-vortex.png" "$out/tunnel-streamlines.png"

"$fw" run examples/rotor/pipeline.json --quiet --jobs 2 --out "$tmp/rotor" >/dev/null
cp "$tmp/rotor/stations.png" "$out/rotor-stations.png"
cp "$tmp/rotor/r700/plots/prep.png" "$out/rotor-r700-prep.png"
ls -l "$out"
