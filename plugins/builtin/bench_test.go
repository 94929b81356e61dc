package builtin_test

import (
	"context"
	"os"
	"testing"
	"time"

	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/sdk"
	"github.com/foilwright/foilwright/plugins/stage"
)

// TestMain lets the test binary serve the built-in stages, as the
// foilwright binary does, so the benchmarks can run them as processes.
func TestMain(m *testing.M) {
	if len(os.Args) == 3 && os.Args[1] == "__stage" && os.Getenv(stage.Handshake.MagicCookieKey) != "" {
		if s, ok := builtin.Lookup(os.Args[2]); ok {
			sdk.Serve(s)
		}
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// batchCalls is the size of a batch: calls spread over the three
// built-ins in turn, each a NACA 2412 of 160 panels at 17 angles.
const batchCalls = 200

func batchRequests(b *testing.B) []stage.Request {
	sec, _ := naca(&testing.T{}, "2412", 80, true)
	reqs := make([]stage.Request, batchCalls)
	for i := range reqs {
		reqs[i] = stage.Request{Section: sec, Params: []byte(`{"alpha_deg": [-4,-3,-2,-1,0,1,2,3,4,5,6,7,8,9,10,11,12]}`), SectionName: "naca2412.json"}
	}
	return reqs
}

// BenchmarkBatch runs the batch in process (direct calls, result decoded as
// the host does) and through stage processes started beforehand; the ratio
// of the two is the cost of the process boundary.
func BenchmarkBatch(b *testing.B) {
	names := analysisStages
	reqs := batchRequests(b)
	b.Run("inprocess", func(b *testing.B) {
		stages := make([]stage.Stage, len(names))
		for i, n := range names {
			stages[i], _ = builtin.Lookup(n)
		}
		for b.Loop() {
			for i, req := range reqs {
				res, err := stages[i%len(stages)].Run(context.Background(), req)
				if err != nil {
					b.Fatal(err)
				}
				if res.Doc == nil {
					if _, err := stage.DecodeResult(res.JSON); err != nil {
						b.Fatal(err)
					}
				}
			}
		}
	})
	b.Run("subprocess", func(b *testing.B) {
		h, err := host.New(host.Options{})
		if err != nil {
			b.Fatal(err)
		}
		defer h.Close()
		runners := make([]*host.Runner, len(names))
		for i, n := range names {
			runners[i] = h.Runner(host.Builtin(n))
			if _, err := runners[i].Describe(b.Context()); err != nil {
				b.Fatal(err)
			}
		}
		for b.Loop() {
			for i, req := range reqs {
				if _, err := runners[i%len(runners)].Run(b.Context(), req); err != nil {
					b.Fatal(err)
				}
			}
		}
	})
}

// BenchmarkBatchRatio alternates an in-process and a subprocess batch in
// every iteration, so that both see the same machine load, and reports
// their times and ratio (subprocess / in process; target ≤ 1.25).
func BenchmarkBatchRatio(b *testing.B) {
	names := analysisStages
	reqs := batchRequests(b)
	stages := make([]stage.Stage, len(names))
	h, err := host.New(host.Options{})
	if err != nil {
		b.Fatal(err)
	}
	defer h.Close()
	runners := make([]*host.Runner, len(names))
	for i, n := range names {
		stages[i], _ = builtin.Lookup(n)
		runners[i] = h.Runner(host.Builtin(n))
		if _, err := runners[i].Describe(b.Context()); err != nil {
			b.Fatal(err)
		}
	}
	var in, sub time.Duration
	for b.Loop() {
		t0 := time.Now()
		for i, req := range reqs {
			res, err := stages[i%len(stages)].Run(context.Background(), req)
			if err != nil {
				b.Fatal(err)
			}
			if res.Doc == nil {
				if _, err := stage.DecodeResult(res.JSON); err != nil {
					b.Fatal(err)
				}
			}
		}
		t1 := time.Now()
		for i, req := range reqs {
			if _, err := runners[i%len(runners)].Run(b.Context(), req); err != nil {
				b.Fatal(err)
			}
		}
		in += t1.Sub(t0)
		sub += time.Since(t1)
	}
	b.ReportMetric(float64(in.Milliseconds())/float64(b.N), "inprocess-ms/batch")
	b.ReportMetric(float64(sub.Milliseconds())/float64(b.N), "subprocess-ms/batch")
	b.ReportMetric(float64(sub)/float64(in), "ratio")
}

// analysisStages are the three built-in analysis stages the batch
// benchmarks run (the plots stage draws, it does not analyse).
var analysisStages = []string{"source-panel", "thin-aerofoil", "vortex-panel"}
