package pipeline

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
)

// A CostModel estimates what a section costs from its input bytes (see
// SectionCost): Seconds = Fixed + PerMB × MB of one core's time, and
// the memory a worker needs beside foilwright's own process.
type CostModel struct {
	// Fixed is the seconds a section costs whatever its size (the
	// stages, starting the chain); PerMB the seconds per MB of input.
	Fixed, PerMB float64
	// BaseMiB is foilwright's own process; StageMiB one stage process;
	// PerPointKiB what preparing a section holds per point (a point being
	// about BytesPerPoint bytes of input).
	BaseMiB, StageMiB, PerPointKiB, BytesPerPoint float64
	// Source says where the figures come from.
	Source string
}

// DefaultCostModel is the cost model of the demo blade batch
// (internal/demogen -batch: laser-scan slices of 1 000 points through the
// vortex-panel, thin-aerofoil and source-panel stages) on the two-core
// development machine, which other jobs share: scripts/batch-throughput.sh
// fitted 0.087 to 0.094 s + 1.1 to 3.9 s per MB in three runs (README,
// "What a batch costs, measured"); the default rounds both up, since a
// job past its time is killed. BaseMiB, StageMiB and PerPointKiB are the
// memory measured there and in the Limits section. Calibrate it with
// manifests of runs of your own (CalibrateCost).
var DefaultCostModel = CostModel{
	Fixed: 0.25, PerMB: 2.0,
	BaseMiB: 120, StageMiB: 60, PerPointKiB: 1.1, BytesPerPoint: 30,
	Source: "foilwright's default model (the demo batch on the development machine)",
}

// Seconds is the estimated time of a section of b input bytes on one
// core.
func (c CostModel) Seconds(b int64) float64 { return c.Fixed + c.PerMB*float64(b)/1e6 }

// MemoryMiB is the estimated memory of a task running jobs workers of
// a pipeline with stages stages, whose largest section has b input
// bytes.
func (c CostModel) MemoryMiB(jobs, stages int, b int64) float64 {
	points := float64(b) / c.BytesPerPoint
	return c.BaseMiB + float64(jobs)*(float64(stages)*c.StageMiB+points*c.PerPointKiB/1024)
}

// CalibrateCost fits the cost model's time to recorded runs: the time of
// each section in their manifests (preparing and every stage) against the
// bytes of its inputs now (their files are read relative to each
// manifest's pipeline file), by least squares. Runs of sections of
// different sizes (a sparse and a dense batch) fix both terms. It keeps
// base's memory figures, raising BaseMiB to the runs' own peak memory
// when larger.
func CalibrateCost(manifests []string, base CostModel) (CostModel, error) {
	if len(manifests) == 0 {
		return base, errors.New("no manifest to calibrate on")
	}
	c := base
	var xs, ys []float64
	for _, manifest := range manifests {
		x, y, rss, err := sectionTimes(manifest)
		if err != nil {
			return base, err
		}
		xs, ys = append(xs, x...), append(ys, y...)
		c.BaseMiB = max(c.BaseMiB, float64(rss)/1024)
	}
	c.Fixed, c.PerMB = fitLine(xs, ys)
	c.Source = fmt.Sprintf("calibrated on %d section(s) of %s", len(xs), strings.Join(manifests, ", "))
	return c, nil
}

// sectionTimes reads a manifest's section times (s of one core) and
// the MB of each section's inputs, and the run's peak memory (KiB).
func sectionTimes(manifest string) (mb, s []float64, rssKiB int64, err error) {
	m, err := ReadManifest(manifest)
	if err != nil {
		return nil, nil, 0, err
	}
	pfile := filepath.FromSlash(m.Pipeline.File)
	if !filepath.IsAbs(pfile) {
		pfile = filepath.Join(filepath.Dir(manifest), pfile)
	}
	dir := filepath.Dir(pfile)
	size := map[string]int64{}
	for _, s := range m.Sections {
		var n int64
		for _, f := range s.Inputs {
			p := filepath.FromSlash(f.Path)
			if !filepath.IsAbs(p) {
				p = filepath.Join(dir, p)
			}
			if st, err := os.Stat(p); err == nil {
				n += st.Size()
			}
		}
		size[s.Name] = n
	}
	var sum float64
	for _, t := range m.Timings.Sections {
		if t.Name == "" {
			continue // never started
		}
		y := t.PrepareS
		for _, st := range t.Stages {
			y += st.S
		}
		mb = append(mb, float64(size[t.Name])/1e6)
		s = append(s, y)
		sum += y
	}
	if len(mb) == 0 {
		return nil, nil, 0, fmt.Errorf("%s times no section", manifest)
	}
	// What the sections' own times leave out (starting the stage
	// processes, writing the outputs, the journal and the manifest) is
	// shared out among them: the run's core-seconds are its time by its
	// workers (exact for one worker, an upper bound for more).
	if extra := (m.Timings.TotalS*float64(max(m.Timings.Jobs, 1)) - sum) / float64(len(s)); extra > 0 {
		for i := range s {
			s[i] += extra
		}
	}
	return mb, s, m.Timings.MaxRSSKiB, nil
}

// fitLine fits y = a + b·x by least squares, with b ≥ 0 and a ≥ 0 (a
// section costs something, a larger one no less).
func fitLine(xs, ys []float64) (a, b float64) {
	n := float64(len(xs))
	var sx, sy, sxx, sxy float64
	for i := range xs {
		sx += xs[i]
		sy += ys[i]
		sxx += xs[i] * xs[i]
		sxy += xs[i] * ys[i]
	}
	den := n*sxx - sx*sx
	if den > 1e-12*n*sxx && den > 0 {
		b = (n*sxy - sx*sy) / den
	}
	if b < 0 || math.IsNaN(b) {
		b = 0
	}
	a = (sy - b*sx) / n
	if a < 0 {
		a = 0
		if sxx > 0 {
			b = sxy / sxx
		}
	}
	return a, b
}
