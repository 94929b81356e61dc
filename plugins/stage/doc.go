// Package stage defines the stage protocol of foilwright: the Stage
// interface a stage implements, the requests and results that cross the
// process boundary, the result document (format foilwright.result/1), the
// go-plugin handshake and plugin set, the gRPC adapters on both sides, and
// the error codes that carry sentinel errors across the wire.
//
// It is the only package that both the host (plugins/host) and a stage
// (served with plugins/sdk) import.
//
// # Errors across the process boundary
//
// An error returned by a stage crosses the wire as a code and a message.
// The client adapter turns the code back into one of the sentinels
// ErrBadInput, ErrDiverged, ErrUnsupported, ErrInternal or ErrCancelled, so
// that callers test with errors.Is on either side. A stage marks its errors
// with BadInput, Diverged or Unsupported; any other error counts as
// ErrInternal.
//
// # Parameters
//
// A stage declares its parameters in Info; Validate checks a params_json
// object against them (types, ranges, unknown keys) and fills in defaults.
// The host runs the same check before a call, so a bad parameter is
// reported before any work is done.
package stage
