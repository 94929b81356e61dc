package stage

import (
	"context"
	"errors"
	"fmt"

	"github.com/foilwright/foilwright/plugins/gen/stagev1"
)

// Sentinel errors of a stage run. A stage marks its own errors with
// BadInput, Diverged and Unsupported; after a call through the host,
// errors.Is reports the same sentinel the stage used.
var (
	// ErrBadInput means the section or the parameters are not acceptable.
	ErrBadInput = errors.New("stage: bad input")
	// ErrDiverged means the solver did not converge or its system was
	// singular.
	ErrDiverged = errors.New("stage: solver failed to converge")
	// ErrUnsupported means the stage cannot handle this kind of input.
	ErrUnsupported = errors.New("stage: unsupported input")
	// ErrInternal means the stage failed for a reason of its own: a bug or a
	// recovered panic.
	ErrInternal = errors.New("stage: internal error")
	// ErrCancelled means the call was cancelled or ran out of time inside
	// the stage.
	ErrCancelled = errors.New("stage: cancelled")
)

// Code is the error code of a run, as carried by the protocol.
type Code int

// The error codes; CodeOK means success.
const (
	CodeOK          = Code(stagev1.ErrorCode_ERROR_CODE_UNSPECIFIED)
	CodeBadInput    = Code(stagev1.ErrorCode_ERROR_CODE_BAD_INPUT)
	CodeDiverged    = Code(stagev1.ErrorCode_ERROR_CODE_DIVERGED)
	CodeUnsupported = Code(stagev1.ErrorCode_ERROR_CODE_UNSUPPORTED)
	CodeInternal    = Code(stagev1.ErrorCode_ERROR_CODE_INTERNAL)
	CodeCancelled   = Code(stagev1.ErrorCode_ERROR_CODE_CANCELLED)
)

// Sentinel returns the sentinel error of c, or nil for CodeOK. Unknown codes
// (from a newer stage) map to ErrInternal.
func (c Code) Sentinel() error {
	switch c {
	case CodeOK:
		return nil
	case CodeBadInput:
		return ErrBadInput
	case CodeDiverged:
		return ErrDiverged
	case CodeUnsupported:
		return ErrUnsupported
	case CodeCancelled:
		return ErrCancelled
	}
	return ErrInternal
}

// CodeOf returns the code for err: CodeOK for nil, the code of a sentinel
// err wraps, CodeCancelled for context errors, and CodeInternal otherwise.
func CodeOf(err error) Code {
	switch {
	case err == nil:
		return CodeOK
	case errors.Is(err, ErrBadInput):
		return CodeBadInput
	case errors.Is(err, ErrDiverged):
		return CodeDiverged
	case errors.Is(err, ErrUnsupported):
		return CodeUnsupported
	case errors.Is(err, ErrCancelled), errors.Is(err, context.Canceled), errors.Is(err, context.DeadlineExceeded):
		return CodeCancelled
	}
	return CodeInternal
}

// codedError marks an error with a code without changing its message.
type codedError struct {
	code Code
	err  error
}

func (e *codedError) Error() string        { return e.err.Error() }
func (e *codedError) Unwrap() error        { return e.err }
func (e *codedError) Is(target error) bool { return target == e.code.Sentinel() }

// BadInput marks err as ErrBadInput, keeping its message. It returns nil for
// a nil err.
func BadInput(err error) error { return mark(CodeBadInput, err) }

// Diverged marks err as ErrDiverged, keeping its message. It returns nil for
// a nil err.
func Diverged(err error) error { return mark(CodeDiverged, err) }

// Unsupported marks err as ErrUnsupported, keeping its message. It returns
// nil for a nil err.
func Unsupported(err error) error { return mark(CodeUnsupported, err) }

// BadInputf formats an error marked as ErrBadInput.
func BadInputf(format string, args ...any) error {
	return mark(CodeBadInput, fmt.Errorf(format, args...))
}

func mark(c Code, err error) error {
	if err == nil {
		return nil
	}
	return &codedError{code: c, err: err}
}

// RemoteError is an error a stage returned across the process boundary:
// its code and message. errors.Is(err, s) holds for the sentinel s of Code.
type RemoteError struct {
	Code    Code
	Message string
}

func (e *RemoteError) Error() string { return e.Message }

// Is reports whether target is the sentinel of e.Code.
func (e *RemoteError) Is(target error) bool { return target == e.Code.Sentinel() }
