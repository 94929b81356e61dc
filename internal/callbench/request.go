package main

import "github.com/foilwright/foilwright/plugins/stage"

// request returns the request of a section document as the pipeline makes
// it: the document without its nodes, and the nodes.
func request(section []byte) stage.Request {
	rest, nodes, err := stage.SplitNodes(section)
	if err != nil {
		panic(err)
	}
	return stage.Request{Section: rest, Nodes: nodes}
}
