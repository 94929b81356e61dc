// Command campaign runs the robustness campaign of the geometry chain:
// generated scans with known truth (internal/scangen) through the chain in
// process, compared with the truth, and prints the table of issue 10
// (figure | target | measured), the breakdowns and the failure messages.
//
//	go run ./internal/campaign/cmd/campaign -n 2000 -seed 1 -dump /tmp/bad
//	go run ./internal/campaign/cmd/campaign -case 1234
//	go run ./internal/campaign/cmd/campaign -n 100 -category lift
//	go run ./internal/campaign/cmd/campaign -n 3000 -well -records /tmp/recs.jsonl
//	go run ./internal/campaign/cmd/campaign -rejudge /tmp/recs.jsonl
//
// Every scan is invented data, never measured. The exit status is 0 even
// when targets are missed (it measures); 2 on bad usage or a generator
// error.
package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"github.com/foilwright/foilwright/internal/campaign"
	"github.com/foilwright/foilwright/internal/scangen"
)

func main() {
	n := flag.Int("n", 2000, "number of cases")
	seed := flag.Uint64("seed", 1, "seed of the first case; case i has seed+i")
	workers := flag.Int("workers", 0, "cases run at once (0: one per CPU)")
	dump := flag.String("dump", "", "folder to write the files of failed, wrong and trailing-edge-wrong cases into, with repro.txt")
	one := flag.Uint64("case", 0, "run one case by its seed and print everything about it")
	top := flag.Int("top", 15, "lines of each failure histogram")
	quiet := flag.Bool("quiet", false, "no progress lines")
	well := flag.Bool("well", false, "run only the well-sampled cases among those picked (≥ 300 good points, σ ≤ 0.5): the cases behind the well-sampled figures of the same run without it")
	records := flag.String("records", "", "file to write every case's record into, one JSON object a line (for analyses of the tails)")
	category := flag.String("category", "", "run only cases of this category (one of "+strings.Join(scangen.Categories(), ", ")+"): the first N seeds from -seed on that draw it")
	hazard := flag.String("hazard", "", "run only cases that carry this measurement hazard (as the breakdown names it, e.g. \"outlier clusters up to 8\"): the first N seeds from -seed on that draw it")
	fixture := flag.Bool("fixture", false, "add to every case a fixture's face measured with the part (3–12 points 0.01–0.15 chord off it, below or beyond an edge), drawn apart so the case is otherwise the plain one of its seed")
	rejudge := flag.String("rejudge", "", "read the records of a run (-records, of any build) and make this build's trailing-edge judgements on them again, from the truth of each seed, without running the chain: prints the trailing-edge rows and how the judgements split the cases (-records writes the records rejudged)")
	flag.Parse()
	if flag.NArg() > 0 || *n <= 0 {
		flag.Usage()
		os.Exit(2)
	}
	if *rejudge != "" {
		os.Exit(runRejudge(*rejudge, *records, *fixture, *workers))
	}
	if *one != 0 {
		os.Exit(runOne(*one, *fixture))
	}
	seeds, err := pickSeeds(*seed, *n, *category, *hazard)
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign:", err)
		os.Exit(2)
	}
	if *well {
		if seeds, err = wellSeeds(seeds); err != nil {
			fmt.Fprintln(os.Stderr, "campaign:", err)
			os.Exit(2)
		}
	}
	opts := campaign.Options{Workers: *workers, Every: 200, Fixture: *fixture}
	if !*quiet {
		opts.Progress = os.Stderr
	}
	var dumper campaign.Dumper
	if *dump != "" {
		if err := os.MkdirAll(*dump, 0o755); err != nil {
			fmt.Fprintln(os.Stderr, "campaign:", err)
			os.Exit(2)
		}
		dumper.Dir = *dump
		opts.Keep = dumper.Keep
	}
	start := time.Now()
	recs, err := campaign.Run(seeds, opts)
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign:", err)
		os.Exit(2)
	}
	fmt.Printf("campaign: %d cases, seeds %d to %d, %.0f s (synthetic scans with known truth, invented data)\n\n",
		len(seeds), seeds[0], seeds[len(seeds)-1], time.Since(start).Seconds())
	campaign.WriteTable(os.Stdout, campaign.Figures(recs))
	campaign.WriteFailures(os.Stdout, recs, *top)
	campaign.WriteTEJudgements(os.Stdout, recs)
	campaign.WriteBreakdowns(os.Stdout, recs)
	if *records != "" {
		if err := campaign.WriteRecords(*records, recs); err != nil {
			fmt.Fprintln(os.Stderr, "campaign:", err)
			os.Exit(2)
		}
	}
	if *dump != "" {
		if err := dumper.WriteRepro(recs); err != nil {
			fmt.Fprintln(os.Stderr, "campaign:", err)
			os.Exit(2)
		}
		fmt.Printf("\nfiles of the bad cases and %s/repro.txt written\n", *dump)
	}
}

// runRejudge rejudges the records in the file in (Rejudge), prints the
// trailing-edge rows of the table and the judgements' split, and writes
// the records rejudged to out when it is set.
func runRejudge(in, out string, fixture bool, workers int) int {
	recs, err := campaign.ReadRecords(in)
	if err == nil && len(recs) == 0 {
		err = fmt.Errorf("%s: no records", in)
	}
	if err == nil {
		err = campaign.Rejudge(recs, fixture, workers)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign:", err)
		return 2
	}
	fmt.Printf("campaign: %d records of %s, seeds %d to %d, trailing-edge judgements of this build made again (the stated kinds are the run's)\n\n",
		len(recs), in, recs[0].Seed, recs[len(recs)-1].Seed)
	campaign.WriteTable(os.Stdout, campaign.TEFigures(recs))
	campaign.WriteTEJudgements(os.Stdout, recs)
	if out != "" {
		if err := campaign.WriteRecords(out, recs); err != nil {
			fmt.Fprintln(os.Stderr, "campaign:", err)
			return 2
		}
	}
	return 0
}

// pickSeeds returns n seeds from seed on: every one, or with a category
// or a hazard only those whose case draws it (drawing a spec is cheap; the
// scan is generated later).
func pickSeeds(seed uint64, n int, category, hazard string) ([]uint64, error) {
	if category != "" && !slices.Contains(scangen.Categories(), category) {
		return nil, fmt.Errorf("-category %q: want one of %s", category, strings.Join(scangen.Categories(), ", "))
	}
	seeds := make([]uint64, 0, n)
	for s := seed; len(seeds) < n; s++ {
		if s-seed > 1000*uint64(n) {
			return nil, fmt.Errorf("-hazard %q: no case of the first %d seeds carries it (the breakdown \"measurement hazards\" names them)", hazard, s-seed)
		}
		sp := scangen.Draw(s)
		if (category == "" || sp.Category == category) && (hazard == "" || slices.Contains(campaign.Hazards(sp), hazard)) {
			seeds = append(seeds, s)
		}
	}
	return seeds, nil
}

// wellSeeds returns the seeds whose cases are well sampled, in order. The
// scans are generated to tell (the good points are counted on them), and
// generated again when run: a small cost beside the chain's.
func wellSeeds(seeds []uint64) ([]uint64, error) {
	var out []uint64
	for _, s := range seeds {
		c, err := campaign.NewCase(s)
		if err != nil {
			return nil, err
		}
		if c.WellSampled() {
			out = append(out, s)
		}
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("-well: none of the %d cases picked is well sampled", len(seeds))
	}
	return out, nil
}

// runOne runs one case and prints its spec, truth frame and record.
func runOne(seed uint64, fixture bool) int {
	newCase := campaign.NewCase
	if fixture {
		newCase = campaign.NewFixtureCase
	}
	c, err := newCase(seed)
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign:", err)
		return 2
	}
	r := c.Run()
	out := struct {
		Spec   any              `json:"spec"`
		Record *campaign.Record `json:"record"`
	}{c.Spec, &r}
	data, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign:", err)
		return 2
	}
	fmt.Println(string(data))
	path := filepath.Join(os.TempDir(), c.Scan.Name)
	if err := os.WriteFile(path, c.Scan.Data, 0o644); err == nil {
		fmt.Printf("wrote %s; rerun: go run ./cmd/foilwright prep %s -o %s.json\n", path, path, strings.TrimSuffix(path, filepath.Ext(path)))
	}
	return 0
}
