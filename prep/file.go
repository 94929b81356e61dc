package prep

import "github.com/foilwright/foilwright/internal/digest"

// A File is one input file: its recorded path (the display name in
// messages), its bytes and their hex sha256, taken once, when the file is
// read, for the section document and the manifest alike.
type File struct {
	Path   string
	Data   []byte
	SHA256 string
}

// NewFile returns the File of data read from path, with its digest.
func NewFile(path string, data []byte) File {
	return File{Path: path, Data: data, SHA256: digest.Bytes(data)}
}
