package stage

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"runtime/debug"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"
	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

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
}

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
	return infoFromProto(resp), nil
}

// Run calls the remote Run. It returns a *RemoteError if the stage reported
// an error code.
func (c *Client) Run(ctx context.Context, req Request) (Result, error) {
	var opts []grpc.CallOption
	if c.maxReply > 0 {
		opts = append(opts, grpc.MaxCallRecvMsgSize(c.maxReply))
	}
	resp, err := c.rpc.Run(ctx, &stagev1.RunRequest{
		SectionJson: req.Section,
		ParamsJson:  req.Params,
		Deps:        req.Deps,
		SectionName: req.SectionName,
	}, opts...)
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
	res := Result{
		JSON:     resp.GetResultJson(),
		Warnings: resp.GetWarnings(),
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

// grpcServer serves a Stage. It recovers panics of the stage per call, so a
// panicking solver answers with ErrInternal and a message instead of taking
// the process down.
type grpcServer struct {
	stagev1.UnimplementedStageServer
	impl Stage
	log  hclog.Logger
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
	res, err := s.impl.Run(ctx, Request{
		Section:     in.GetSectionJson(),
		Params:      in.GetParamsJson(),
		Deps:        in.GetDeps(),
		SectionName: in.GetSectionName(),
	})
	if err != nil {
		return &stagev1.RunResponse{ErrorCode: stagev1.ErrorCode(CodeOf(err)), ErrorMessage: err.Error()}, nil
	}
	out := &stagev1.RunResponse{ResultJson: res.JSON, Warnings: res.Warnings}
	for _, a := range res.Artifacts {
		out.Artifacts = append(out.Artifacts, &stagev1.Artifact{Name: a.Name, MediaType: a.MediaType, Data: a.Data})
	}
	if len(res.Timings) > 0 {
		out.TimingsMs = make(map[string]float64, len(res.Timings))
		for k, d := range res.Timings {
			out.TimingsMs[k] = float64(d) / float64(time.Millisecond)
		}
	}
	return out, nil
}

func infoToProto(info Info) *stagev1.DescribeResponse {
	out := &stagev1.DescribeResponse{
		Name:           info.Name,
		Version:        info.Version,
		Summary:        info.Summary,
		MaxConcurrency: int32(info.MaxConcurrency),
		MaxNodes:       int32(info.MaxNodes),
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
