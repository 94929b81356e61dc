package reliability

import (
	"fmt"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// spawn runs prog as a child with its data segment limited to limit bytes
// (0: no limit), so that a runaway case ends with an out-of-memory error
// instead of taking the machine's memory, writes the child's peak resident
// memory (with the children it waited for) to rssFile, and returns its exit
// status; a child ended by a signal ends spawn by the same signal.
//
// The child is spawned from this small process, not from the campaign's:
// Linux counts the memory of the process that forks (shared until exec)
// in the child's peak, which would charge every case with the campaign's
// own memory.
func spawn(limit uint64, rssFile, prog string, args []string) int {
	if limit > 0 {
		rl := syscall.Rlimit{Cur: limit, Max: limit}
		if err := syscall.Setrlimit(syscall.RLIMIT_DATA, &rl); err != nil {
			fmt.Fprintf(os.Stderr, "reliability: %v\n", err)
			return 2
		}
	}
	// The runner signals the whole process group: the child handles
	// SIGINT itself, this process waits for it.
	signal.Ignore(syscall.SIGINT, syscall.SIGTERM)
	cmd := exec.Command(prog, args...)
	cmd.Stdin, cmd.Stdout, cmd.Stderr = os.Stdin, os.Stdout, os.Stderr
	signal.Reset(syscall.SIGINT, syscall.SIGTERM) // the child gets default handling
	err := cmd.Start()
	signal.Ignore(syscall.SIGINT, syscall.SIGTERM)
	if err != nil {
		fmt.Fprintf(os.Stderr, "reliability: %v\n", err)
		return 2
	}
	cmd.Wait()
	if ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage); ok {
		os.WriteFile(rssFile, []byte(strconv.FormatInt(ru.Maxrss<<10, 10)), 0o644)
	}
	if ws, ok := cmd.ProcessState.Sys().(syscall.WaitStatus); ok && ws.Signaled() {
		signal.Reset(ws.Signal())
		syscall.Kill(os.Getpid(), ws.Signal())
		time.Sleep(time.Second)
	}
	return cmd.ProcessState.ExitCode()
}

// proc is a live process seen in /proc.
type proc struct {
	pid  int
	args []string
	exe  string
}

// marked returns the live processes (zombies excluded) that a case made:
// those whose command line holds mark (the case folder) and whose
// executable is a shell or one of exes. With exeDir set instead, it
// returns those whose executable lies in that folder.
func marked(mark string, exes []string, exeDir string) []proc {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	self := os.Getpid()
	var out []proc
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || pid == self {
			continue
		}
		dir := filepath.Join("/proc", e.Name())
		cmdline, err := os.ReadFile(filepath.Join(dir, "cmdline"))
		if err != nil || len(cmdline) == 0 {
			continue // gone, or a zombie (empty command line)
		}
		exe, _ := os.Readlink(filepath.Join(dir, "exe"))
		args := strings.Split(strings.TrimRight(string(cmdline), "\x00"), "\x00")
		var hit bool
		if exeDir != "" {
			hit = strings.HasPrefix(exe, exeDir+"/")
		} else {
			hit = slices.ContainsFunc(args, func(a string) bool { return a == mark || strings.HasPrefix(a, mark+"/") }) &&
				(slices.Contains(exes, exe) || shells[filepath.Base(exe)])
		}
		if hit && !zombie(dir) {
			out = append(out, proc{pid: pid, args: args, exe: exe})
		}
	}
	return out
}

// shells are the executables a wrapper script may run under.
var shells = map[string]bool{"sh": true, "dash": true, "bash": true, "busybox": true}

// zombie reports whether the process of /proc folder dir has exited.
func zombie(dir string) bool {
	b, err := os.ReadFile(filepath.Join(dir, "stat"))
	if err != nil {
		return true
	}
	s := string(b)
	i := strings.LastIndexByte(s, ')')
	return i < 0 || i+2 >= len(s) || s[i+2] == 'Z' || s[i+2] == 'X'
}

// kill ends a process the campaign started (directly or not).
func (p proc) kill() { syscall.Kill(p.pid, syscall.SIGKILL) }

// mkfifo makes a FIFO at path.
func mkfifo(path string) error { return syscall.Mkfifo(path, 0o644) }

// mknodNull makes a character device node at path with the numbers of
// /dev/null (1, 3): a device of the case's own, for the refusal check.
func mknodNull(path string) error {
	return syscall.Mknod(path, syscall.S_IFCHR|0o644, 1<<8|3)
}
