package stage

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"runtime/debug"
	"sync"
	"sync/atomic"
	"time"

	"github.com/tidwall/gjson"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"
	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// Plugin is the go-plugin plugin of a stage, gRPC only. On the serving side
// Impl is the stage; on the host side Impl is nil and Dispense returns a
// Stage that calls the remote one.
type Plugin struct {
	plugin.NetRPCUnsupportedPlugin
	Impl Stage
	// Logger receives panics recovered on the serving side; nil means
	// hclog's default logger.
	Logger hclog.Logger
}

// GRPCServer registers the stage service on s.
func (p *Plugin) GRPCServer(_ *plugin.GRPCBroker, s *grpc.Server) error {
	stagev1.RegisterStageServer(s, &grpcServer{impl: p.Impl, log: p.Logger})
	return nil
}

// GRPCClient returns a Stage that calls the stage on c. The context is
// cancelled when the stage process exits.
func (p *Plugin) GRPCClient(_ context.Context, _ *plugin.GRPCBroker, c *grpc.ClientConn) (any, error) {
	return NewClient(stagev1.NewStageClient(c)), nil
}

// Client is a Stage calling a remote stage through the generated gRPC
// client. Errors the stage returned are *RemoteError; transport errors are
// gRPC status errors, which the host classifies.
type Client struct {
	rpc      stagev1.StageClient
	maxReply int
	packed   atomic.Bool // the stage described itself Packed
	frames   atomic.Pointer[Frames]
}

// SetFrames sends later Run calls on f (frames.go), one at a time: a call
// that finds f busy with another goes over gRPC, as do all calls after a
// call on f ended half-way (cancelled, timed out, broken off). Nil sends
// every call over gRPC.
func (c *Client) SetFrames(f *Frames) { c.frames.Store(f) }

// SetMaxReply limits the size of a Run reply, in bytes (result document
// and artifacts): a larger one fails with codes.ResourceExhausted without
// being held in memory. Zero means gRPC's client default set by go-plugin
// (2 GiB).
func (c *Client) SetMaxReply(n int) { c.maxReply = n }

// NewClient returns a Client on rpc.
func NewClient(rpc stagev1.StageClient) *Client { return &Client{rpc: rpc} }

// Describe calls the remote Describe.
func (c *Client) Describe(ctx context.Context) (Info, error) {
	resp, err := c.rpc.Describe(ctx, &stagev1.DescribeRequest{})
	if err != nil {
		return Info{}, err
	}
	info := infoFromProto(resp)
	c.packed.Store(info.Packed)
	return info, nil
}

// Run calls the remote Run. It sends the nodes and the results of the
// dependencies packed when the stage's description (from an earlier
// Describe) says Packed, else as JSON. It returns a *RemoteError if the
// stage reported an error code, and an error wrapping ErrMalformed if its
// packed result is not well formed; the Result has Doc set for a packed
// result, JSON for a result as text.
func (c *Client) Run(ctx context.Context, req Request) (Result, error) {
	var opts []grpc.CallOption
	if c.maxReply > 0 {
		opts = append(opts, grpc.MaxCallRecvMsgSize(c.maxReply))
	}
	in, err := requestToProto(req, c.packed.Load())
	if err != nil {
		return Result{}, err
	}
	// The reply's packed result is read straight from the wire into a
	// result document (replywire.go).
	codec := &replyCodec{}
	err = errFramesBusy
	var resp *stagev1.RunResponse
	if f := c.frames.Load(); f != nil {
		resp, err = f.run(ctx, in, c.maxReply, codec)
	}
	if err == errFramesBusy {
		opts = append(opts, grpc.ForceCodecV2(codec))
		resp, err = c.rpc.Run(ctx, in, opts...)
	}
	if err != nil {
		return Result{}, err
	}
	if code := Code(resp.GetErrorCode()); code != CodeOK {
		msg := resp.GetErrorMessage()
		if msg == "" {
			msg = code.Sentinel().Error()
		}
		return Result{}, &RemoteError{Code: code, Message: msg}
	}
	res := Result{Warnings: resp.GetWarnings()}
	switch m := resp.GetResult(); {
	case codec.direct && codec.packed:
		if codec.err != nil {
			return Result{}, codec.err
		}
		res.Doc = codec.doc
	case m != nil:
		if res.Doc, err = ResultFromProto(m); err != nil {
			return Result{}, err
		}
	default:
		res.JSON = resp.GetResultJson()
	}
	for _, a := range resp.GetArtifacts() {
		res.Artifacts = append(res.Artifacts, Artifact{Name: a.GetName(), MediaType: a.GetMediaType(), Data: a.GetData()})
	}
	if t := resp.GetTimingsMs(); len(t) > 0 {
		res.Timings = make(map[string]time.Duration, len(t))
		for k, ms := range t {
			if !math.IsNaN(ms) && !math.IsInf(ms, 0) && ms >= 0 && ms < 1e12 {
				res.Timings[k] = time.Duration(ms * float64(time.Millisecond))
			}
		}
	}
	return res, nil
}

// requestToProto makes the message of req for a stage that takes arrays
// packed or not: a packed stage gets the nodes in node_x/node_y and the
// section document without them, and its dependencies as Result messages;
// another gets the whole section document and its dependencies as
// ResultFormatV1 JSON. Errors are marked BadInput.
func requestToProto(req Request, packed bool) (*stagev1.RunRequest, error) {
	in := &stagev1.RunRequest{ParamsJson: req.Params, SectionName: req.SectionName, SectionJson: req.Section}
	ids := req.DepIDs()
	if packed {
		nodes := req.Nodes
		if nodes == nil || gjson.GetBytes(req.Section, "nodes").Exists() {
			// A document whose nodes cannot be taken out goes as it is,
			// with no packed nodes: the stage refuses it.
			if rest, split, err := SplitNodes(req.Section); err == nil {
				in.SectionJson = rest
				if nodes == nil {
					nodes = split
				}
			}
		}
		if nodes != nil {
			in.NodeX, in.NodeY = make([]float64, len(nodes)), make([]float64, len(nodes))
			for i, p := range nodes {
				in.NodeX[i], in.NodeY[i] = p.X, p.Y
			}
		}
		if len(ids) > 0 {
			in.DepResults = make(map[string]*stagev1.Result, len(ids))
			for _, id := range ids {
				d, err := req.Dep(id)
				if err != nil {
					return nil, err
				}
				in.DepResults[id] = ResultToProto(d)
			}
		}
		return in, nil
	}
	if req.Nodes != nil && !gjson.GetBytes(req.Section, "nodes").Exists() {
		in.SectionJson = JoinNodes(req.Section, req.Nodes)
	}
	if len(ids) > 0 {
		in.Deps = make(map[string][]byte, len(ids))
		for _, id := range ids {
			if b, ok := req.Deps[id]; ok && gjson.GetBytes(b, "format").Str == ResultFormatV1 {
				in.Deps[id] = b
				continue
			}
			d, err := req.Dep(id)
			if err != nil {
				return nil, err
			}
			if in.Deps[id], err = d.EncodeV1(); err != nil {
				return nil, BadInput(err)
			}
		}
	}
	return in, nil
}

// grpcServer serves a Stage. It recovers panics of the stage per call, so a
// panicking solver answers with ErrInternal and a message instead of taking
// the process down.
type grpcServer struct {
	stagev1.UnimplementedStageServer
	impl Stage
	log  hclog.Logger

	packedOnce sync.Once
	isPacked   bool
}

// packed reports whether the stage takes arrays packed, from its
// description.
func (s *grpcServer) packed(ctx context.Context) bool {
	s.packedOnce.Do(func() {
		info, err := s.impl.Describe(ctx)
		s.isPacked = err == nil && info.Packed
	})
	return s.isPacked
}

func (s *grpcServer) logger() hclog.Logger {
	if s.log == nil {
		return hclog.Default()
	}
	return s.log
}

func (s *grpcServer) Describe(ctx context.Context, _ *stagev1.DescribeRequest) (resp *stagev1.DescribeResponse, err error) {
	defer func() {
		if r := recover(); r != nil {
			s.logger().Error("panic in Describe", "panic", fmt.Sprint(r), "stack", string(debug.Stack()))
			resp, err = nil, status.Errorf(codes.Internal, "stage panicked in Describe: %v", r)
		}
	}()
	info, err := s.impl.Describe(ctx)
	if err != nil {
		return nil, status.Errorf(codes.Internal, "describe: %v", err)
	}
	return infoToProto(info), nil
}

func (s *grpcServer) Run(ctx context.Context, in *stagev1.RunRequest) (resp *stagev1.RunResponse, err error) {
	defer func() {
		if r := recover(); r != nil {
			s.logger().Error("panic in Run", "section", in.GetSectionName(), "panic", fmt.Sprint(r), "stack", string(debug.Stack()))
			resp = &stagev1.RunResponse{
				ErrorCode:    stagev1.ErrorCode(CodeInternal),
				ErrorMessage: fmt.Sprintf("stage panicked: %v", r),
			}
			err = nil
		}
	}()
	req, err := requestFromProto(in, s.packed(ctx))
	if err == nil {
		var res Result
		if res, err = s.impl.Run(ctx, req); err == nil {
			return resultToResponse(res), nil
		}
	}
	return &stagev1.RunResponse{ErrorCode: stagev1.ErrorCode(CodeOf(err)), ErrorMessage: err.Error()}, nil
}

// requestFromProto makes the Request a stage gets from the message in: a
// packed stage gets the packed nodes and dependency results as they came;
// another gets them joined into the section document and as JSON.
func requestFromProto(in *stagev1.RunRequest, packed bool) (Request, error) {
	req := Request{
		Section:     in.GetSectionJson(),
		Params:      in.GetParamsJson(),
		Deps:        in.GetDeps(),
		SectionName: in.GetSectionName(),
	}
	if xs, ys := in.GetNodeX(), in.GetNodeY(); len(xs) > 0 || len(ys) > 0 {
		if len(xs) != len(ys) {
			return Request{}, BadInputf("section %s: %d node_x and %d node_y", req.SectionName, len(xs), len(ys))
		}
		req.Nodes = make([]geometry.Point, len(xs))
		for i := range xs {
			req.Nodes[i] = geometry.Point{X: xs[i], Y: ys[i]}
		}
		if !packed {
			req.Section, req.Nodes = JoinNodes(req.Section, req.Nodes), nil
		}
	}
	if m := in.GetDepResults(); len(m) > 0 {
		req.DepResults = make(map[string]*ResultDoc, len(m))
		for id, r := range m {
			d, err := ResultFromProto(r)
			if err != nil {
				return Request{}, BadInput(fmt.Errorf("result of %q: %w", id, err))
			}
			req.DepResults[id] = d
		}
		if !packed {
			deps := make(map[string][]byte, len(m)+len(req.Deps))
			for id, b := range req.Deps {
				deps[id] = b
			}
			for id, d := range req.DepResults {
				b, err := d.EncodeV1()
				if err != nil {
					return Request{}, BadInput(err)
				}
				deps[id] = b
			}
			req.Deps, req.DepResults = deps, nil
		}
	}
	return req, nil
}

// resultToResponse makes the message of a stage's result: the result
// document packed when the stage gave it as a ResultDoc (its wire bytes
// written straight from the document, resultwire.go), else its JSON.
func resultToResponse(res Result) *stagev1.RunResponse {
	out := &stagev1.RunResponse{Warnings: res.Warnings}
	if res.Doc != nil {
		if raw, ok := resultField(res.Doc); ok {
			out.ProtoReflect().SetUnknown(raw)
		} else {
			out.Result = ResultToProto(res.Doc)
		}
	} else {
		out.ResultJson = res.JSON
	}
	for _, a := range res.Artifacts {
		out.Artifacts = append(out.Artifacts, &stagev1.Artifact{Name: a.Name, MediaType: a.MediaType, Data: a.Data})
	}
	if len(res.Timings) > 0 {
		out.TimingsMs = make(map[string]float64, len(res.Timings))
		for k, d := range res.Timings {
			out.TimingsMs[k] = float64(d) / float64(time.Millisecond)
		}
	}
	return out
}

func infoToProto(info Info) *stagev1.DescribeResponse {
	out := &stagev1.DescribeResponse{
		Name:           info.Name,
		Version:        info.Version,
		Summary:        info.Summary,
		MaxConcurrency: int32(info.MaxConcurrency),
		MaxNodes:       int32(info.MaxNodes),
		Packed:         info.Packed,
		Files:          info.Files,
	}
	for _, p := range info.Params {
		q := &stagev1.Parameter{
			Name:        p.Name,
			Type:        string(p.Type),
			DefaultJson: string(p.Default),
			Choices:     p.Choices,
			Unit:        p.Unit,
			Doc:         p.Doc,
			MinItems:    int32(p.MinItems),
			MaxItems:    int32(p.MaxItems),
		}
		if p.Min != nil {
			q.HasMin, q.Min = true, *p.Min
		}
		if p.Max != nil {
			q.HasMax, q.Max = true, *p.Max
		}
		out.Parameters = append(out.Parameters, q)
	}
	for _, s := range info.Scalars {
		out.Scalars = append(out.Scalars, &stagev1.Scalar{Name: s.Name, Doc: s.Doc})
	}
	return out
}

func infoFromProto(in *stagev1.DescribeResponse) Info {
	info := Info{
		Name:           in.GetName(),
		Version:        in.GetVersion(),
		Summary:        in.GetSummary(),
		MaxConcurrency: int(in.GetMaxConcurrency()),
		MaxNodes:       int(in.GetMaxNodes()),
		Packed:         in.GetPacked(),
		Files:          in.GetFiles(),
	}
	for _, q := range in.GetParameters() {
		p := Param{
			Name:     q.GetName(),
			Type:     ParamType(q.GetType()),
			Choices:  q.GetChoices(),
			Unit:     q.GetUnit(),
			Doc:      q.GetDoc(),
			MinItems: int(q.GetMinItems()),
			MaxItems: int(q.GetMaxItems()),
		}
		if d := q.GetDefaultJson(); d != "" {
			p.Default = json.RawMessage(d)
		}
		if q.GetHasMin() {
			p.Min = Bound(q.GetMin())
		}
		if q.GetHasMax() {
			p.Max = Bound(q.GetMax())
		}
		info.Params = append(info.Params, p)
	}
	for _, s := range in.GetScalars() {
		info.Scalars = append(info.Scalars, Scalar{Name: s.GetName(), Doc: s.GetDoc()})
	}
	return info
}
