//go:build race

package prep

// raceEnabled is true when the tests run under the race detector, which
// slows the chain down about tenfold; tests of dense scans are skipped.
const raceEnabled = true
