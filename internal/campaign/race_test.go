//go:build race

package campaign

// raceEnabled is true when the tests run under the race detector, which
// slows the chain down about tenfold; the campaign test runs fewer cases.
const raceEnabled = true
