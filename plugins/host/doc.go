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
// On Unix every stage runs in a process group of its own, with /dev/null
// as stdin and stdout and stderr on pipes the host owns: when the stage's
// process ends, or is ended, the whole group is killed (a shell wrapper
// without exec, the stage under it, the grandchildren it started), so no
// process that holds the pipes can keep the host waiting. Ctrl-C reaches
// the host only; it ends the stages it started. A call past its time limit
// always ends the process (ErrTimeout), whatever the stage answered.
//
// A stage gets a minimal environment (MinimalEnv, plus the names its Spec
// allows, plus the host's settings; StageEnv lists it for a manifest), its
// data memory limited on Linux (Options.Memory, RLIMIT_DATA), sections no
// larger than it describes (Info.MaxNodes, ErrTooManyNodes), replies no
// larger than Options.MaxReply and result documents no deeper than
// Options.JSONDepth. A Go crash of a stage is reported as its panic line
// and the first function of the stage's code it went through, without the
// goroutine dump.
//
// On Linux a stage process is killed by the kernel when the host dies
// (Pdeathsig); on every system a stage served by plugins/sdk also exits when
// its parent goes away.
package host
