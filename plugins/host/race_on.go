//go:build race

package host

// raceBuild is set in a binary built with the race detector, whose shadow
// memory no data limit allows: stages get no memory limit then.
const raceBuild = true
