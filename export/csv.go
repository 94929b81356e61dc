package export

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/foilwright/foilwright/geometry"
)

// describe returns the comment lines that open a CSV or .geo export: what
// the section is and where it sits, with prefix before each line.
func describe(p *Placed, prefix string) string {
	var b strings.Builder
	name := p.Name
	if name == "" {
		name = "section"
	}
	switch p.Frame {
	case FrameChord:
		fmt.Fprintf(&b, "%s%s: normalised section (leading edge at 0,0, trailing edge at 1,0), chord units\n", prefix, name)
	default:
		fmt.Fprintf(&b, "%s%s: section in part coordinates, chord %s %s, twist %s deg nose-up, leading edge at (%s, %s) %s",
			prefix, name, num(round(p.Chord, 9)), unitWord(p.Units), num(round(p.TwistDeg, 9)), num(round(p.LE.X, 9)), num(round(p.LE.Y, 9)), unitWord(p.Units))
		if p.Mirrored {
			b.WriteString(", mirrored")
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "%swritten by foilwright; one row per node, trailing edge, upper surface, leading edge, lower surface\n", prefix)
	return b.String()
}

// round rounds v to digits significant digits, for labels.
func round(v float64, digits int) float64 {
	if v == 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return v
	}
	e := math.Pow(10, float64(digits)-math.Ceil(math.Log10(math.Abs(v))))
	return math.Round(v*e) / e
}

// CSV writes the nodes of p as comma-separated x,y with a header line,
// after comment lines that say what the section is and its unit
// ("# units: mm"), so foilwright's reader reads it back in that unit. It
// returns the first error of w.
func CSV(w io.Writer, p *Placed) error {
	bw := bufio.NewWriter(w)
	bw.WriteString(describe(p, "# "))
	fmt.Fprintf(bw, "# units: %s\n", unitWord(p.Units))
	unit := unitWord(p.Units)
	fmt.Fprintf(bw, "x [%s],y [%s]\n", unit, unit)
	for _, q := range p.Nodes {
		fmt.Fprintf(bw, "%s,%s\n", num(q.X), num(q.Y))
	}
	return bw.Flush()
}

// A Station is one section of a blade for the stations exports: its place
// along the span (in the unit of its section, when known) and the section.
type Station struct {
	Position *float64
	Section  *Placed
}

// StationsCSV writes the stations of a blade in space for a CAD loft:
// comment lines with the unit, a header "x,y,z,station", then for each
// station a comment line naming it and one row per node of its outline
// (the repeated trailing-edge node of a sharp edge left out), in the part's
// coordinates. station is the station's position, or its index from 1 when
// it has none. It returns an error for stations in different units, and
// the first error of w.
func StationsCSV(w io.Writer, sts []Station) error {
	if err := sameUnits(sts); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	unit := unitWord(sts[0].Section.Units)
	fmt.Fprintf(bw, "# %d blade station(s) in part coordinates, written by foilwright; one block per station, nodes in order round the outline\n", len(sts))
	fmt.Fprintf(bw, "# units: %s\n", unit)
	fmt.Fprintf(bw, "x [%s],y [%s],z [%s],station\n", unit, unit, unit)
	for k, st := range sts {
		pos := float64(k + 1)
		if st.Position != nil {
			pos = *st.Position
		}
		fmt.Fprintf(bw, "# station %s: %s\n", num(pos), st.Section.Name)
		for _, q := range st.Section.space(st.Section.outline()) {
			fmt.Fprintf(bw, "%s,%s,%s,%s\n", num(q.X), num(q.Y), num(q.Z), num(pos))
		}
	}
	return bw.Flush()
}

// sameUnits checks that there are stations and all share one part unit.
func sameUnits(sts []Station) error {
	if len(sts) == 0 {
		return fmt.Errorf("export: no stations")
	}
	u := sts[0].Section.Units
	for _, st := range sts {
		if st.Section.Frame != FramePart {
			return fmt.Errorf("export: station %q is not in the part frame", st.Section.Name)
		}
		if st.Section.Units != u {
			return fmt.Errorf("export: station %q is in %s, %q in %s", st.Section.Name, st.Section.Units, sts[0].Section.Name, u)
		}
	}
	if u == geometry.ChordUnit {
		return fmt.Errorf("export: the stations are in chord units: a loft needs them in the part's unit")
	}
	return nil
}
