package stage_test

import (
	"context"
	"errors"
	"fmt"
	"net"
	"reflect"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/plugins/stagetest"
)

// countingConn counts the writes of the host's end of a frames channel:
// one a call sent as a frame.
type countingConn struct {
	net.Conn
	writes atomic.Int64
}

func (c *countingConn) Write(b []byte) (int, error) {
	c.writes.Add(1)
	return c.Conn.Write(b)
}

// framesClient serves impl over gRPC and over a frames channel of max
// bytes a message, and returns the client with the host's end.
func framesClient(t *testing.T, impl stage.Stage, max int) (*stage.Client, *countingConn, net.Conn) {
	t.Helper()
	c := stagetest.Connect(t, impl).(*stage.Client)
	if _, err := c.Describe(t.Context()); err != nil {
		t.Fatal(err)
	}
	hostEnd, stageEnd := net.Pipe()
	conn := &countingConn{Conn: hostEnd}
	done := make(chan struct{})
	go func() {
		defer close(done)
		stage.ServeFrames(stageEnd, impl, nil, max)
	}()
	t.Cleanup(func() {
		hostEnd.Close()
		stageEnd.Close()
		<-done
	})
	c.SetFrames(stage.NewFrames(conn, func() { hostEnd.SetDeadline(time.Unix(1, 0)) }))
	return c, conn, stageEnd
}

// failing answers every call with a stage error, or panics.
type failing struct{ panics bool }

func (failing) Describe(context.Context) (stage.Info, error) {
	return stage.Info{Name: "toy", Version: "1", Summary: "fails", Packed: true}, nil
}

func (f failing) Run(context.Context, stage.Request) (stage.Result, error) {
	if f.panics {
		panic("solver blew up")
	}
	return stage.Result{}, stage.Diverged(errors.New("no convergence after 7 steps"))
}

// TestFramesAsGRPC: a call sent as a frame gives the stage the same
// request and the host the same reply, or the same error, as over gRPC.
func TestFramesAsGRPC(t *testing.T) {
	rest, nodes, err := stage.SplitNodes(stagetest.Section(8))
	if err != nil {
		t.Fatal(err)
	}
	req := stage.Request{Section: rest, Nodes: nodes, Params: []byte(`{"a": 1}`), SectionName: "s.json",
		DepResults: map[string]*stage.ResultDoc{"v": sample()}}
	for _, tc := range []struct {
		name string
		impl func() stage.Stage
	}{
		{"packed answer", func() stage.Stage { return &recorder{packed: true} }},
		{"text answer", func() stage.Stage { return &recorder{packed: true, text: true} }},
		{"JSON stage", func() stage.Stage { return &recorder{} }},
		{"stage error", func() stage.Stage { return failing{} }},
		{"panic", func() stage.Stage { return failing{panics: true} }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			viaGRPC, viaFrames := tc.impl(), tc.impl()
			g := stagetest.Connect(t, viaGRPC)
			if _, err := g.Describe(t.Context()); err != nil {
				t.Fatal(err)
			}
			f, conn, _ := framesClient(t, viaFrames, 64<<20)
			want, wantErr := g.Run(t.Context(), req)
			got, gotErr := f.Run(t.Context(), req)
			if conn.writes.Load() != 1 {
				t.Fatalf("%d frames written, want 1", conn.writes.Load())
			}
			if !reflect.DeepEqual(got, want) || !reflect.DeepEqual(gotErr, wantErr) {
				t.Errorf("frames: %+v, %v\ngRPC:   %+v, %v", got, gotErr, want, wantErr)
			}
			if r1, ok := viaGRPC.(*recorder); ok {
				if r2 := viaFrames.(*recorder); !reflect.DeepEqual(r1.got, r2.got) {
					t.Errorf("the stage got %+v as a frame, %+v over gRPC", r2.got, r1.got)
				}
			}
		})
	}
}

// TestFramesLimits: a reply larger than the host's limit, and a request
// larger than the stage's, fail as over gRPC (ResourceExhausted), and the
// channel serves the next call.
func TestFramesLimits(t *testing.T) {
	req := stage.Request{Section: stagetest.Section(8), SectionName: "s.json"}
	c, conn, _ := framesClient(t, &recorder{packed: true}, 64<<20)
	c.SetMaxReply(100)
	_, err := c.Run(t.Context(), req)
	if status.Code(err) != codes.ResourceExhausted || !strings.Contains(err.Error(), "vs. 100)") {
		t.Errorf("reply past the limit: %v", err)
	}
	c.SetMaxReply(0)
	if _, err := c.Run(t.Context(), req); err != nil || conn.writes.Load() != 2 {
		t.Errorf("next call: %v after %d frames", err, conn.writes.Load())
	}

	c, conn, _ = framesClient(t, &recorder{packed: true}, 500)
	_, err = c.Run(t.Context(), req)
	if status.Code(err) != codes.ResourceExhausted || !strings.Contains(err.Error(), "vs. 500)") || conn.writes.Load() != 1 {
		t.Errorf("request past the stage's limit: %v", err)
	}
}

// blocking waits in Run until its call's context ends, and says when it
// had a deadline.
type blocking struct {
	recorder
	deadline atomic.Bool
	release  chan struct{} // closed at the test's end: frames do not carry a cancel
}

func newBlocking() *blocking {
	return &blocking{recorder: recorder{packed: true}, release: make(chan struct{})}
}

func (b *blocking) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	if _, ok := ctx.Deadline(); ok {
		b.deadline.Store(true)
	}
	if string(req.Params) == `{"wait": true}` {
		select {
		case <-ctx.Done():
		case <-b.release:
		}
		return stage.Result{}, fmt.Errorf("%w: %v", stage.ErrCancelled, ctx.Err())
	}
	return b.recorder.Run(ctx, req)
}

// TestFramesCancelAndDeadline: the stage gets the call's deadline; a call
// whose context ends fails as over gRPC (or with the stage's own
// cancellation, when it gives up first, as over gRPC); after a call that
// ended half-way the next goes over gRPC (the channel is out of step).
func TestFramesCancelAndDeadline(t *testing.T) {
	impl := newBlocking()
	c, conn, _ := framesClient(t, impl, 64<<20)
	t.Cleanup(func() { close(impl.release) })
	ctx, cancel := context.WithTimeout(t.Context(), 100*time.Millisecond)
	defer cancel()
	_, err := c.Run(ctx, stage.Request{Section: stagetest.Section(8), Params: []byte(`{"wait": true}`)})
	ended := status.Code(err) == codes.DeadlineExceeded
	if !ended && !errors.Is(err, stage.ErrCancelled) {
		t.Errorf("deadline passed: %v", err)
	}
	if !impl.deadline.Load() {
		t.Error("the stage did not get the deadline")
	}
	// When the stage answered first, the host's context may still end
	// before the call is over: the next call may go either way then.
	if _, err := c.Run(t.Context(), stage.Request{Section: stagetest.Section(8)}); err != nil || ended && conn.writes.Load() != 1 {
		t.Errorf("next call: %v after %d frames", err, conn.writes.Load())
	}

	// Cancelled while the stage waits: no deadline for the stage.
	impl2 := newBlocking()
	c, conn, _ = framesClient(t, impl2, 64<<20)
	t.Cleanup(func() { close(impl2.release) })
	ctx, cancel = context.WithCancel(t.Context())
	time.AfterFunc(50*time.Millisecond, cancel)
	_, err = c.Run(ctx, stage.Request{Section: stagetest.Section(8), Params: []byte(`{"wait": true}`)})
	if status.Code(err) != codes.Canceled || impl2.deadline.Load() {
		t.Errorf("cancelled: %v (deadline given: %v)", err, impl2.deadline.Load())
	}
	if _, err := c.Run(t.Context(), stage.Request{Section: stagetest.Section(8)}); err != nil || conn.writes.Load() != 1 {
		t.Errorf("next call: %v after %d frames, want over gRPC", err, conn.writes.Load())
	}
}

// TestFramesBroken: a channel whose stage end went away fails the call
// as a broken connection does over gRPC (Unavailable).
func TestFramesBroken(t *testing.T) {
	c, _, stageEnd := framesClient(t, &recorder{packed: true}, 64<<20)
	stageEnd.Close()
	_, err := c.Run(t.Context(), stage.Request{Section: stagetest.Section(8)})
	if status.Code(err) != codes.Unavailable {
		t.Errorf("broken channel: %v", err)
	}
	var remote *stage.RemoteError
	if errors.As(err, &remote) {
		t.Errorf("a broken channel reads as the stage's error: %v", err)
	}
}
