#!/usr/bin/env bash
# Regenerates the Go code of the stage protocol (plugins/gen) from
# plugins/proto with protoc and the generators pinned as tools in go.mod
# (protoc-gen-go v1.36.12, protoc-gen-go-grpc v1.6.2). The output is
# committed; CI runs this script and fails if it changes anything.
set -euo pipefail
cd "$(dirname "$0")/.."

command -v protoc >/dev/null || { echo "genproto: protoc is not installed" >&2; exit 1; }

module=github.com/foilwright/foilwright/plugins/gen
gen_go=$(go tool -n protoc-gen-go)
gen_grpc=$(go tool -n protoc-gen-go-grpc)

protoc \
  --plugin=protoc-gen-go="$gen_go" \
  --plugin=protoc-gen-go-grpc="$gen_grpc" \
  -I plugins/proto \
  --go_out=plugins/gen --go_opt=module="$module" \
  --go-grpc_out=plugins/gen --go-grpc_opt=module="$module" \
  stage/v1/stage.proto
