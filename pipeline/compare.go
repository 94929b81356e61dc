package pipeline

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"github.com/tidwall/gjson"

	// The pipeline has its own compare (of manifests, in verify.go).
	fwcompare "github.com/foilwright/foilwright/compare"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
)

// DocCompare is the outputs.documents kind of the compare report
// (compare.json) and the deviation of every point (compare.csv) of a
// section compared with its design.
const DocCompare = "compare"

// PlotCompare is the outputs.plots name of the pictures of a comparison:
// the design with the deviations, the deviation along the outline, ΔCp.
const PlotCompare = "compare"

// VerdictsName is the batch table of verdicts at the root of a run folder.
const VerdictsName = "verdicts.csv"

// A CompareSpec is a "compare" block: the design a section is held
// against, how, and to what tolerance. The top-level block applies to
// every input; an input's own block overrides it key by key (its zones
// replace the top-level zones).
type CompareSpec struct {
	// Design is a reference shape ("naca4:2412") or a file, relative to
	// the pipeline file's folder, as written.
	Design string `json:"design"`
	// DesignPath is the design file's recorded path (slash-separated,
	// relative to the pipeline's folder); "" for a shape.
	DesignPath  string           `json:"design_path,omitempty"`
	DesignUnits string           `json:"design_units,omitempty"`
	Chord       *float64         `json:"chord,omitempty"`
	Twist       *float64         `json:"twist,omitempty"`
	Offset      *[2]float64      `json:"offset,omitempty"`
	Align       string           `json:"align,omitempty"`
	Datum       string           `json:"datum,omitempty"`
	Scale       string           `json:"scale,omitempty"`
	Tolerance   *fwcompare.Band  `json:"tolerance,omitempty"`
	Zones       []fwcompare.Zone `json:"zones,omitempty"`
	AlphaDeg    []float64        `json:"alpha_deg,omitempty"`
	CpAlphaDeg  *float64         `json:"cp_alpha,omitempty"`
	Aero        *bool            `json:"aero,omitempty"`
	Magnify     *float64         `json:"magnify,omitempty"`
}

// DefaultCompareAlphas are the angles of the aerodynamic comparison when
// a compare block gives none (degrees).
var DefaultCompareAlphas = []float64{-4, -2, 0, 2, 4, 6, 8}

// aero reports whether the aerodynamic comparison runs.
func (s *CompareSpec) aero() bool { return s.Aero == nil || *s.Aero }

var compareKeys = keySet("design", "design_units", "chord", "twist", "offset", "align", "datum", "scale",
	"tolerance", "zones", "alpha_deg", "cp_alpha", "aero", "magnify")

var zoneKeys = keySet("name", "x", "surface", "tolerance")

// compareBlock reads a "compare" object.
func (ps *parser) compareBlock(path string, v gjson.Result) *CompareSpec {
	c := ps.c
	s := &CompareSpec{}
	c.wantObject(path, v, compareKeys, func(k, kpath string, val gjson.Result) {
		switch k {
		case "design":
			if str, ok := c.wantString(kpath, val, true); ok {
				s.Design = str
				if !fwcompare.IsShape(str) {
					s.DesignPath = ps.designFile(kpath, val, str)
				}
			}
		case "design_units":
			if e, ok := c.wantEnum(kpath, val, enum.Strings(geometry.Units())...); ok {
				s.DesignUnits = e
			}
		case "chord":
			if x, ok := c.wantNumber(kpath, val, positive); ok {
				s.Chord = &x
			}
		case "twist":
			if x, ok := c.wantNumber(kpath, val, numRange{lo: -360, hi: 360}); ok {
				s.Twist = &x
			}
		case "offset":
			if xy, ok := ps.pair(kpath, val); ok {
				s.Offset = &xy
			}
		case "align":
			s.Align, _ = c.wantEnum(kpath, val, enum.Names(fwcompare.Alignments())...)
		case "datum":
			s.Datum, _ = c.wantEnum(kpath, val, enum.Names(fwcompare.Datums())...)
		case "scale":
			s.Scale, _ = c.wantEnum(kpath, val, fwcompare.ScaleLocked, fwcompare.ScaleFree)
		case "tolerance":
			if b, ok := ps.band(kpath, val); ok {
				s.Tolerance = &b
			}
		case "zones":
			s.Zones = []fwcompare.Zone{}
			c.wantArray(kpath, val, func(_ int, ipath string, zv gjson.Result) {
				if z, ok := ps.zone(ipath, zv); ok {
					s.Zones = append(s.Zones, z)
				}
			})
		case "alpha_deg":
			s.AlphaDeg = []float64{}
			c.wantArray(kpath, val, func(_ int, ipath string, av gjson.Result) {
				if x, ok := c.wantNumber(ipath, av, numRange{lo: -90, hi: 90}); ok {
					s.AlphaDeg = append(s.AlphaDeg, x)
				}
			})
			if val.IsArray() && len(val.Array()) == 0 {
				c.add(val.Index, kpath, "no angles")
			}
		case "cp_alpha":
			if x, ok := c.wantNumber(kpath, val, numRange{lo: -90, hi: 90}); ok {
				s.CpAlphaDeg = &x
			}
		case "aero":
			if b, ok := c.wantBool(kpath, val); ok {
				s.Aero = &b
			}
		case "magnify":
			if x, ok := c.wantNumber(kpath, val, positive); ok {
				s.Magnify = &x
			}
		}
	})
	return s
}

// designFile checks that a design file exists and returns its recorded
// path.
func (ps *parser) designFile(path string, v gjson.Result, name string) string {
	full := ps.abs(name)
	st, err := os.Stat(full)
	switch {
	case errors.Is(err, os.ErrNotExist):
		ps.c.add(v.Index, path, "design file %q not found (a reference shape is written naca4:CODE or karman-trefftz:XC,YC,TE_DEG)", name)
		return ""
	case err != nil:
		ps.c.add(v.Index, path, "design file %q: %v", name, err)
		return ""
	case !st.Mode().IsRegular():
		ps.c.add(v.Index, path, "design %q is not a regular file", name)
		return ""
	}
	return ps.rel(full)
}

// pair reads [x, y].
func (ps *parser) pair(path string, v gjson.Result) ([2]float64, bool) {
	var xy [2]float64
	n, good := 0, true
	if !ps.c.wantArray(path, v, func(i int, ipath string, el gjson.Result) {
		n++
		x, ok := ps.c.wantNumber(ipath, el, anyFinite)
		good = good && ok
		if i < 2 {
			xy[i] = x
		}
	}) {
		return xy, false
	}
	if n != 2 {
		ps.c.add(v.Index, path, "want [x, y], got %d number(s)", n)
		return xy, false
	}
	return xy, good
}

// band reads a tolerance: a number t (±t) or a string as fwcompare.ParseBand
// reads it ("+0.05/-0.02").
func (ps *parser) band(path string, v gjson.Result) (fwcompare.Band, bool) {
	var text string
	switch v.Type {
	case gjson.Number:
		text = v.Raw
	case gjson.String:
		text = v.Str
	default:
		ps.c.add(v.Index, path, `want a number (±) or a string such as "+0.05/-0.02", got %s`, describe(v))
		return fwcompare.Band{}, false
	}
	b, err := fwcompare.ParseBand(text)
	if err != nil {
		ps.c.add(v.Index, path, "%v", err)
		return fwcompare.Band{}, false
	}
	return b, true
}

// zone reads one zone object.
func (ps *parser) zone(path string, v gjson.Result) (fwcompare.Zone, bool) {
	c := ps.c
	z := fwcompare.Zone{Surface: fwcompare.SurfaceBoth, Explicit: true}
	var haveX, haveTol, good = false, false, true
	if !c.wantObject(path, v, zoneKeys, func(k, kpath string, val gjson.Result) {
		switch k {
		case "name":
			str, ok := c.wantString(kpath, val, true)
			z.Name, good = str, good && ok
		case "x":
			xy, ok := ps.pair(kpath, val)
			z.From, z.To, haveX, good = xy[0], xy[1], ok, good && ok
		case "surface":
			e, ok := c.wantEnum(kpath, val, enum.Names(fwcompare.Surfaces())...)
			z.Surface, good = e, good && ok
		case "tolerance":
			b, ok := ps.band(kpath, val)
			z.Band, haveTol, good = b, ok, good && ok
		}
	}) {
		return z, false
	}
	if !good {
		return z, false
	}
	if !haveX || !haveTol {
		c.add(v.Index, path, `a zone needs "x" ([from, to] in x/c of the design) and "tolerance"`)
		return z, false
	}
	if err := z.Check(); err != nil {
		c.add(v.Index, path, "%v", err)
		return z, false
	}
	return z, true
}

// mergeCompare returns the compare block of an input: its own keys over
// the top-level block's. Either may be nil.
func mergeCompare(top, in *CompareSpec) *CompareSpec {
	switch {
	case top == nil && in == nil:
		return nil
	case top == nil:
		return in
	case in == nil:
		t := *top
		return &t
	}
	m := *top
	if in.Design != "" {
		m.Design, m.DesignPath = in.Design, in.DesignPath
	}
	str := func(dst *string, v string) {
		if v != "" {
			*dst = v
		}
	}
	str(&m.DesignUnits, in.DesignUnits)
	str(&m.Align, in.Align)
	str(&m.Datum, in.Datum)
	str(&m.Scale, in.Scale)
	if in.Chord != nil {
		m.Chord = in.Chord
	}
	if in.Twist != nil {
		m.Twist = in.Twist
	}
	if in.Offset != nil {
		m.Offset = in.Offset
	}
	if in.Tolerance != nil {
		m.Tolerance = in.Tolerance
	}
	if in.Zones != nil {
		m.Zones = in.Zones
	}
	if in.AlphaDeg != nil {
		m.AlphaDeg = in.AlphaDeg
	}
	if in.CpAlphaDeg != nil {
		m.CpAlphaDeg = in.CpAlphaDeg
	}
	if in.Aero != nil {
		m.Aero = in.Aero
	}
	if in.Magnify != nil {
		m.Magnify = in.Magnify
	}
	return &m
}

// checkCompare reports the inputs whose merged compare block names no
// design.
func (ps *parser) checkCompare(in gjson.Result, ipath string, spec *CompareSpec) {
	if spec != nil && spec.Design == "" {
		ps.c.add(in.Index, ipath, `compare: no "design" (give it here or in the top-level "compare")`)
	}
}

// A Verdict is how a section compared with its design, for the run's
// summary, the manifest and the batch table.
type Verdict struct {
	Design    string        `json:"design"`
	Verdict   string        `json:"verdict"`
	Points    int           `json:"points"`
	PointsOut int           `json:"points_out"`
	Units     geometry.Unit `json:"units"`
	RMS       float64       `json:"rms"`
	Min       float64       `json:"min"`
	Max       float64       `json:"max"`
	WorstAt   string        `json:"worst_at"`
}

// CompareRecord is the manifest's record of a section's comparison: its
// settings, the design file read and the verdict with its figures.
type CompareRecord struct {
	Settings   *CompareSpec `json:"settings"`
	DesignFile *FileHash    `json:"design_file,omitempty"`
	Verdict
}

// compare holds the section against its design, when the pipeline asks,
// and collects the report, the points and the pictures.
func (r *sectionRun) compare(runner StageRunner) bool {
	spec := r.sp.Compare
	if spec == nil {
		return true
	}
	var m *fwcompare.Measurement
	var err error
	if r.prepared.Preparation != nil {
		m = fwcompare.FromPreparation(r.prepared.Preparation)
	} else if m, err = fwcompare.FromSection(r.sec, r.sp.Name+"/section.json"); err != nil {
		return r.failInput("compare: %v", err)
	}
	ds := fwcompare.DesignSpec{Source: spec.Design, Units: spec.DesignUnits, Chord: spec.Chord, TwistDeg: spec.Twist}
	if spec.Offset != nil {
		ds.Offset = &geometry.Point{X: spec.Offset[0], Y: spec.Offset[1]}
	}
	if spec.DesignPath != "" {
		ds.Source, ds.Data = spec.DesignPath, r.designData
	}
	d, err := fwcompare.NewDesign(ds, m, fwcompare.PanelOptions(r.sec, r.sp.Settings), fwcompare.PropsOptions(r.sp.Settings))
	if errors.Is(err, prep.ErrNoUnits) {
		return r.failInput("compare: design %v: say it with \"design_units\"", err)
	}
	if err != nil {
		// The design could not be read or placed: the input's fault.
		return r.failInput("compare: %v", err)
	}
	opts := fwcompare.Options{Align: spec.Align, Datum: spec.Datum, Scale: spec.Scale, Tolerance: fwcompare.Tolerance{Default: spec.Tolerance, Zones: spec.Zones}}
	c, err := fwcompare.Compare(m, d, opts)
	if errors.Is(err, fwcompare.ErrOptions) || errors.Is(err, fwcompare.ErrTolerance) {
		return r.failInput("compare: %v", err)
	}
	if err != nil {
		return r.fail("compare: %v", err)
	}
	if spec.aero() {
		if runner == nil {
			return r.fail("compare: no stage runner for the aerodynamic comparison")
		}
		run := func(ctx context.Context, name string, sec, params []byte) ([]byte, error) {
			out, err := runStage(ctx, runner, StageCall{ID: "compare-" + name, Stage: name, Params: params}, stage.Request{Section: sec, Params: params, SectionName: r.sp.Name})
			if err != nil {
				return nil, err
			}
			// The comparison reads foilwright.result/1; a stage may answer
			// packed (no JSON) or in /2.
			return out.DocumentV1()
		}
		alphas := spec.AlphaDeg
		if alphas == nil {
			alphas = DefaultCompareAlphas
		}
		cpa := 4.0
		if spec.CpAlphaDeg != nil {
			cpa = *spec.CpAlphaDeg
		}
		if err := c.Aero(r.ctx, run, fwcompare.AeroOptions{AlphaDeg: alphas, CpAlphaDeg: cpa}); err != nil {
			if r.ctx.Err() != nil {
				return r.cancel()
			}
			if inputCaused(err) {
				return r.failInput("compare: %v", err)
			}
			return r.fail("compare: %v", err)
		}
	}
	if err := r.compareOutputs(c, spec); err != nil {
		return r.fail("compare: %v", err)
	}
	rep := c.Report
	v := &Verdict{Design: spec.Design, Verdict: rep.Verdict, Points: rep.Deviation.Points, PointsOut: rep.PointsOut, Units: rep.Units,
		RMS: rep.Deviation.RMS, Min: rep.Deviation.Min, Max: rep.Deviation.Max}
	if len(rep.Deviation.Worst) > 0 {
		w := rep.Deviation.Worst[0]
		v.WorstAt = geometry.Origin{File: w.File, Line: w.Line, Entity: w.Entity}.String()
	}
	r.res.report.Compare = v
	r.res.compare = &CompareRecord{Settings: spec, DesignFile: r.res.designFile, Verdict: *v}
	return true
}

// compareOutputs collects the report, the points and the pictures that
// outputs asks for.
func (r *sectionRun) compareOutputs(c *fwcompare.Comparison, spec *CompareSpec) error {
	out := r.pl.Pipeline.Outputs
	if out.Has(DocCompare) {
		rep, err := c.Report.Encode()
		if err != nil {
			return err
		}
		var b bytes.Buffer
		if err := c.WriteCSV(&b); err != nil {
			return err
		}
		r.outs = append(r.outs, output{r.sp.Name + "/compare.json", rep}, output{r.sp.Name + "/compare.csv", b.Bytes()})
	}
	if out.HasPlot(PlotCompare) {
		magnify := 0.0
		if spec.Magnify != nil {
			magnify = *spec.Magnify
		}
		figs, err := c.Figures(magnify)
		if err != nil {
			return err
		}
		for _, name := range fwcompare.PictureNames {
			f, ok := figs[name]
			if !ok {
				continue
			}
			data, err := plot.Encode(f, out.PlotFormat)
			if err != nil {
				return err
			}
			file := filepath.ToSlash(fwcompare.SiblingPath("compare."+out.PlotFormat, name))
			r.outs = append(r.outs, output{r.sp.Name + "/plots/" + file, data})
		}
	}
	return nil
}

// readDesign reads the section's design file, when it has one, and
// records its digest.
func (r *sectionRun) readDesign() bool {
	spec := r.sp.Compare
	if spec == nil || spec.DesignPath == "" {
		return true
	}
	data, err := limits.ReadFile(r.pl.Pipeline.abs(spec.DesignPath), r.limits.InputBytes, r.limits.InputLines)
	if err != nil {
		return r.failInput("read design %s: %v", spec.DesignPath, err)
	}
	r.designData = data
	r.res.designFile = &FileHash{Path: spec.DesignPath, SHA256: digest.Bytes(data)}
	return true
}

// needsRunner reports whether any section runs stages for a comparison.
func (pl *Plan) needsRunner() bool {
	for _, s := range pl.Sections {
		if s.Compare != nil && s.Compare.aero() {
			return true
		}
	}
	return false
}

// writeVerdicts writes the batch table of verdicts, when any section was
// compared with a design, from the journal entries of the sections idx,
// and records it in outs.
func writeVerdicts(pl *Plan, folder string, idx []int, entry func(int) (journalEntry, bool, error), outs map[string]string) error {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	w.Write([]string{"section", "station", "design", "verdict", "points", "points_out", "units", "rms", "min", "max", "worst_at"})
	any := false
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	for _, i := range idx {
		sp := pl.Sections[i]
		if sp.Compare == nil {
			continue
		}
		any = true
		station := ""
		if sp.Station != nil {
			station = f(*sp.Station)
		}
		e, ok, err := entry(i)
		if err != nil {
			return err
		}
		status := StatusCancelled
		if ok {
			status = e.Record.Status
		}
		v := e.Compare
		if v == nil {
			w.Write([]string{sp.Name, station, sp.Compare.Design, "not compared (" + status + ")", "", "", "", "", "", "", ""})
			continue
		}
		w.Write([]string{sp.Name, station, v.Design, v.Verdict, strconv.Itoa(v.Points), strconv.Itoa(v.PointsOut), string(v.Units),
			f(v.RMS), f(v.Min), f(v.Max), v.WorstAt})
	}
	w.Flush()
	if !any {
		return nil
	}
	if err := atomicfile.WriteBytes(filepath.Join(folder, VerdictsName), b.Bytes()); err != nil {
		return fmt.Errorf("verdicts: %w", err)
	}
	outs[VerdictsName] = digest.Bytes(b.Bytes())
	return nil
}

// verdictLine words a section's verdict for the run's summary.
func verdictLine(r SectionReport) string {
	v := r.Compare
	return fmt.Sprintf("%-9s %s against %s: %d of %d point(s) out; deviation %+.3g to %+.3g %s, RMS %.3g %s; worst at %s",
		v.Verdict, r.Name, v.Design, v.PointsOut, v.Points, v.Min, v.Max, v.Units, v.RMS, v.Units, v.WorstAt)
}
