//go:build !unix

package main

import "math"

// cpuTime is unknown here: NaN, printed as such.
func cpuTime() float64 { return math.NaN() }
