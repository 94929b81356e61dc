//go:build race

package prep

// raceEnabled is true when the tests run under the race detector, which
// slows the chain down about tenfold: the long sweeps of scans and the
// tests of dense scans skip.
const raceEnabled = true
