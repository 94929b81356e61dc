package geometry

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// A Length is a length with its unit: a part unit (Millimetre, Inch,
// Metre), ChordUnit for a fraction of the chord, or "" for the unit of the
// input, whatever it is.
type Length struct {
	Value float64
	Unit  Unit
}

// ErrLength means a length that cannot be parsed or converted.
var ErrLength = errors.New("geometry: bad length")

// ParseLength parses a length: a number, optionally followed by a unit
// (mm, in, m, or c / chord for a fraction of the chord), with or without a
// space: "0.5", "0.5mm", "0.5 mm", "0.02c". A bare number is in the unit of
// the input. It returns an error wrapping ErrLength for anything else and
// for a value that is not finite.
func ParseLength(s string) (Length, error) {
	t := strings.TrimSpace(s)
	i := len(t)
	for i > 0 && (t[i-1] >= 'a' && t[i-1] <= 'z' || t[i-1] >= 'A' && t[i-1] <= 'Z' || t[i-1] == '"') {
		i--
	}
	num, word := strings.TrimSpace(t[:i]), t[i:]
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return Length{}, fmt.Errorf("%w %q: want a number and a unit, e.g. 0.5mm or 0.002c", ErrLength, s)
	}
	l := Length{Value: v}
	if word != "" {
		if l.Unit, err = ParseUnit(word); err != nil {
			return Length{}, fmt.Errorf("%w %q: unit %q (want %s)", ErrLength, s, word, unitChoice())
		}
	}
	return l, nil
}

// String formats l as it is parsed: "0.5mm", "0.002c", or a bare number.
func (l Length) String() string {
	v := strconv.FormatFloat(l.Value, 'g', -1, 64)
	switch l.Unit {
	case "":
		return v
	case ChordUnit:
		return v + "c"
	}
	return v + string(l.Unit)
}

// metres is the length of one unit in metres; 0 for ChordUnit and "".
func metres(u Unit) float64 {
	switch u {
	case Millimetre:
		return 1e-3
	case Inch:
		return 0.0254
	case Metre:
		return 1
	}
	return 0
}

// For returns l for an input in unit in: unchanged when l is in chord units
// or the input's unit, converted when both are part units (1 in = 25.4 mm,
// by definition). It returns an error wrapping ErrLength for a part length
// given for an input in chord units, which has no scale to convert it by.
func (l Length) For(in Unit) (Length, error) {
	switch {
	case l.Unit == "" || l.Unit == ChordUnit || l.Unit == in:
		if l.Unit == in {
			l.Unit = ""
		}
		return l, nil
	case in == ChordUnit || metres(in) == 0:
		return Length{}, fmt.Errorf("%w %s: the input is in chord units, so give the length as a fraction of the chord (e.g. 0.002c)", ErrLength, l)
	}
	return Length{Value: l.Value * metres(l.Unit) / metres(in)}, nil
}

// Of returns l in the units of a section of chord chord: l.Value times chord
// when l is in chord units, else l.Value (a length already in those units).
func (l Length) Of(chord float64) float64 {
	if l.Unit == ChordUnit {
		return l.Value * chord
	}
	return l.Value
}
