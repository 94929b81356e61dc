package prep

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// BenchmarkPrepare runs the whole geometry chain on a scan of n points to
// 160 panels (target for n = 1e4: under 100 ms).
func BenchmarkPrepare(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000} {
		data := testfoil.ScanCSV(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Prepare("scan", []File{{Path: "scan.csv", Data: data}}, Settings{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func TestPrepareScan(t *testing.T) {
	// The chain on a shuffled, noisy scan of NACA 2412 (NACA Report 824):
	// chord 152.4 mm within 0.1 %, thickness 0.120 ± 0.001.
	p, err := Prepare("scan", []File{{Path: "scan.csv", Data: testfoil.ScanCSV(2000)}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	s := p.Section
	if math.Abs(s.Frame.Chord-152.4)/152.4 > 1e-3 || math.Abs(s.Properties.Thickness-0.12) > 1e-3 {
		t.Errorf("chord %.3f mm, thickness %.4f", s.Frame.Chord, s.Properties.Thickness)
	}
	if len(s.Nodes) != s.Panels.Count+1 || s.LEIndex == nil || s.Nodes[*s.LEIndex] != (geometry.Point{}) {
		t.Errorf("%d nodes, %d panels, LE index %v", len(s.Nodes), s.Panels.Count, s.LEIndex)
	}
	// The panel count was chosen for the default accuracy, and meets it.
	if s.Panels.Target != 1e-4 || !(s.Panels.Deviation > 0 && s.Panels.Deviation <= 1e-4) {
		t.Errorf("panels %+v, want the deviation within the 1e-4 chord target", s.Panels)
	}
}

func TestPrepareNoiseGivenBelowBins(t *testing.T) {
	// A dense scan (20000 points of NACA 2412, 0.02 mm noise) with a
	// noise given ten times too small: the bins the fit works on scatter
	// by more than that noise averaged over a bin, the fit smooths for
	// their own scatter and the section says so; the section is still
	// the part (NACA Report 824: chord 152.4 mm within 0.1 %, thickness
	// 0.120 ± 0.001).
	small := 0.002
	p, err := Prepare("scan", []File{{Path: "scan.csv", Data: testfoil.ScanCSV(20000)}}, Settings{Noise: &small})
	if err != nil {
		t.Fatal(err)
	}
	s := p.Section
	if math.Abs(s.Frame.Chord-152.4)/152.4 > 1e-3 || math.Abs(s.Properties.Thickness-0.12) > 1e-3 {
		t.Errorf("chord %.3f mm, thickness %.4f", s.Frame.Chord, s.Properties.Thickness)
	}
	if !(p.Fit.BinNoise > 0) {
		t.Fatalf("bin noise %g: the noise given was taken as it is", p.Fit.BinNoise)
	}
	found := false
	for _, w := range s.Warnings {
		if strings.Contains(w, "the noise given (0.002 mm a point) was not used as is") {
			found = true
		}
	}
	if !found {
		t.Errorf("no warning that the noise given was not used; warnings: %q", s.Warnings)
	}
}

func TestReadAndCleanTwoFiles(t *testing.T) {
	// A scan written to two files (its lines split between them) is read
	// as one cloud: every point, in the order of the files, each with its
	// own file and line; units that differ between the files are refused.
	data := testfoil.ScanCSV(2000)
	lines := strings.SplitAfter(string(data), "\n")
	head, body := strings.Join(lines[:2], ""), lines[2:]
	first := head + strings.Join(body[:700], "")
	second := head + strings.Join(body[700:], "")
	one, err := ReadAndClean([]File{{Path: "scan.csv", Data: data}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	two, err := ReadAndClean([]File{{Path: "a.csv", Data: []byte(first)}, {Path: "b.csv", Data: []byte(second)}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if two.Read != one.Read || two.Read != 2000 || len(two.Clouds) != 2 || two.Units != geometry.Millimetre {
		t.Fatalf("read %d points (one file: %d), %d clouds, units %q", two.Read, one.Read, len(two.Clouds), two.Units)
	}
	pts := two.cloud.Points
	for i, p := range one.cloud.Points {
		if pts[i] != p {
			t.Fatalf("point %d: %v, want %v as in the one file", i, pts[i], p)
		}
	}
	if o := two.cloud.Origins; o[0] != (geometry.Origin{File: "a.csv", Line: 3}) || o[700] != (geometry.Origin{File: "b.csv", Line: 3}) {
		t.Errorf("origins %v and %v", o[0], o[700])
	}
	if len(two.cloud.Notes) != 4 || two.cloud.Ordered {
		t.Errorf("notes %v, ordered %v: want both files' comment and header, unordered", two.cloud.Notes, two.cloud.Ordered)
	}
	inches := strings.Replace(second, "# units: mm", "# units: in", 1)
	_, err = ReadAndClean([]File{{Path: "a.csv", Data: []byte(first)}, {Path: "b.csv", Data: []byte(inches)}}, Settings{})
	if err == nil || err.Error() != "b.csv: units in differ from mm of a.csv" {
		t.Errorf("error %v, want the units refused", err)
	}
}
