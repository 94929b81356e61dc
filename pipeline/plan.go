package pipeline

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/foilwright/foilwright/prep"
)

// A Plan is the work a pipeline asks for: the sections its inputs make, in
// file order, and its stages in dependency order. Every section goes through
// the same steps: prepare, then each stage of Stages in turn.
type Plan struct {
	Pipeline *Pipeline
	Sections []SectionPlan
	Stages   []Stage // dependency order: a stage comes after every stage it lists in After
}

// A SectionPlan is one section to make.
type SectionPlan struct {
	Name     string        // folder name in the run folder
	Input    int           // index of the input in Pipeline.Inputs
	Files    []string      // recorded paths (see InputSpec.Paths), in reading order
	Station  *float64      // spanwise station, if the input gives one
	Settings prep.Settings // "prepare" with the input's reading keys on top
	Compare  *CompareSpec  // the compare block (the input's over the top-level one), or nil
}

// Plan expands the inputs into sections and orders the stages. Globs were
// expanded and sorted when the file was parsed, so the plan is the same
// every time for the same files.
func (p *Pipeline) Plan() *Plan {
	pl := &Plan{Pipeline: p}
	for i, in := range p.Inputs {
		names := sectionNames(in)
		settings := overlay(p.Prepare, in.Read)
		cmp := mergeCompare(p.Compare, in.Compare)
		if in.PerFile {
			for k, f := range in.Paths {
				pl.Sections = append(pl.Sections, SectionPlan{Name: names[k], Input: i, Files: []string{f}, Station: in.Station, Settings: settings, Compare: cmp})
			}
			continue
		}
		pl.Sections = append(pl.Sections, SectionPlan{Name: names[0], Input: i, Files: in.Paths, Station: in.Station, Settings: settings, Compare: cmp})
	}
	order := p.order
	if order == nil {
		order, _ = orderStages(p.Stages)
	}
	for _, i := range order {
		pl.Stages = append(pl.Stages, p.Stages[i])
	}
	return pl
}

// Folder returns the run folder the pipeline file names, resolved against
// the pipeline's folder.
func (p *Pipeline) Folder() string {
	f := filepath.FromSlash(p.Outputs.Folder)
	if filepath.IsAbs(f) {
		return f
	}
	return filepath.Join(p.Dir, f)
}

// abs resolves a recorded input path.
func (p *Pipeline) abs(rel string) string {
	f := filepath.FromSlash(rel)
	if filepath.IsAbs(f) {
		return f
	}
	return filepath.Join(p.Dir, f)
}

// Describe writes the plan for a person to read: the sections with their
// files and the steps each goes through.
func (pl *Plan) Describe(w io.Writer) error {
	var b strings.Builder
	fmt.Fprintf(&b, "pipeline %q: %d section(s), %d stage(s)\n", pl.Pipeline.Name, len(pl.Sections), len(pl.Stages))
	for _, s := range pl.Sections {
		fmt.Fprintf(&b, "section %s: %s", s.Name, strings.Join(s.Files, ", "))
		if s.Station != nil {
			fmt.Fprintf(&b, " (station %g)", *s.Station)
		}
		if s.Compare != nil {
			fmt.Fprintf(&b, "; compared with %s", s.Compare.Design)
		}
		b.WriteByte('\n')
	}
	b.WriteString("steps: prepare")
	for _, st := range pl.Stages {
		fmt.Fprintf(&b, ", %s (%s)", st.ID, st.Stage)
	}
	b.WriteByte('\n')
	_, err := io.WriteString(w, b.String())
	return err
}

// orderStages returns the stage indexes in dependency order, choosing among
// the stages that are ready the one that comes first in the file, so the
// order is stable. When the dependencies have a cycle, it returns one cycle
// instead, as indexes where each stage runs after the next, starting at the
// cycle's first stage in the file.
func orderStages(stages []Stage) (order []int, cycle []int) {
	index := map[string]int{}
	for i, s := range stages {
		index[s.ID] = i
	}
	waiting := make([]int, len(stages)) // unfinished dependencies
	users := make([][]int, len(stages))
	for i, s := range stages {
		for _, id := range s.After {
			if j, ok := index[id]; ok {
				waiting[i]++
				users[j] = append(users[j], i)
			}
		}
	}
	done := make([]bool, len(stages))
	for len(order) < len(stages) {
		next := -1
		for i := range stages {
			if !done[i] && waiting[i] == 0 {
				next = i
				break
			}
		}
		if next < 0 {
			return nil, findCycle(stages, index, done)
		}
		done[next] = true
		order = append(order, next)
		for _, u := range users[next] {
			waiting[u]--
		}
	}
	return order, nil
}

// findCycle follows "after" links among the stages not done until one
// repeats. Every stage not done waits on another one not done, so the walk
// always closes.
func findCycle(stages []Stage, index map[string]int, done []bool) []int {
	start := 0
	for done[start] {
		start++
	}
	at := map[int]int{}
	var path []int
	for i := start; ; {
		if k, seen := at[i]; seen {
			c := path[k:]
			// Rotate so the first stage in the file leads.
			lo := 0
			for j := range c {
				if c[j] < c[lo] {
					lo = j
				}
			}
			return append(append([]int{}, c[lo:]...), c[:lo]...)
		}
		at[i] = len(path)
		path = append(path, i)
		for _, id := range stages[i].After {
			if j, ok := index[id]; ok && !done[j] {
				i = j
				break
			}
		}
	}
}
