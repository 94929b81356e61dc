package compare

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/internal/enum"
)

// A Band is a tolerance on the signed normal deviation d of a point:
// −Minus ≤ d ≤ +Plus, in the measurement's units (d > 0: material outside
// the design). A symmetric ±t has Plus = Minus = t.
type Band struct {
	Plus  float64 `json:"plus"`
	Minus float64 `json:"minus"`
}

// Holds reports whether the deviation d lies in the band (edges included).
func (b Band) Holds(d float64) bool { return d <= b.Plus && d >= -b.Minus }

// Centre returns the middle of the band.
func (b Band) Centre() float64 { return (b.Plus - b.Minus) / 2 }

// Half returns the half-width of the band.
func (b Band) Half() float64 { return (b.Plus + b.Minus) / 2 }

// String writes b as ParseBand reads it: "±0.05" or "+0.05/-0.02".
func (b Band) String() string {
	if b.Plus == b.Minus {
		return "±" + num(b.Plus)
	}
	return "+" + num(b.Plus) + "/-" + num(b.Minus)
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// ErrTolerance means a tolerance or zone could not be read.
var ErrTolerance = errors.New("bad tolerance")

// ParseBand reads a tolerance band: "0.05" or "±0.05" for ±0.05,
// "+0.05/-0.02" (or "-0.02/+0.05") for +0.05 and −0.02. Both limits must
// be finite, neither may be negative, and the band must have a width.
func ParseBand(s string) (Band, error) {
	bad := func(why string) (Band, error) {
		return Band{}, fmt.Errorf("%w %q: %s (want e.g. 0.05 for ±0.05, or +0.05/-0.02)", ErrTolerance, s, why)
	}
	t := strings.TrimSpace(s)
	t = strings.TrimPrefix(t, "±")
	t = strings.TrimPrefix(t, "+-")
	parseLimit := func(f string) (float64, bool) {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		return v, err == nil && !math.IsNaN(v) && !math.IsInf(v, 0)
	}
	var b Band
	if a, c, ok := strings.Cut(t, "/"); ok {
		a, c = strings.TrimSpace(a), strings.TrimSpace(c)
		if strings.HasPrefix(a, "-") && strings.HasPrefix(c, "+") {
			a, c = c, a
		}
		if !strings.HasPrefix(a, "+") || !strings.HasPrefix(c, "-") {
			return bad("an asymmetric band is +upper/-lower")
		}
		up, ok1 := parseLimit(a[1:])
		lo, ok2 := parseLimit(c[1:])
		if !ok1 || !ok2 {
			return bad("a limit is not a finite number")
		}
		b = Band{Plus: up, Minus: lo}
	} else {
		v, ok := parseLimit(t)
		if !ok {
			return bad("not a finite number")
		}
		b = Band{Plus: v, Minus: v}
	}
	switch {
	case b.Plus < 0 || b.Minus < 0:
		return bad("a limit is negative")
	case b.Plus+b.Minus <= 0:
		return bad("the band has no width")
	}
	return b, nil
}

// Surfaces a zone may hold.
const (
	SurfaceBoth  = "both"
	SurfaceUpper = "upper"
	SurfaceLower = "lower"
	// SurfaceBase is where a point lies whose foot is on the straight base
	// of a blunt trailing edge; only zones on both surfaces hold it.
	SurfaceBase = "base"
)

// Surfaces returns the surfaces a zone may name, in the order help texts
// give them.
func Surfaces() []enum.Choice {
	return []enum.Choice{
		{Name: SurfaceBoth, Doc: "and the base of a blunt trailing edge"},
		{Name: SurfaceUpper},
		{Name: SurfaceLower},
	}
}

// A Zone is a tolerance band that holds on part of the section: the
// points whose foot on the design lies between chord stations From and To
// (x/c of the design, both included) on the named surface.
type Zone struct {
	Name     string  `json:"name"`
	From     float64 `json:"from"`
	To       float64 `json:"to"`
	Surface  string  `json:"surface"`
	Band     Band    `json:"band"`
	Explicit bool    `json:"-"` // set by ParseZone for a zone the user named
}

// Holds reports whether a foot at chord station xc on surface lies in z.
func (z Zone) Holds(xc float64, surface string) bool {
	if xc < z.From || xc > z.To {
		return false
	}
	switch z.Surface {
	case SurfaceBoth, "":
		return true
	default:
		return surface == z.Surface
	}
}

// ParseZone reads a zone written as comma-separated key=value pairs:
//
//	x=0:0.05,tol=0.02
//	name=te,x=0.9:1,surface=upper,tol=+0.1/-0.05
//
// x gives the chord stations (x/c of the design) from:to, tol the band (as
// ParseBand), surface one of Surfaces (default both), name a label for the
// reports (default "x/c FROM-TO", with the surface when not both).
func ParseZone(s string) (Zone, error) {
	bad := func(format string, args ...any) (Zone, error) {
		return Zone{}, fmt.Errorf("%w: zone %q: %s (want e.g. name=nose,x=0:0.05,tol=0.02)", ErrTolerance, s, fmt.Sprintf(format, args...))
	}
	z := Zone{Surface: SurfaceBoth, Explicit: true}
	var haveX, haveTol bool
	for part := range strings.SplitSeq(s, ",") {
		k, v, ok := strings.Cut(part, "=")
		k, v = strings.ToLower(strings.TrimSpace(k)), strings.TrimSpace(v)
		if !ok {
			return bad("%q is not key=value", strings.TrimSpace(part))
		}
		switch k {
		case "name":
			if v == "" || strings.ContainsAny(v, "\n\r\t") {
				return bad("the name is empty or not one line")
			}
			z.Name = v
		case "x":
			a, c, ok := strings.Cut(v, ":")
			x0, err0 := strconv.ParseFloat(strings.TrimSpace(a), 64)
			x1, err1 := strconv.ParseFloat(strings.TrimSpace(c), 64)
			if !ok || err0 != nil || err1 != nil || math.IsNaN(x0) || math.IsNaN(x1) || math.IsInf(x0, 0) || math.IsInf(x1, 0) {
				return bad("x=%s: want from:to, two chord stations", v)
			}
			z.From, z.To, haveX = x0, x1, true
		case "surface":
			if !enum.Has(Surfaces(), v) {
				return bad("surface %q: want %s", v, enum.Or(enum.Names(Surfaces())...))
			}
			z.Surface = v
		case "tol", "tolerance":
			b, err := ParseBand(v)
			if err != nil {
				return Zone{}, fmt.Errorf("zone %q: %w", s, err)
			}
			z.Band, haveTol = b, true
		default:
			return bad("unknown key %q (want name, x, surface, tol)", k)
		}
	}
	if !haveX || !haveTol {
		return bad("x and tol are required")
	}
	if err := z.Check(); err != nil {
		return Zone{}, fmt.Errorf("zone %q: %w", s, err)
	}
	return z, nil
}

// Check reports a zone whose stations are out of order or out of
// [−0.5, 1.5], whose surface is unknown or whose band is invalid.
func (z *Zone) Check() error {
	switch {
	case !(z.From <= z.To):
		return fmt.Errorf("%w: x=%g:%g: the stations are out of order", ErrTolerance, z.From, z.To)
	case z.From < -0.5 || z.To > 1.5:
		return fmt.Errorf("%w: x=%g:%g: chord stations lie in [0, 1]", ErrTolerance, z.From, z.To)
	case z.Surface != "" && !enum.Has(Surfaces(), z.Surface):
		return fmt.Errorf("%w: surface %q: want %s", ErrTolerance, z.Surface, enum.Or(enum.Names(Surfaces())...))
	case z.Band.Plus < 0 || z.Band.Minus < 0 || !(z.Band.Plus+z.Band.Minus > 0) || math.IsInf(z.Band.Plus+z.Band.Minus, 0):
		return fmt.Errorf("%w: band %v has no width or a negative limit", ErrTolerance, z.Band)
	}
	if z.Surface == "" {
		z.Surface = SurfaceBoth
	}
	if z.Name == "" {
		z.Name = fmt.Sprintf("x/c %s-%s", num(z.From), num(z.To))
		if z.Surface != SurfaceBoth {
			z.Name += " " + z.Surface
		}
	}
	return nil
}

// Tolerance is the tolerance drawing of a section: bands on zones, tried
// in order (the first zone that holds a point applies), and a default
// band for the points in no zone. A nil Default leaves such points
// without a tolerance.
type Tolerance struct {
	Default *Band  `json:"default,omitempty"`
	Zones   []Zone `json:"zones,omitempty"`
}

// Given reports whether t tolerances anything.
func (t Tolerance) Given() bool { return t.Default != nil || len(t.Zones) > 0 }

// Zone returns the index of the zone that holds a foot at chord station
// xc on surface, or −1 for none, and the band that applies there (ok is
// false when no band applies).
func (t Tolerance) Zone(xc float64, surface string) (zone int, b Band, ok bool) {
	for i, z := range t.Zones {
		if z.Holds(xc, surface) {
			return i, z.Band, true
		}
	}
	if t.Default != nil {
		return -1, *t.Default, true
	}
	return -1, Band{}, false
}
