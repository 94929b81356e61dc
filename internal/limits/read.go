package limits

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
)

// textProbe is how many leading bytes decide whether an input is text
// (no NUL byte among them), whose lines are counted.
const textProbe = 8 << 10

// ReadFile reads the file at path whole, refusing it with an *Error once
// it passes maxBytes bytes or, for text, maxLines lines (zero: no limit).
// It reads devices and FIFOs as a stream, so /dev/zero ends at the limit.
// It refuses a folder with a clear error.
func ReadFile(path string, maxBytes, maxLines int64) ([]byte, error) {
	return readFile(path, maxBytes, maxLines, InputBytes)
}

// Read reads r to the end, named name in messages, with the limits of
// ReadFile.
func Read(r io.Reader, name string, maxBytes, maxLines int64) ([]byte, error) {
	return read(r, name, -1, maxBytes, maxLines, InputBytes)
}

// ReadJSON reads the JSON file at path whole, refusing it past maxBytes
// (the json-bytes limit).
func ReadJSON(path string, maxBytes int64) ([]byte, error) {
	return readFile(path, maxBytes, 0, JSONBytes)
}

// readFile is ReadFile and ReadJSON: the file at path read whole, a size
// past maxBytes reported as the limit named limit.
func readFile(path string, maxBytes, maxLines int64, limit Name) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if fi.IsDir() {
		return nil, &fs.PathError{Op: "read", Path: path, Err: errors.New("is a folder, not a file")}
	}
	size := int64(-1)
	if fi.Mode().IsRegular() {
		size = fi.Size()
		if maxBytes > 0 && size > maxBytes {
			return nil, &Error{File: path, Limit: limit, Value: maxBytes, What: Size(size)}
		}
	}
	return read(f, path, size, maxBytes, maxLines, limit)
}

// read reads r, whose size is known when size ≥ 0, stopping with an
// *Error as soon as it passes a limit: at most maxBytes+1 bytes are ever
// held.
func read(r io.Reader, name string, size, maxBytes, maxLines int64, bytesLimit Name) ([]byte, error) {
	var buf bytes.Buffer
	if size >= 0 {
		buf.Grow(int(size) + 512)
	}
	text := true
	var lines int64
	chunk := make([]byte, 64<<10)
	for {
		n, err := r.Read(chunk)
		if n > 0 {
			p := chunk[:n]
			if buf.Len() < textProbe && bytes.IndexByte(p[:min(len(p), textProbe-buf.Len())], 0) >= 0 {
				text = false
			}
			if maxBytes > 0 && int64(buf.Len()+n) > maxBytes {
				return nil, &Error{File: name, Limit: bytesLimit, Value: maxBytes, What: "more than " + Size(maxBytes)}
			}
			if text && maxLines > 0 {
				lines += int64(bytes.Count(p, []byte{'\n'}))
				if lines > maxLines {
					return nil, &Error{File: name, Limit: InputLines, Value: maxLines, What: fmt.Sprintf("more than %d lines", maxLines)}
				}
			}
			buf.Write(p)
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if text && maxLines > 0 && buf.Len() > 0 && buf.Bytes()[buf.Len()-1] != '\n' && lines+1 > maxLines {
		return nil, &Error{File: name, Limit: InputLines, Value: maxLines, What: fmt.Sprintf("more than %d lines", maxLines)}
	}
	return buf.Bytes(), nil
}
