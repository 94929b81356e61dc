package pipeline

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"sort"
)

// The manifest is assembled from the journal, one section at a time, into
// the very bytes json.MarshalIndent(manifest, "", "  ") gives for the
// whole manifest in memory (assemble_test.go checks it), so that a run's
// memory does not grow with its sections.

// assembly is what a manifest is assembled from.
type assembly struct {
	pl          *Plan
	head        runHead
	interrupted bool
	shard       *ShardRecord
	// idx are the sections the manifest lists, in plan order; entry
	// reads the journal entry of section i (ok false: the section did not
	// finish, and is listed as cancelled).
	idx   []int
	entry func(i int) (journalEntry, bool, error)
	// runOutputs are the run's own outputs (stations, exports, tables).
	runOutputs map[string]string
	timings    Timings // without its sections
}

// record returns the manifest's record of section i and its outputs and
// timing: from its entry, or, for a section that did not finish, a
// cancelled record with no outputs.
func (a *assembly) record(i int) (SectionRecord, map[string]string, SectionTiming, error) {
	e, ok, err := a.entry(i)
	if err != nil {
		return SectionRecord{}, nil, SectionTiming{}, err
	}
	if ok {
		return e.Record, e.Outputs, e.Timing, nil
	}
	sp := a.pl.Sections[i]
	rec := SectionRecord{Name: sp.Name, Station: sp.Station, Inputs: []FileHash{}, Settings: sp.Settings, Status: StatusCancelled}
	if sp.Compare != nil {
		rec.Compare = notCompared(sp, nil)
	}
	return rec, nil, SectionTiming{}, nil
}

// The places in the indented manifest where the streamed parts go: the
// top-level "sections" and "outputs" (indented by two spaces, which only
// top-level keys are) and the timings' "sections" (the last key at four).
var (
	spliceSections = []byte("\n  \"sections\": []")
	spliceOutputs  = []byte("\n  \"outputs\": {}")
	spliceTimings  = []byte("\n    \"sections\": []")
)

// write writes the manifest to w.
func (a *assembly) write(w io.Writer) error {
	stages := a.head.Stages
	if stages == nil {
		stages = []StageRecord{}
	}
	m := Manifest{Format: ManifestFormat, Tool: a.head.Tool, Pipeline: a.head.Pipeline, Interrupted: a.interrupted,
		Shard: a.shard, Stages: stages, Sections: []SectionRecord{}, Outputs: map[string]string{}, Timings: a.timings}
	m.Timings.Sections = []SectionTiming{}
	skeleton, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return err
	}
	s1 := bytes.Index(skeleton, spliceSections)
	s2 := bytes.Index(skeleton, spliceOutputs)
	s3 := bytes.LastIndex(skeleton, spliceTimings)
	if s1 < 0 || s2 < s1 || s3 < s2 {
		return fmt.Errorf("pipeline: manifest layout: %q", skeleton)
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	// Each mark ends in the empty value ("[]" or "{}") the streamed one replaces.
	bw.Write(skeleton[:s1+len(spliceSections)-2])
	if err := a.writeSections(bw); err != nil {
		return err
	}
	bw.Write(skeleton[s1+len(spliceSections) : s2+len(spliceOutputs)-2])
	if err := a.writeOutputs(bw); err != nil {
		return err
	}
	bw.Write(skeleton[s2+len(spliceOutputs) : s3+len(spliceTimings)-2])
	if err := a.writeTimings(bw); err != nil {
		return err
	}
	bw.Write(skeleton[s3+len(spliceTimings):])
	bw.WriteByte('\n')
	return bw.Flush()
}

// element writes one element of an indented array or object at indent
// (the spaces before it), with sep before it.
func element(w *bufio.Writer, sep bool, indent string, key string, v any) error {
	var b []byte
	var err error
	if b, err = json.MarshalIndent(v, indent, "  "); err != nil {
		return err
	}
	if sep {
		w.WriteString(",")
	}
	w.WriteString("\n" + indent)
	if key != "" {
		k, _ := json.Marshal(key)
		w.Write(k)
		w.WriteString(": ")
	}
	w.Write(b)
	return nil
}

func (a *assembly) writeSections(w *bufio.Writer) error {
	if len(a.idx) == 0 {
		w.WriteString("[]")
		return nil
	}
	w.WriteString("[")
	for k, i := range a.idx {
		rec, _, _, err := a.record(i)
		if err != nil {
			return err
		}
		if err := element(w, k > 0, "    ", "", rec); err != nil {
			return err
		}
	}
	w.WriteString("\n  ]")
	return nil
}

// writeOutputs writes the outputs object, sorted by path as
// json.MarshalIndent sorts a map: the sections in the order of their
// folders, each one's files sorted, and the run's own files (which have
// no folder) among them.
func (a *assembly) writeOutputs(w *bufio.Writer) error {
	runKeys := make([]string, 0, len(a.runOutputs))
	for k := range a.runOutputs {
		runKeys = append(runKeys, k)
	}
	sort.Strings(runKeys)
	n := 0
	emit := func(k, v string) error {
		if n == 0 {
			w.WriteString("{")
		}
		err := element(w, n > 0, "    ", k, v)
		n++
		return err
	}
	r := 0
	for _, i := range sortedByFolder(a.pl, a.idx) {
		folder := a.pl.Sections[i].Name + "/"
		for ; r < len(runKeys) && runKeys[r] < folder; r++ {
			if err := emit(runKeys[r], a.runOutputs[runKeys[r]]); err != nil {
				return err
			}
		}
		_, outs, _, err := a.record(i)
		if err != nil {
			return err
		}
		keys := make([]string, 0, len(outs))
		for k := range outs {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			if err := emit(k, outs[k]); err != nil {
				return err
			}
		}
	}
	for ; r < len(runKeys); r++ {
		if err := emit(runKeys[r], a.runOutputs[runKeys[r]]); err != nil {
			return err
		}
	}
	if n == 0 {
		w.WriteString("{}")
		return nil
	}
	w.WriteString("\n  }")
	return nil
}

func (a *assembly) writeTimings(w *bufio.Writer) error {
	if len(a.idx) == 0 {
		w.WriteString("[]")
		return nil
	}
	w.WriteString("[")
	for k, i := range a.idx {
		_, _, t, err := a.record(i)
		if err != nil {
			return err
		}
		if err := element(w, k > 0, "      ", "", t); err != nil {
			return err
		}
	}
	w.WriteString("\n    ]")
	return nil
}

// writeTo writes the assembled manifest to path, atomically.
func (a *assembly) writeTo(path string) error {
	if err := writeStream(path, a.write); err != nil {
		return fmt.Errorf("pipeline: write manifest: %w", err)
	}
	return nil
}
