//go:build race

package scangen

// raceEnabled is true under the race detector, which slows generation
// down about tenfold; the tests then check fewer cases.
const raceEnabled = true
