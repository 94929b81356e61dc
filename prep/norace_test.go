//go:build !race

package prep

// raceEnabled is false in the normal suite (see race_test.go).
const raceEnabled = false
