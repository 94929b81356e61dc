//go:build !race

package host

// raceBuild is set in a binary built with the race detector.
const raceBuild = false
