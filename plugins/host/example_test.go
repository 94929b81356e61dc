package host_test

import (
	"context"
	"fmt"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// A Runner starts its stage on first use and reuses the process for every
// later call; Close on the Host ends it. Here the stage is a toy served by
// the test binary, as built-in stages are served by foilwright itself.
func ExampleRunner_Run() {
	h, err := host.New(host.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer h.Close()
	r := h.Runner(host.Builtin("echo"))
	for range 3 {
		reply, err := r.Run(context.Background(), stage.Request{Section: section, SectionName: "toy.json"})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Println(reply.Doc.Stage, reply.Doc.Cases[0].CL == float64(len(section)))
	}
	fmt.Println("processes started:", r.Starts())

	_, err = r.Run(context.Background(), stage.Request{Section: section, Params: []byte(`{"fail": "diverged"}`), SectionName: "toy.json"})
	fmt.Println(err)
	// Output:
	// echo true
	// echo true
	// echo true
	// processes started: 1
	// stage "echo" on toy.json: run: singular system
}
