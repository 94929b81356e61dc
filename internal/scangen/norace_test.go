//go:build !race

package scangen

const raceEnabled = false
