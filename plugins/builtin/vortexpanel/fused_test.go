//go:build !amd64.v3

package vortexpanel

// fusedMath reports whether the compiler may fuse the multiply-adds of the
// Go formulas (GOAMD64=v3 and up), which the assembly build does not.
const fusedMath = false
