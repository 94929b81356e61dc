//go:build !unix

package pipeline

// maxRSSKiB returns 0: the system does not say.
func maxRSSKiB() int64 { return 0 }
