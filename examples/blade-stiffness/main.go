// Command blade-stiffness is a foilwright stage, written only against the
// stage SDK, that gives a blade builder the mass per metre of span and the
// flapwise and edgewise bending stiffness of a section, from the area and
// second moments that prep records and the chord of the section's frame.
//
// It is started by a foilwright host, never by hand: it speaks the stage
// protocol on stdout and prints nothing else there. See README.md.
package main

import "github.com/foilwright/foilwright/plugins/sdk"

func main() {
	sdk.Serve(BladeStiffness{})
}
