// Package host starts, calls and ends stage processes.
//
// A Host owns a private socket folder and every stage process it starts. A
// Runner is one stage, backed by at most one process at a time, started on
// first use and reused for every later call; after a crash or a timeout the
// process is killed and the next call starts a fresh one (a crashed call is
// retried once). A Pool gives each of N workers its own runners, for
// running sections in parallel.
//
// Built-in stages run as a re-exec of the running binary ("/proc/self/exe
// __stage NAME" on Linux), external ones from an executable path, optionally
// pinned by its sha256. Every reply is checked: result documents must be
// valid JSON in the documented format, artifacts must have plain names.
// Errors are *Error values naming the stage, the section and, when the
// process failed, how it ended and the last lines of its stderr; the
// sentinels of package stage (stage.ErrBadInput, ...) and of this package
// (ErrCrashed, ErrTimeout, ...) can be tested with errors.Is.
//
// On Linux a stage process is killed by the kernel when the host dies
// (Pdeathsig); on every system a stage served by plugins/sdk also exits when
// its parent goes away.
package host
