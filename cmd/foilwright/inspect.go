package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

type inspectOptions struct {
	flags prepFlags
	json  bool
	quiet bool
}

func newInspectCmd() *cobra.Command {
	var opts inspectOptions
	cmd := &cobra.Command{
		Use:   "inspect FILE|SECTION.json [flags]",
		Short: "Say what a point file or a section document is, writing nothing",
		Long: `inspect reports on a file without writing anything. Given a section document
it prints its counts, frame, fit, trailing edge, panel quality (measured afresh
from the nodes), properties and warnings. Given a point file it runs the same
geometry chain as prep, with the same flags, and prints prep's summary. With -q
it prints nothing: the exit status says whether the file could be used.`,
		Example: `  foilwright inspect section.json
  foilwright inspect examples/cad-export/section.dxf --noise 0
  foilwright inspect section.json --json`,
		Args:              cobra.MinimumNArgs(1),
		ValidArgsFunction: pointFileArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			stdout := cmd.OutOrStdout()
			if opts.quiet {
				stdout = io.Discard
			}
			files, err := inputFiles(cmd, args)
			if err != nil {
				return err
			}
			if len(files) == 1 && looksLikeSection(files[0].Data) {
				sec, err := section.Read(bytes.NewReader(files[0].Data), files[0].Path)
				if err != nil {
					return badInput(err)
				}
				return inspectSection(stdout, files[0].Path, sec, opts.json)
			}
			s, err := opts.flags.settings(cmd)
			if err != nil {
				return err
			}
			p, err := prep.Prepare(sectionName(args), files, s)
			if err != nil {
				return chainError(err)
			}
			if opts.json {
				return section.Write(stdout, p.Section)
			}
			p.WriteSummary(stdout)
			return nil
		},
	}
	opts.flags.registerRead(cmd)
	opts.flags.registerShape(cmd)
	jsonFlag(cmd, &opts.json, "print the report as JSON (for a point file: the section document prep would write)")
	quietFlag(cmd, &opts.quiet, "print nothing; the exit status says whether the file could be used")
	return cmd
}

// looksLikeSection reports whether data is a JSON object that names the
// section format.
func looksLikeSection(data []byte) bool {
	t := bytes.TrimSpace(data)
	if len(t) == 0 || t[0] != '{' {
		return false
	}
	var head struct {
		Format string `json:"format"`
	}
	return json.Unmarshal(t, &head) != nil || head.Format == section.Format || bytes.Contains(t[:min(len(t), 4096)], []byte(`"nodes"`))
}

// sectionReport is the JSON report of inspect on a section document.
type sectionReport struct {
	Name       string                `json:"name,omitempty"`
	Units      geometry.Unit         `json:"units,omitempty"`
	Nodes      int                   `json:"nodes"`
	Panels     int                   `json:"panels"`
	LEIndex    *int                  `json:"le_index,omitempty"`
	Closed     bool                  `json:"closed"`
	Quality    repanel.Quality       `json:"quality"`
	Frame      *section.Frame        `json:"frame,omitempty"`
	Fit        *section.FitSummary   `json:"fit,omitempty"`
	TE         *section.TrailingEdge `json:"trailing_edge,omitempty"`
	Properties *section.Properties   `json:"properties,omitempty"`
	Warnings   []string              `json:"warnings"`
}

func inspectSection(w io.Writer, path string, s *section.Section, asJSON bool) error {
	if len(s.Nodes) < 3 {
		return badInputf("%s: %d node(s): a section needs at least 3", path, len(s.Nodes))
	}
	q := repanel.Measure(s.Nodes)
	closed := s.Nodes[0].Dist(s.Nodes[len(s.Nodes)-1]) <= 1e-12
	if asJSON {
		rep := sectionReport{
			Name: s.Name, Units: s.Units, Nodes: len(s.Nodes), Panels: len(s.Nodes) - 1, LEIndex: s.LEIndex,
			Closed: closed, Quality: q, Frame: s.Frame, Fit: s.Fit, TE: s.TrailingEdge, Properties: s.Properties,
			Warnings: append(append([]string{}, s.Warnings...), q.Warnings...),
		}
		b, err := json.MarshalIndent(rep, "", "  ")
		if err != nil {
			return err
		}
		_, err = w.Write(append(section.CompactNumberArrays(b), '\n'))
		return err
	}
	name := s.Name
	if name == "" {
		name = path
	}
	te := "open (first and last node differ)"
	if closed {
		te = "closed (first node = last node)"
	}
	fmt.Fprintf(w, "%s: section document, %d nodes (%d panels), trailing edge %s\n", name, len(s.Nodes), len(s.Nodes)-1, te)
	if src := s.Source; src != nil {
		fmt.Fprintf(w, "  made from   %d points of %v, %d used, %d dropped\n", src.PointsRead, src.Files, src.PointsUsed, len(src.Dropped))
	}
	fmt.Fprintf(w, "  measured    panel lengths %.3g to %.3g c, largest ratio %.2f, largest turn %.1f°\n", q.MinLength, q.MaxLength, q.MaxRatio, q.MaxTurnDeg)
	prep.WriteSectionReport(w, s, "", "")
	for _, warn := range q.Warnings {
		fmt.Fprintf(w, "  warning: %s\n", warn)
	}
	return nil
}
