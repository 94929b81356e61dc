//go:build linux

package pipeline

import "golang.org/x/sys/unix"

// exchange swaps the folders a and b in one step (renameat2 with
// RENAME_EXCHANGE); it fails where the file system cannot.
var exchange = func(a, b string) error {
	return unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
}
