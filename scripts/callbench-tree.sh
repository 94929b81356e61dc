# Sourced by calls-bench.sh and calls-instr.sh (not run on its own).
#
# callbench_tree REV DIR unpacks the tree of REV into DIR with this
# checkout's callbench driver (main.go) and, when REV predates packed
# nodes, a request.go of the plain kind, so that one driver measures both
# trees.
callbench_tree() {
  mkdir "$2"
  git archive "$1" | tar -x -C "$2"
  mkdir -p "$2/internal/callbench"
  cp internal/callbench/main.go "$2/internal/callbench/"
  if [ ! -f "$2/internal/callbench/request.go" ]; then
    printf 'package main\n\nimport "github.com/foilwright/foilwright/plugins/stage"\n\nfunc request(section []byte) stage.Request { return stage.Request{Section: section} }\n' \
      >"$2/internal/callbench/request.go"
  fi
}
