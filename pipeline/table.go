package pipeline

import (
	"encoding/csv"
	"io"
	"maps"
	"math"
	"slices"
	"strconv"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/plugins/stage"
)

// TableName is the batch table at the root of every run folder: one row
// per section, for a spreadsheet.
const TableName = "batch.csv"

// A Cell is one value of a section's row of the batch table: a column of
// the section itself (Stage ""), or a scalar of a stage's result, or a
// number of one of its cases (Alpha set).
type Cell struct {
	Stage string   `json:"s,omitempty"`
	Name  string   `json:"c"`
	Alpha *float64 `json:"a,omitempty"`
	Value string   `json:"v"`
}

// header is the cell's column name: "chord", "vortex.panels",
// "vortex.cl@4".
func (c Cell) header() string {
	switch {
	case c.Stage == "":
		return c.Name
	case c.Alpha == nil:
		return c.Stage + "." + c.Name
	}
	return c.Stage + "." + c.Name + "@" + strconv.FormatFloat(*c.Alpha, 'g', -1, 64)
}

// sectionColumns are the batch table's columns of the section itself,
// in order, each with the key of the section document it comes from ("":
// set by the run). The verdict of a comparison with the design, when the
// pipeline compares, and the reason a section failed close the row.
var sectionColumns = []struct{ name, key string }{
	{"section", ""},
	{"station", ""},
	{"status", ""},
	{"units", "units"},
	{"points_read", "source.points_read"},
	{"points_used", "source.points_used"},
	{"chord", "frame.chord"},
	{"twist_deg", "frame.twist_deg"},
	{"le_x", "frame.le.0"},
	{"le_y", "frame.le.1"},
	{"mirrored", "frame.mirrored"},
	{"thickness", "properties.thickness"},
	{"thickness_at", "properties.thickness_at"},
	{"camber", "properties.camber"},
	{"camber_at", "properties.camber_at"},
	{"le_radius", "properties.le_radius"},
	{"te_angle_deg", "properties.te_angle_deg"},
	{"fit_rms", "fit.rms"},
	{"fit_max", "fit.max"},
	{"uncertainty_chord", "uncertainty.chord"},
	{"uncertainty_twist_deg", "uncertainty.twist_deg"},
	{"uncertainty_le", "uncertainty.le"},
	{"uncertainty_surface", "uncertainty.surface"},
	{"te_kind", "trailing_edge.kind"},
	{"te_thickness", "trailing_edge.thickness"},
	{"te_action", "trailing_edge.action"},
	{"panels", "panels.count"},
	{"warnings", "warnings.#"},
}

// Closing columns.
const (
	colVerdict = "verdict" // pass or fail against the design, when the pipeline compares
	colError   = "error"   // why the section failed
)

// tableRow makes a section's row: its own columns from its section
// document (when it was made), each stage's scalars and the numbers of
// each of its cases (Cl, Cm at each angle), and the closing columns.
func tableRow(name string, station *float64, status, errText, verdict string, sec []byte, stageIDs []string, results map[string]*stage.ResultDoc) []Cell {
	row := []Cell{{Name: "section", Value: name}, {Name: "status", Value: status}}
	if station != nil {
		row = append(row, Cell{Name: "station", Value: strconv.FormatFloat(*station, 'g', -1, 64)})
	}
	if len(sec) > 0 {
		doc := gjson.ParseBytes(sec)
		for _, c := range sectionColumns {
			if c.key == "" {
				continue
			}
			if v := doc.Get(c.key); v.Exists() {
				row = append(row, Cell{Name: c.name, Value: cellText(v)})
			}
		}
	}
	num := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	for _, id := range stageIDs {
		doc, ok := results[id]
		if !ok || doc == nil {
			continue
		}
		for _, k := range slices.Sorted(maps.Keys(doc.Scalars)) {
			if v := doc.Scalars[k]; !math.IsNaN(v) && !math.IsInf(v, 0) {
				row = append(row, Cell{Stage: id, Name: k, Value: num(v)})
			}
		}
		for _, c := range doc.Cases {
			if c == nil {
				continue
			}
			alpha := c.AlphaDeg
			for _, f := range []struct {
				name string
				v    float64
			}{{"cl", c.CL}, {"cm_c4", c.CMc4}} {
				if !math.IsNaN(f.v) && !math.IsInf(f.v, 0) {
					row = append(row, Cell{Stage: id, Name: f.name, Alpha: &alpha, Value: num(f.v)})
				}
			}
		}
	}
	if verdict != "" {
		row = append(row, Cell{Name: colVerdict, Value: verdict})
	}
	if errText != "" {
		row = append(row, Cell{Name: colError, Value: errText})
	}
	return row
}

func cellText(v gjson.Result) string {
	switch v.Type {
	case gjson.Number:
		return v.Raw
	case gjson.True:
		return "1"
	case gjson.False:
		return "0"
	}
	return v.String()
}

// tableColumns orders the columns of a batch table: the section's own,
// then each stage's in the order the stages run (its scalars by name,
// then its case numbers by angle and name), then the closing ones.
type tableColumns struct {
	stage map[string]int // stage id → its place
	seen  map[string]Cell
}

func newTableColumns(stageIDs []string) *tableColumns {
	t := &tableColumns{stage: map[string]int{}, seen: map[string]Cell{}}
	for i, id := range stageIDs {
		t.stage[id] = i
	}
	return t
}

// add notes the stage columns of a row.
func (t *tableColumns) add(row []Cell) {
	for _, c := range row {
		if c.Stage != "" {
			if _, ok := t.seen[c.header()]; !ok {
				t.seen[c.header()] = Cell{Stage: c.Stage, Name: c.Name, Alpha: c.Alpha}
			}
		}
	}
}

// headers returns every column name in order.
func (t *tableColumns) headers() []string {
	var h []string
	for _, c := range sectionColumns {
		h = append(h, c.name)
	}
	cells := make([]Cell, 0, len(t.seen))
	for _, c := range t.seen {
		cells = append(cells, c)
	}
	slices.SortFunc(cells, func(a, b Cell) int {
		if d := t.stage[a.Stage] - t.stage[b.Stage]; d != 0 {
			return d
		}
		switch {
		case a.Alpha == nil && b.Alpha != nil:
			return -1
		case a.Alpha != nil && b.Alpha == nil:
			return 1
		case a.Alpha != nil && *a.Alpha != *b.Alpha:
			if *a.Alpha < *b.Alpha {
				return -1
			}
			return 1
		}
		if a.Name < b.Name {
			return -1
		}
		if a.Name > b.Name {
			return 1
		}
		return 0
	})
	for _, c := range cells {
		h = append(h, c.header())
	}
	return append(h, colVerdict, colError)
}

// tableWriter writes a batch table row by row.
type tableWriter struct {
	cols []string
	at   map[string]int
	w    *csv.Writer
}

func newTableWriter(w io.Writer, cols []string) *tableWriter {
	t := &tableWriter{cols: cols, at: map[string]int{}, w: csv.NewWriter(w)}
	for i, c := range cols {
		t.at[c] = i
	}
	t.w.Write(cols)
	return t
}

func (t *tableWriter) row(cells []Cell) {
	rec := make([]string, len(t.cols))
	for _, c := range cells {
		if i, ok := t.at[c.header()]; ok {
			rec[i] = c.Value
		}
	}
	t.w.Write(rec)
}

func (t *tableWriter) flush() error {
	t.w.Flush()
	return t.w.Error()
}
