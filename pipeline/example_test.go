package pipeline_test

import (
	"fmt"

	"github.com/foilwright/foilwright/pipeline"
)

// Parse collects every problem of a pipeline file, each with its key path
// and line:column.
func ExampleParse() {
	file := []byte(`{
  "foilwright": 1,
  "name": "demo",
  "inputs": [{"files": ["testdata/points/r040.dat"], "unit": "mm"}],
  "prepare": {"panels": 160.5, "spacing": "sine"},
  "stages": [
    {"id": "a", "stage": "vortex-panel", "after": ["b"]},
    {"id": "b", "stage": "vortex-panel", "after": ["a"]}
  ]
}`)
	known := func(name string) bool { return name == "vortex-panel" }
	_, err := pipeline.Parse(file, "demo.json", pipeline.ParseOptions{Known: known})
	fmt.Println(err)
	// Output:
	// demo.json:4:54: inputs[0].unit: unknown key "unit" (did you mean "units"?)
	// demo.json:5:25: prepare.panels: want integer, got 160.5
	// demo.json:5:43: prepare.spacing: want one of "cosine", "half-cosine", "uniform", "curvature", got "sine"
	// demo.json:7:52: stages[0].after: dependency cycle: "a" after "b" after "a"
}
