package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/foilwright/foilwright/compare"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// writeProbe writes an invented probe file of a NACA 4-digit section
// (NACA Report 824) of chord mm, twist degrees nose-up and leading edge
// le, 120 points a surface, noise-free, in millimetres.
func writeProbe(t *testing.T, dir, name string, foil shape.NACA4, chord, twist float64, le geometry.Point) string {
	t.Helper()
	var b bytes.Buffer
	b.WriteString("# invented test data\n# units: mm\nx,y\n")
	const per = 120
	pts := foil.Nodes(2 * per)
	for _, q := range pts[:len(pts)-1] {
		p := q.Scale(chord).Rotate(-twist * math.Pi / 180).Add(le)
		fmt.Fprintf(&b, "%.12g,%.12g\n", p.X, p.Y)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func readReport(t *testing.T, data []byte) *compare.Report {
	t.Helper()
	var r compare.Report
	if err := json.Unmarshal(data, &r); err != nil {
		t.Fatalf("report: %v\n%s", err, data)
	}
	if r.Format != compare.Format {
		t.Fatalf("report format %q", r.Format)
	}
	return &r
}

func TestCompareExitStatus(t *testing.T) {
	probe := "../../examples/tunnel-model/probe.csv"
	base := []string{"compare", probe, "--design", "naca4:2412", "--chord", "200", "--no-aero", "-q"}
	if _, stderr, code := runCLI(t, "compare", probe, "--design", "naca4:2412", "--scale", "locked", "--no-aero", "-q"); code != exitUsage || !strings.Contains(stderr, "locked scale needs the design's chord") {
		t.Errorf("locked scale without a chord: exit %d, %q", code, stderr)
	}
	for _, tc := range []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"in tolerance", []string{"--tolerance", "0.05", "--zone", "name=nose,x=0:0.05,tol=0.02"}, exitOK, ""},
		{"out of tolerance", []string{"--tolerance", "0.005"}, exitOutOfTolerance, "out of tolerance"},
		{"no tolerance", nil, exitOK, ""},
		{"bad tolerance", []string{"--tolerance", "0.05/0.02"}, exitUsage, "--tolerance"},
		{"zone without band", []string{"--zone", "x=0:0.1"}, exitUsage, "x and tol are required"},
		{"bad shape", []string{"--design", "naca4:24x2"}, exitUsage, "naca4:24x2"},
		{"missing design file", []string{"--design", "nowhere.dat"}, exitUsage, "nowhere.dat"},
		{"nominal datum without placement", []string{"--align", "datum", "--datum", "nominal"}, exitUsage, "placement"},
		{"bad alignment", []string{"--align", "sideways"}, exitUsage, "--align"},
		{"design without its unit", []string{"--design", "../../examples/rotor/design/r700.dat"}, exitUsage, "--design-units"},
		{"zero chord", []string{"--chord", "0"}, exitUsage, "--chord 0"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, stderr, code := runCLI(t, append(append([]string{}, base...), tc.args...)...)
			if code != tc.code || !strings.Contains(stderr, tc.msg) {
				t.Errorf("exit %d, want %d; stderr %q, want %q in it", code, tc.code, stderr, tc.msg)
			}
		})
	}
}

// TestCompareOutputs checks the report, the per-point CSV and the
// pictures, and that a failed run leaves an earlier report alone.
func TestCompareOutputs(t *testing.T) {
	dir := t.TempDir()
	rep, pts, pic := filepath.Join(dir, "r.json"), filepath.Join(dir, "p.csv"), filepath.Join(dir, "c.svg")
	stdout, stderr, code := runCLI(t, "compare", "../../examples/tunnel-model/probe.csv", "--design", "naca4:2412", "--chord", "200",
		"--tolerance", "0.05", "--zone", "name=nose,x=0:0.05,tol=0.02", "--alpha", "0,4", "-o", rep, "--points", pts, "--plot", pic)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "PASS: 0 of 298") {
		t.Errorf("summary:\n%s", stdout)
	}
	data, _ := os.ReadFile(rep)
	r := readReport(t, data)
	if r.Verdict != compare.VerdictPass || r.Deviation.Points != 298 || len(r.Zones) != 2 || r.Aero == nil || len(r.Aero.Methods) != 2 {
		t.Errorf("report: verdict %s, %d points, %d zones, aero %v", r.Verdict, r.Deviation.Points, len(r.Zones), r.Aero)
	}
	f, _ := os.Open(pts)
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil || len(rows) != 299 || rows[0][9] != "deviation" {
		t.Errorf("points CSV: %d rows, %v", len(rows), err)
	}
	for _, name := range compare.PictureNames {
		if st, err := os.Stat(compare.SiblingPath(pic, name)); err != nil || st.Size() < 1000 {
			t.Errorf("picture %s: %v", name, err)
		}
	}
	// A run that fails keeps the earlier report.
	if _, _, code := runCLI(t, "compare", "../../examples/tunnel-model/probe.csv", "--design", "naca4:2412", "--tolerance", "x", "-o", rep); code != exitUsage {
		t.Errorf("bad tolerance: exit %d", code)
	}
	if again, _ := os.ReadFile(rep); !bytes.Equal(again, data) {
		t.Error("a failed run changed the earlier report")
	}
	// Out of tolerance: the report is still written, and says fail.
	_, _, code = runCLI(t, "compare", "../../examples/tunnel-model/probe.csv", "--design", "naca4:2412", "--chord", "200", "--no-aero", "--tolerance", "0.004", "-q", "-o", rep)
	data, _ = os.ReadFile(rep)
	if r := readReport(t, data); code != exitOutOfTolerance || r.Verdict != compare.VerdictFail || r.PointsOut == 0 {
		t.Errorf("tight band: exit %d, verdict %s, %d out", code, r.Verdict, r.PointsOut)
	}
}

// TestCompareAeroTwist runs the stages as child processes: a model set
// 0.5° more nose-up in its fixture than drawn gives ΔCl = 2πδ from the
// thin-aerofoil stage (thin-aerofoil theory, Cl = 2π(α − α_L0)), and one
// only moved in its fixture gives no ΔCl beyond discretisation.
func TestCompareAeroTwist(t *testing.T) {
	dir := t.TempDir()
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}
	le := geometry.Point{X: 412, Y: 118}
	for _, tc := range []struct {
		name  string
		twist float64
		at    geometry.Point
	}{{"twisted", 4.5, le}, {"moved", 4, le.Add(geometry.Point{X: 0.3, Y: -0.2})}} {
		t.Run(tc.name, func(t *testing.T) {
			probe := writeProbe(t, dir, tc.name+".csv", foil, 200, tc.twist, tc.at)
			stdout, stderr, code := runCLI(t, "compare", probe, "--design", "naca4:2412", "--chord", "200", "--twist", "4", "--offset", "412,118",
				"--align", "datum", "--datum", "nominal", "--alpha", "-2,2,6", "--json")
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			r := readReport(t, []byte(stdout))
			want := 2 * math.Pi * (tc.twist - 4) * math.Pi / 180
			for _, m := range r.Aero.Methods {
				if m.Stage != compare.StageThinAerofoil {
					continue
				}
				for i, d := range m.DeltaCl {
					if math.Abs(d-want) > 1e-3 {
						t.Errorf("α %g°: ΔCl %.5f, want 2πδ = %.5f", m.AlphaDeg[i], d, want)
					}
				}
			}
		})
	}
}

// TestCompareDesignFiles reads the measurement and the design from files
// of each kind: a section document on both sides, a DXF in part units
// against itself (zero deviation: the design is the interpolating spline
// through the very points measured).
func TestCompareDesignFiles(t *testing.T) {
	dir := t.TempDir()
	sec := filepath.Join(dir, "probe.json")
	if _, stderr, code := runCLI(t, "prep", "../../examples/tunnel-model/probe.csv", "-q", "-o", sec); code != exitOK {
		t.Fatal(stderr)
	}
	shapeDoc := filepath.Join(dir, "n2412.json")
	if _, stderr, code := runCLI(t, "shape", "naca4", "2412", "-o", shapeDoc); code != exitOK {
		t.Fatal(stderr)
	}
	stdout, stderr, code := runCLI(t, "compare", sec, "--design", shapeDoc, "--chord", "200", "--tolerance", "0.05", "--no-aero", "--json")
	if code != exitOK {
		t.Fatalf("section documents: exit %d: %s", code, stderr)
	}
	if r := readReport(t, []byte(stdout)); r.Design.Kind != compare.DesignSection || r.Verdict != compare.VerdictPass {
		t.Errorf("section documents: design %s, verdict %s", r.Design.Kind, r.Verdict)
	}
	dxf := "../../examples/cad-export/section.dxf"
	stdout, stderr, code = runCLI(t, "compare", dxf, "--design", dxf, "--align", "as-is", "--tolerance", "1e-9", "--no-aero", "--json")
	if code != exitOK {
		t.Fatalf("DXF: exit %d: %s", code, stderr)
	}
	if r := readReport(t, []byte(stdout)); r.Design.Kind != compare.DesignPoints || r.Design.ChordUnits || math.Max(r.Deviation.Max, -r.Deviation.Min) > 1e-9 {
		t.Errorf("DXF against itself: design %s (chord units %v), deviation %g to %g", r.Design.Kind, r.Design.ChordUnits, r.Deviation.Min, r.Deviation.Max)
	}
}
