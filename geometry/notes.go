package geometry

import (
	"fmt"
	"strings"
)

// MaxNotes caps the notes one file may add to a Cloud; the rest are
// counted in a final note, so a file of a million comment lines cannot
// flood the report.
const MaxNotes = 1000

// Notes collects the notes of one file (lines skipped, points left out),
// up to MaxNotes; the rest are counted. The zero value is ready to use.
type Notes struct {
	notes []Note
	extra int
}

// Add records that line no of file was skipped, and why.
func (n *Notes) Add(file string, no int, reason, text string) {
	n.AddAt(Origin{File: file, Line: no}, reason, text)
}

// AddAt records that the point or line at o was skipped, and why.
func (n *Notes) AddAt(o Origin, reason, text string) {
	if len(n.notes) >= MaxNotes {
		n.extra++
		return
	}
	n.notes = append(n.notes, Note{Origin: o, Reason: reason, Text: Excerpt(text)})
}

// List returns the notes, with a closing note counting those left out.
func (n *Notes) List(file string) []Note {
	if n.extra > 0 {
		return append(n.notes, Note{Origin: Origin{File: file}, Reason: fmt.Sprintf("%d more skipped line(s) not listed", n.extra)})
	}
	return n.notes
}

// Excerpt trims s and cuts it to at most 80 bytes, at a rune boundary: the
// form in which a line of a file is quoted in a Note and in messages.
func Excerpt(s string) string {
	s = strings.TrimSpace(s)
	if len(s) <= 80 {
		return s
	}
	cut := 80
	for cut > 0 && s[cut]&0xc0 == 0x80 {
		cut--
	}
	return s[:cut]
}

// Kept returns the notes kept so far, without a closing note.
func (n *Notes) Kept() []Note { return n.notes }

// Extra returns how many notes were left out beyond MaxNotes.
func (n *Notes) Extra() int { return n.extra }
