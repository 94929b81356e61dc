package stage

import (
	"context"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"sync"
	"time"

	"github.com/hashicorp/go-hclog"
	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"
	"google.golang.org/protobuf/proto"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// Run calls may also travel as frames on a plain stream socket beside the
// gRPC connection: the same RunRequest and RunResponse messages, one
// request and then its reply, each written whole in one write. A gRPC call
// hands each message between several goroutines in each process (the
// caller, the writer of the connection, its reader, the server's worker),
// waking a thread for each hand-over, and frames them as HTTP/2 streams
// with headers and trailers; a frame is read and answered by one goroutine
// on each side. The protocol (stage.proto, "Frames") is optional: a stage
// that does not speak it is called over gRPC, as every stage is for
// Describe.
//
// The host starts a stage with FramesEnv naming an inherited stream socket
// (its file descriptor number). A stage that speaks frames writes
// FramesHello on it before it serves gRPC; the host looks for those bytes
// once Describe has been answered, and only then sends Run calls as
// frames.
//
//	request: length N (uint32), deadline (uint64: nanoseconds the call may
//	         take, 0 for none), N bytes of RunRequest
//	reply:   length N (uint32), status (uint32: 0, or a gRPC status code),
//	         N bytes of RunResponse when the status is 0, else of the
//	         status's message text
//
// Numbers are little-endian. A status other than 0 is what gRPC would have
// answered in place of the reply (a message larger than the limit, one
// that is not a RunRequest); the stage's own errors are RunResponse error
// codes, as over gRPC.

// FramesEnv is the environment variable through which the host offers a
// stage the frames channel: the number of an inherited file descriptor,
// a stream socket.
const FramesEnv = "FOILWRIGHT_STAGE_FRAMES"

// FramesHello is what a stage that speaks frames writes on the channel
// first.
const FramesHello = "fwframe1"

const (
	framesRequestHead = 12 // length, deadline
	framesReplyHead   = 8  // length, status
)

// Frames is the host's side of a frames channel: Run calls sent on it one
// at a time.
type Frames struct {
	mu        sync.Mutex
	conn      io.ReadWriter
	interrupt func()
	broken    bool   // a call ended half-way; the channel is out of step
	buf       []byte // the request, then the reply, reused call after call
}

// NewFrames returns the host's side of the channel on conn, on which the
// stage has written FramesHello (read by the caller). interrupt must make
// a write or read under way on conn, and every later one, fail at once
// (shutdown(2) of a socket); it is called when a call's context ends. The
// caller closes conn.
//
// A host reads and writes a socket in blocking mode (an *os.File of a
// socket that is not non-blocking): the calling goroutine waits for the
// reply in the read system call and goes on from there, where waiting in
// Go's network poller passes the reply from the poller's thread to a
// thread woken for the goroutine.
func NewFrames(conn io.ReadWriter, interrupt func()) *Frames {
	return &Frames{conn: conn, interrupt: interrupt}
}

// errFramesBusy: the channel serves another call (or broke); the call goes
// over gRPC.
var errFramesBusy = errors.New("stage: frames channel busy")

// run sends in and reads the reply into a RunResponse through codec, as a
// gRPC call's codec would, with maxReply bytes at most (0: no limit). It
// returns errFramesBusy, sending nothing, when the channel is taken or
// broken; other errors are gRPC status errors: the codes gRPC gives for
// the same failures, so that the host words and classifies them alike.
func (f *Frames) run(ctx context.Context, in *stagev1.RunRequest, maxReply int, codec *replyCodec) (*stagev1.RunResponse, error) {
	if !f.mu.TryLock() {
		return nil, errFramesBusy
	}
	defer f.mu.Unlock()
	if f.broken {
		return nil, errFramesBusy
	}
	var timeout time.Duration
	if d, ok := ctx.Deadline(); ok {
		if timeout = time.Until(d); timeout <= 0 {
			return nil, status.Error(codes.DeadlineExceeded, context.DeadlineExceeded.Error())
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, status.FromContextError(err).Err()
	}
	// The head goes in front of the message, in the same buffer: one write.
	b := append(f.buf[:0], make([]byte, framesRequestHead)...)
	b, err := proto.MarshalOptions{}.MarshalAppend(b, in)
	if err != nil {
		return nil, status.Errorf(codes.Internal, "grpc: error while marshaling: %v", err)
	}
	n := len(b) - framesRequestHead
	binary.LittleEndian.PutUint32(b[0:], uint32(n))
	binary.LittleEndian.PutUint64(b[4:], uint64(timeout))

	// A context that ends interrupts the write or the read; the channel
	// is then out of step, and the host ends such a process anyway.
	stop := context.AfterFunc(ctx, f.interrupt)
	defer func() {
		if !stop() {
			f.broken = true
		}
	}()
	fail := func(err error) error {
		f.broken = true
		if cerr := ctx.Err(); cerr != nil {
			return status.FromContextError(cerr).Err()
		}
		return status.Errorf(codes.Unavailable, "frames: %v", err)
	}
	if _, err := f.conn.Write(b); err != nil {
		f.buf = b
		return nil, fail(err)
	}
	head := b[:framesReplyHead]
	if _, err := io.ReadFull(f.conn, head); err != nil {
		return nil, fail(err)
	}
	n = int(binary.LittleEndian.Uint32(head[0:]))
	code := codes.Code(binary.LittleEndian.Uint32(head[4:]))
	if code == codes.OK && maxReply > 0 && n > maxReply {
		if _, err := io.CopyN(io.Discard, f.conn, int64(n)); err != nil {
			return nil, fail(err)
		}
		return nil, status.Errorf(codes.ResourceExhausted, "grpc: received message larger than max (%d vs. %d)", n, maxReply)
	}
	if cap(b) < n {
		b = make([]byte, n)
	}
	f.buf = b
	b = b[:n]
	if _, err := io.ReadFull(f.conn, b); err != nil {
		return nil, fail(err)
	}
	if code != codes.OK {
		return nil, status.Error(code, string(b))
	}
	out := new(stagev1.RunResponse)
	if err := codec.read(b, out); err != nil {
		return nil, status.Errorf(codes.Internal, "grpc: failed to unmarshal the received message: %v", err)
	}
	return out, nil
}

// OpenFrames makes the channel the host offers through FramesEnv, if it
// does, ready for ServeFrames: it writes FramesHello on it and takes the
// variable out of the environment, and the descriptor from programs the
// stage starts. It returns nil when the host offers none.
//
// The channel is read and written in blocking mode: a stage waits for the
// next call in the read system call, and its goroutine goes on from there
// on the same thread, with no hand-over from Go's network poller.
func OpenFrames() (*os.File, error) {
	v, ok := os.LookupEnv(FramesEnv)
	if !ok {
		return nil, nil
	}
	os.Unsetenv(FramesEnv)
	fd, err := strconv.Atoi(v)
	if err != nil || fd < 3 {
		return nil, fmt.Errorf("stage: %s=%q is not a file descriptor", FramesEnv, v)
	}
	f, err := framesFile(fd)
	if err != nil {
		return nil, fmt.Errorf("stage: frames channel: %w", err)
	}
	if _, err := io.WriteString(f, FramesHello); err != nil {
		f.Close()
		return nil, fmt.Errorf("stage: frames channel: %w", err)
	}
	return f, nil
}

// ServeFrames serves impl's Run calls arriving as frames on conn, one after
// another, as its gRPC server does (the same handler: panics recovered,
// errors as error codes), taking and sending messages of max bytes at most.
// A call's deadline is its context's. It returns when the host closes its
// end (nil) or the channel breaks.
func ServeFrames(conn io.ReadWriter, impl Stage, log hclog.Logger, max int) error {
	s := &grpcServer{impl: impl, log: log}
	var buf []byte
	head := make([]byte, framesRequestHead)
	for {
		if _, err := io.ReadFull(conn, head); err != nil {
			if errors.Is(err, io.EOF) {
				return nil
			}
			return err
		}
		n := int(binary.LittleEndian.Uint32(head[0:]))
		timeout := time.Duration(binary.LittleEndian.Uint64(head[4:]))
		if n > max {
			if _, err := io.CopyN(io.Discard, conn, int64(n)); err != nil {
				return err
			}
			if err := writeFrame(conn, buf[:0], codes.ResourceExhausted, fmt.Sprintf("grpc: received message larger than max (%d vs. %d)", n, max)); err != nil {
				return err
			}
			continue
		}
		if cap(buf) < n {
			buf = make([]byte, n)
		}
		if _, err := io.ReadFull(conn, buf[:n]); err != nil {
			return err
		}
		in := new(stagev1.RunRequest)
		if err := proto.Unmarshal(buf[:n], in); err != nil {
			if err := writeFrame(conn, buf[:0], codes.Internal, fmt.Sprintf("grpc: error unmarshalling request: %v", err)); err != nil {
				return err
			}
			continue
		}
		ctx := context.Background()
		var dl *deadlineCtx
		if timeout > 0 {
			dl = &deadlineCtx{Context: ctx, deadline: time.Now().Add(timeout)}
			ctx = dl
		}
		resp, _ := s.Run(ctx, in) // its errors are in resp
		if dl != nil {
			dl.stop()
		}
		out := append(buf[:0], make([]byte, framesReplyHead)...)
		out, err := proto.MarshalOptions{}.MarshalAppend(out, resp)
		switch {
		case err != nil:
			err = writeFrame(conn, out[:0], codes.Internal, fmt.Sprintf("grpc: error while marshaling: %v", err))
		case len(out)-framesReplyHead > max:
			err = writeFrame(conn, out[:0], codes.ResourceExhausted, fmt.Sprintf("grpc: trying to send message larger than max (%d vs. %d)", len(out)-framesReplyHead, max))
		default:
			binary.LittleEndian.PutUint32(out[0:], uint32(len(out)-framesReplyHead))
			binary.LittleEndian.PutUint32(out[4:], 0)
			_, err = conn.Write(out)
		}
		if err != nil {
			return err
		}
		buf = out
	}
}

// writeFrame writes a reply of status code with msg as its text, in buf.
func writeFrame(conn io.Writer, buf []byte, code codes.Code, msg string) error {
	buf = binary.LittleEndian.AppendUint32(buf, uint32(len(msg)))
	buf = binary.LittleEndian.AppendUint32(buf, uint32(code))
	_, err := conn.Write(append(buf, msg...))
	return err
}

// deadlineCtx is a context with a deadline whose timer starts only when
// Done is first called. A stage that only asks Err (the built-in ones do,
// between phases) costs no timer a call: starting one wakes an idle thread
// of the process to watch it, which is a good part of what a call costs
// beside a short solve.
type deadlineCtx struct {
	context.Context // the parent: Background, never done
	deadline        time.Time

	mu    sync.Mutex
	timed context.Context // made by Done: the same deadline with a timer
	stopf context.CancelFunc
}

func (c *deadlineCtx) Deadline() (time.Time, bool) { return c.deadline, true }

func (c *deadlineCtx) Done() <-chan struct{} {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.timed == nil {
		c.timed, c.stopf = context.WithDeadline(context.Background(), c.deadline)
	}
	return c.timed.Done()
}

// Err is context.DeadlineExceeded once the deadline has passed: by the
// clock, or, once Done was asked for, when Done is closed (so that Err is
// nil while Done is open).
func (c *deadlineCtx) Err() error {
	c.mu.Lock()
	timed := c.timed
	c.mu.Unlock()
	if timed != nil {
		return timed.Err()
	}
	if !time.Now().Before(c.deadline) {
		return context.DeadlineExceeded
	}
	return nil
}

// stop releases the timer, if Done made one.
func (c *deadlineCtx) stop() {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.stopf != nil {
		c.stopf()
	}
}
