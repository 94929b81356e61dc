package main

import "github.com/foilwright/foilwright/plugins/stage"

// request returns the request of a section document as the pipeline makes
// it.
func request(section []byte) stage.Request { return stage.Request{Section: section} }
