package campaign

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"

	"github.com/foilwright/foilwright/internal/atomicfile"
)

// Bad reports why a record counts against a target: "failed", "wrong"
// (exit 0 beyond its uncertainty), "trailing edge" (the kind stated is
// wrong), or "" when none of these.
func (r *Record) Bad() string {
	switch {
	case !r.OK:
		return "failed"
	case r.Wrong != "":
		return "wrong"
	case !r.TERight:
		return "trailing edge"
	}
	return ""
}

// Dumper writes the files of bad cases into a folder for reproduction:
// the point file as generated, and a JSON file with the spec, the truth
// (with every line) and the record.
type Dumper struct {
	Dir string
}

// Keep writes the files of c when r is bad; it suits Options.Keep.
func (d Dumper) Keep(c *Case, r *Record) {
	if r.Bad() == "" {
		return
	}
	base := filepath.Join(d.Dir, fmt.Sprintf("case-%d", c.Seed))
	if err := atomicfile.WriteBytes(filepath.Join(d.Dir, c.Scan.Name), c.Scan.Data); err != nil {
		fmt.Fprintln(os.Stderr, "campaign: dump:", err)
		return
	}
	info := struct {
		Seed   uint64      `json:"seed"`
		Spec   any         `json:"spec"`
		Record *Record     `json:"record"`
		Truth  interface{} `json:"truth"`
	}{c.Seed, c.Spec, r, c.Scan.Truth}
	data, err := json.MarshalIndent(info, "", "  ")
	if err == nil {
		err = atomicfile.WriteBytes(base+".json", data)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "campaign: dump:", err)
	}
}

// WriteRepro writes one line per bad record: the command that reruns the
// file through `prep`, and the one that reruns the comparison, with why
// it counts.
func (d Dumper) WriteRepro(recs []Record) error {
	var bad []*Record
	for i := range recs {
		if recs[i].Bad() != "" {
			bad = append(bad, &recs[i])
		}
	}
	sort.Slice(bad, func(i, j int) bool { return bad[i].Seed < bad[j].Seed })
	return atomicfile.Write(filepath.Join(d.Dir, "repro.txt"), func(w io.Writer) error {
		for _, r := range bad {
			why := r.Bad()
			switch why {
			case "failed":
				why += ": " + r.Err
			case "wrong":
				why += ": " + r.Wrong
			default:
				why += ": " + r.Truth.TEKind + " stated " + r.TEGot
			}
			if _, err := fmt.Fprintf(w, "go run ./cmd/foilwright prep %s -o /tmp/case-%d.json  # or: go run ./internal/campaign/cmd/campaign -case %d  # %s\n",
				filepath.Join(d.Dir, r.File), r.Seed, r.Seed, why); err != nil {
				return err
			}
		}
		return nil
	})
}

// WriteRecords writes every record to the file at path, one JSON object a
// line in the order given, for analyses of the tails of the figures
// (which cases make a 95th percentile, and why).
func WriteRecords(path string, recs []Record) error {
	return atomicfile.Write(path, func(w io.Writer) error {
		enc := json.NewEncoder(w)
		for i := range recs {
			if err := enc.Encode(&recs[i]); err != nil {
				return err
			}
		}
		return nil
	})
}
