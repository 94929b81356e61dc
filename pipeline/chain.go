package pipeline

import (
	"context"

	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
)

// Chain is the Preparer of the real geometry chain (package prep), for
// Run.
type Chain struct{}

// Prepare makes the section document of one input.
func (Chain) Prepare(ctx context.Context, in Input, s prep.Settings) (Prepared, error) {
	if err := ctx.Err(); err != nil {
		return Prepared{}, err
	}
	p, err := prep.Prepare(in.Section, in.Files, s)
	if err != nil {
		return Prepared{}, err
	}
	doc, err := section.Encode(p.Section)
	if err != nil {
		return Prepared{}, err
	}
	out := Prepared{Section: doc, Doc: p.Section, Summary: p.OneLine(), Preparation: p}
	if in.PlotFormat != "" {
		figs, err := p.PrepFigures()
		if err != nil {
			return Prepared{}, err
		}
		for _, name := range prep.PlotNames {
			data, err := plot.Encode(figs[name], in.PlotFormat)
			if err != nil {
				return Prepared{}, err
			}
			// prep.svg, prep-deviation.svg, ...: the names prep --plot
			// gives them, apart from the plots stage's section.svg.
			file := prep.SiblingPath("prep."+in.PlotFormat, name)
			out.Artifacts = append(out.Artifacts, stage.Artifact{Name: file, MediaType: plot.MediaType(in.PlotFormat), Data: data})
		}
	}
	return out, nil
}
